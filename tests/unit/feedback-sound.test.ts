import { describe, expect, it } from 'vitest';
import { feedbackTones, useFeedbackSound } from '@/composables/useFeedbackSound';

describe('station feedback tones', () => {
  it('accept is a rising two-tone: A5 then E6', () => {
    const [first, second] = feedbackTones('accept');
    // ISO 16:1975 sets A4 = 440 Hz; A5 is the octave above.
    expect(first.frequency).toBe(880);
    // Twelve-tone equal temperament: a fifth above is a factor 2^(7/12).
    expect(second.frequency).toBeCloseTo(880 * 2 ** (7 / 12), 0);
    expect(second.startAt).toBeGreaterThanOrEqual(first.startAt + first.duration);
  });

  it('refuse is one low buzz, longer than the whole accept sound (common practice: error tones are low and long)', () => {
    const refuse = feedbackTones('refuse');
    const accept = feedbackTones('accept');
    expect(refuse).toHaveLength(1);
    expect(refuse[0].frequency).toBeLessThan(200);
    expect(refuse[0].type).toBe('square');
    const acceptEnd = Math.max(...accept.map((t) => t.startAt + t.duration));
    expect(refuse[0].duration).toBeGreaterThan(acceptEnd);
  });

  it('is silent, not failing, where there is no Web Audio (a test runner, an old browser)', () => {
    expect(() => useFeedbackSound().play('accept')).not.toThrow();
  });
});
