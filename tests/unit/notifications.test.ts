import { describe, expect, it } from 'vitest';
import { ALERT_KINDS } from '../../shared/constants';
import { defaultModes, effectiveModes, kindsFor } from '../../shared/notifications';
import { guardedHtml } from '../../src/components/mail/mailLook';
import { digestCron } from '../../server/jobs/mail';
import { modeFor } from '../../server/services/notifications/alert-mail';

describe('notification defaults by role', () => {
  it("critical kinds in the role's audience at once, its other kinds in the digest, the rest not at all", () => {
    expect(defaultModes(['assembler'])).toEqual({
      pot_life_exceeded: 'immediate',
      short_cure: 'none',
      expired_in_stock: 'immediate',
      expiring_soon: 'none',
      quarantine_advised: 'none',
      below_reorder_point: 'none',
      audit_chain_broken: 'none',
      lamp_check_due: 'none',
      humidity_out_of_window: 'none',
    });
    expect(defaultModes(['purchasing'])).toMatchObject({
      below_reorder_point: 'digest',
      expiring_soon: 'digest',
      pot_life_exceeded: 'none',
    });
    // Several roles: the widest default wins kind by kind.
    expect(defaultModes(['purchasing', 'quality'])).toMatchObject({
      short_cure: 'immediate',
      below_reorder_point: 'digest',
      quarantine_advised: 'digest',
    });
  });

  it('an administrator may choose every kind but by default gets only what concerns admin (a broken audit trail, at once)', () => {
    expect(kindsFor(['admin'])).toEqual([...ALERT_KINDS]);
    expect(defaultModes(['admin'])).toEqual(
      Object.fromEntries(ALERT_KINDS.map((k) => [k, k === 'audit_chain_broken' ? 'immediate' : 'none'])),
    );
  });

  it('choices override defaults, kind by kind', () => {
    expect(effectiveModes(['quality'], { pot_life_exceeded: 'none' })).toMatchObject({
      pot_life_exceeded: 'none',
      short_cure: 'immediate',
    });
  });

  it('a kind outside the roles is never e-mailed, whatever was stored; an unknown kind only when critical', () => {
    expect(modeFor({ roles: ['receiving'], modes: { short_cure: 'immediate' } }, 'short_cure', 'critical')).toBe('none');
    expect(modeFor({ roles: ['quality'], modes: null }, 'new_kind', 'critical')).toBe('immediate');
    expect(modeFor({ roles: ['quality'], modes: null }, 'new_kind', 'warning')).toBe('none');
  });
});

describe('digest time', () => {
  it('reads HH:MM as a daily cron expression and refuses anything else', () => {
    expect(digestCron('06:30')).toBe('30 6 * * *');
    expect(digestCron('6:05')).toBe('5 6 * * *');
    expect(digestCron('23:59')).toBe('59 23 * * *');
    expect(() => digestCron('24:00')).toThrow(/24-hour time/);
    expect(() => digestCron('half past six')).toThrow(/24-hour time/);
  });
});

describe('HTML part in the Mailbox frame', () => {
  it('gets a policy that loads nothing, and links that leave the frame', () => {
    const page = guardedHtml('<!DOCTYPE html><html><head><title>x</title></head><body><img src="http://example.test/a.png"></body></html>');
    expect(page).toMatch(
      /<head><meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:; font-src data:"><base target="_blank"><title>/,
    );
    expect(guardedHtml('<p>bare</p>')).toMatch(
      /^<!DOCTYPE html><html><head><meta http-equiv="Content-Security-Policy"[^>]+><base target="_blank"><\/head><body><p>bare<\/p><\/body><\/html>$/,
    );
  });
});
