import { afterEach, describe, expect, it, vi } from 'vitest';
import { signSessionToken, verifySessionToken } from '../../server/services/auth/tokens';

// The verified-token memo must never accept what jsonwebtoken would refuse: a changed token,
// or a known one past its expiry.
describe('session tokens', () => {
  afterEach(() => vi.useRealTimers());

  it('a token verifies, and verifies again from the memo with the same claims', () => {
    const token = signSessionToken('user-1', 'session-1');
    expect(verifySessionToken(token)).toEqual({ userId: 'user-1', sessionId: 'session-1' });
    expect(verifySessionToken(token)).toEqual({ userId: 'user-1', sessionId: 'session-1' });
  });

  it('a token changed after a verified one is refused (signature or payload)', () => {
    const token = signSessionToken('user-2', 'session-2');
    expect(verifySessionToken(token)).not.toBeNull();
    const [head, payload, sig] = token.split('.');
    const otherPayload = Buffer.from(JSON.stringify({ sub: 'admin', jti: 'session-2', exp: 9_999_999_999 })).toString('base64url');
    expect(verifySessionToken(`${head}.${otherPayload}.${sig}`)).toBeNull();
    const flipped = sig.slice(0, -2) + (sig.endsWith('AA') ? 'BB' : 'AA');
    expect(verifySessionToken(`${head}.${payload}.${flipped}`)).toBeNull();
  });

  it('a remembered token stops working at its expiry', () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date('2026-03-01T08:00:00Z'));
    const token = signSessionToken('user-3', 'session-3');
    expect(verifySessionToken(token)).not.toBeNull();
    const { exp } = JSON.parse(Buffer.from(token.split('.')[1], 'base64url').toString()) as { exp: number };
    vi.setSystemTime(new Date(exp * 1000 - 1000));
    expect(verifySessionToken(token)).not.toBeNull();
    vi.setSystemTime(new Date(exp * 1000));
    expect(verifySessionToken(token)).toBeNull();
    expect(verifySessionToken(token)).toBeNull();
  });
});
