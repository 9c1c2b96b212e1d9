/**
 * The one permission map (shared/permissions.ts) against itself and against the app's real
 * route table (read from Express's router stack by server/route-table.ts, not a hand list).
 */
import { describe, expect, it } from 'vitest';
import { ROLES } from '../../shared/constants';
import { ACTIONS, PERMISSIONS, can, isAction, permissionsFor, rolesFor } from '../../shared/permissions';
import { createApp } from '../../server/app';
import { routeTable } from '../../server/route-table';

describe('permission map', () => {
  it('every action has at least one role, every role is a known role, and no role is listed twice', () => {
    for (const action of ACTIONS) {
      const roles = PERMISSIONS[action] as readonly string[];
      expect(roles.length, action).toBeGreaterThan(0);
      for (const role of roles) expect(ROLES as readonly string[], `${action}: ${role}`).toContain(role);
      expect(new Set(roles).size, action).toBe(roles.length);
    }
  });

  it('action names read as area.verb', () => {
    for (const action of ACTIONS) expect(action).toMatch(/^[a-z]+\.[a-z][A-Za-z]*$/);
  });

  it('denies by default: an unknown action, no roles, or a role not in the list', () => {
    expect(isAction('lots.fly')).toBe(false);
    expect(rolesFor('lots.fly')).toEqual([]);
    expect(can(['admin', 'quality', 'receiving', 'assembler', 'purchasing'], 'lots.fly')).toBe(false);
    expect(can([], 'lots.release')).toBe(false);
    expect(can(['receiving'], 'lots.release')).toBe(false);
    expect(can(['receiving', 'quality'], 'lots.release')).toBe(true);
  });

  it('permissionsFor lists exactly the actions whose roles include one of the user roles', () => {
    for (const role of ROLES) {
      const expected = ACTIONS.filter((a) => (PERMISSIONS[a] as readonly string[]).includes(role));
      expect(permissionsFor([role])).toEqual(expected);
    }
    expect(permissionsFor([])).toEqual([]);
    // One person with several roles gets the union.
    const both = permissionsFor(['receiving', 'quality']);
    expect(both).toContain('lots.receive');
    expect(both).toContain('lots.release');
  });

  it("keeps the decisions of issue 8: receiving does not empty containers; only quality and admin read a lot's full history", () => {
    expect(can(['receiving'], 'containers.empty')).toBe(false);
    expect(can(['receiving'], 'containers.handle')).toBe(true);
    expect([...rolesFor('lots.readHistory')].sort()).toEqual(['admin', 'quality']);
  });
});

describe('route table against the permission map', () => {
  const routes = routeTable(createApp());

  it('finds the routes the app registers (a sample the API contract names)', () => {
    const keys = routes.map((r) => `${r.method} ${r.path}`);
    for (const key of [
      'POST /api/auth/login',
      'GET /api/auth/me',
      'POST /api/lots',
      'POST /api/lots/:id/status',
      'POST /api/stations/:id/load',
      'GET /api/drivers/:serial/trace',
    ]) {
      expect(keys).toContain(key);
    }
    expect(routes.length).toBeGreaterThan(60);
  });

  it('every route names public, signed-in or a known action, and every access along a route agrees', () => {
    const bad = routes.filter((r) => r.access === undefined || (r.access !== 'public' && r.access !== 'signed-in' && !isAction(r.access)));
    expect(bad.map((r) => `${r.method} ${r.path} → ${String(r.access)}`)).toEqual([]);
    const mixed = routes.filter((r) => new Set(r.accesses).size > 1);
    expect(mixed.map((r) => `${r.method} ${r.path}: ${r.accesses.join(', ')}`)).toEqual([]);
  });

  it('only reads are open to everyone signed in; every change names an action (except signing in and out, their own password and sessions, and the cure calculator)', () => {
    const openChanges = routes.filter((r) => r.method !== 'GET' && (r.access === 'signed-in' || r.access === 'public'));
    expect(openChanges.map((r) => `${r.method} ${r.path}`).sort()).toEqual([
      'DELETE /api/auth/sessions/:id',
      'POST /api/auth/login',
      'POST /api/auth/logout',
      'POST /api/auth/password',
      'POST /api/auth/reset',
      'POST /api/cure/estimate',
      'POST /api/scans/resolve',
      'PUT /api/me/notifications',
    ]);
  });
});
