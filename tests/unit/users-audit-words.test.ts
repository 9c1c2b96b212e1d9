import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ACTION_OPTIONS, auditActionText } from '../../shared/audit-words';

const root = path.resolve(__dirname, '..', '..');

/** The audit actions the users and auth services write (read from their source). */
function actionsWritten(): string[] {
  const dirs = ['server/services/users', 'server/services/auth'];
  const found = new Set<string>();
  for (const dir of dirs) {
    for (const file of fs.readdirSync(path.join(root, dir))) {
      const text = fs.readFileSync(path.join(root, dir, file), 'utf8');
      for (const m of text.matchAll(/action:\s*(?:nextActive \? '([\w.]+)' : '([\w.]+)'|'([\w.]+)')/g)) {
        for (const a of m.slice(1)) if (a) found.add(a);
      }
    }
  }
  return [...found].sort();
}

describe('audit words for users and sessions', () => {
  it('every action the users and auth services write reads as its own words on the audit page and in its filter', () => {
    const actions = actionsWritten();
    expect(actions).toEqual(
      expect.arrayContaining([
        'login',
        'logout',
        'session.end',
        'user.create',
        'user.deactivate',
        'user.password_reset',
        'user.reactivate',
      ]),
    );
    const offered = new Set(ACTION_OPTIONS.map((o) => o.value));
    for (const action of actions) {
      expect(offered.has(action), action).toBe(true);
      expect(auditActionText(action), action).not.toMatch(/[._]/);
    }
    expect(auditActionText('user.deactivate')).toBe('User deactivated (sessions ended)');
    expect(auditActionText('user.password_reset_sent')).toBe('Password reset link sent');
  });
});
