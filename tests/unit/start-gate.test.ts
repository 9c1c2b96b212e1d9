import { describe, expect, it } from 'vitest';
import type { BatchDetail, TravelerStep } from '../../shared/schemas/batches';
import { activeCureGate, startBlock } from '@/components/station/startGate';

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

function step(seq: number, over: Partial<TravelerStep> = {}): TravelerStep {
  return {
    id: id(seq),
    seq,
    name: `Step ${seq}`,
    stationKind: `kind-${seq}`,
    waitForCure: false,
    materials: [],
    state: 'pending',
    run: null,
    handlingAt: null,
    cureCompleteAt: null,
    cure: null,
    humidity: null,
    ...over,
  };
}

function traveler(steps: TravelerStep[]): BatchDetail {
  return {
    batch: {
      id: id(900),
      code: 'HB12W-261202-01',
      modelId: id(901),
      modelCode: 'HB12W',
      modelRevision: 1,
      modelName: '12 in woofer',
      quantity: 80,
      status: 'in_process',
      createdBy: null,
      createdAt: '2026-12-02T06:00:00.000Z',
      completedAt: null,
    },
    steps,
    currentStepId: steps.find((s) => s.state === 'pending')?.id ?? null,
    drivers: [],
    reworkRuns: [],
  };
}

// Wednesday 2 December 2026, 04:15 UTC.
const NOW = Date.parse('2026-12-02T04:15:00.000Z');

describe('why the station cannot start a step yet', () => {
  it('a step whose previous step is still curing waits, with the day and the time left (plant zone)', () => {
    const cap = step(4, { name: 'Dust cap', waitForCure: true, state: 'curing', cureCompleteAt: '2026-12-03T07:25:00.000Z' });
    const test = step(5, { name: 'Magnetize and test' });
    const t = traveler([step(1, { state: 'done' }), cap, test]);
    expect(activeCureGate(t, test, NOW)?.name).toBe('Dust cap');
    const block = startBlock(t, test, NOW, 'UTC');
    expect(block).toMatchObject({ kind: 'curing', stepName: 'Dust cap', when: 'Thu 07:25, in 27 h 10 min' });
    // The same instant in a plant an hour east of UTC.
    expect(startBlock(t, test, NOW, 'Europe/Berlin')).toMatchObject({ when: 'Thu 08:25, in 27 h 10 min' });
  });

  it('a signed early start (quality deviation) lifts the gate; a finished cure never blocks', () => {
    const cap = step(4, { waitForCure: true, state: 'curing', cureCompleteAt: '2026-12-02T05:00:00.000Z' });
    const test = step(5);
    expect(startBlock(traveler([cap, test]), test, NOW, 'UTC', true)).toBeNull();
    expect(startBlock(traveler([cap, test]), test, Date.parse('2026-12-02T05:00:01.000Z'), 'UTC')).toBeNull();
  });

  it('a previous step that does not wait for cure never gates, however long its adhesive cures', () => {
    const prev = step(1, { waitForCure: false, state: 'curing', cureCompleteAt: '2026-12-05T00:00:00.000Z' });
    const next = step(2);
    expect(startBlock(traveler([prev, next]), next, NOW, 'UTC')).toBeNull();
  });

  it('names the other reasons: no step here, already running, an earlier step not finished', () => {
    const a = step(1, { state: 'running', name: 'Magnet assembly' });
    const b = step(2);
    expect(startBlock(traveler([a, b]), null, NOW, 'UTC')?.kind).toBe('no-step');
    expect(startBlock(traveler([a, b]), a, NOW, 'UTC')).toMatchObject({ kind: 'running' });
    expect(startBlock(traveler([a, b]), b, NOW, 'UTC')).toMatchObject({
      kind: 'out-of-order',
      text: 'Step 1 "Magnet assembly" must be finished first.',
    });
  });
});
