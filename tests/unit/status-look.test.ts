import { describe, expect, it } from 'vitest';
import { statusLook } from '@/components/common/statusText';

const NOW = Date.parse('2026-12-02T10:00:00.000Z');
const past = '2026-12-01T23:59:00.000Z';
const future = '2026-12-09T00:00:00.000Z';

describe('status as shown: past its effective expiry reads Expired, whatever the release status', () => {
  it('a released, on-hold or quarantined lot past its expiry is "Expired (cause)" in red', () => {
    for (const status of ['released', 'on_hold', 'quarantined']) {
      const look = statusLook('lot', status, { expiresAt: past, cause: 'shelf_life', nowMs: NOW });
      expect(look).toMatchObject({ label: 'Expired (shelf life)', color: 'negative', expired: true });
      expect(look.hint).toContain('not to be used');
    }
  });

  it('a sealed or open container past its expiry is Expired too', () => {
    expect(statusLook('container', 'open', { expiresAt: past, cause: 'open_life', nowMs: NOW }).label).toBe('Expired (after-opening life)');
    expect(statusLook('container', 'sealed', { expiresAt: past, nowMs: NOW }).label).toBe('Expired');
  });

  it('before its expiry, or with none, the recorded status shows', () => {
    expect(statusLook('lot', 'released', { expiresAt: future, cause: 'shelf_life', nowMs: NOW })).toMatchObject({
      label: 'Released',
      color: 'positive',
    });
    expect(statusLook('lot', 'released', { expiresAt: null, nowMs: NOW }).label).toBe('Released');
    expect(statusLook('lot', 'released').label).toBe('Released');
  });

  it('used up, rejected, empty and scrapped stay as recorded: they are out of stock already', () => {
    expect(statusLook('lot', 'used_up', { expiresAt: past, nowMs: NOW }).label).toBe('Used up');
    expect(statusLook('lot', 'rejected', { expiresAt: past, nowMs: NOW }).label).toBe('Rejected');
    expect(statusLook('container', 'empty', { expiresAt: past, nowMs: NOW }).label).toBe('Empty');
    expect(statusLook('container', 'scrapped', { expiresAt: past, nowMs: NOW }).label).toBe('Scrapped');
  });
});
