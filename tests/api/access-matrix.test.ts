/**
 * Access matrix (issue 8): every route the Express app registers, read from its router stack
 * (server/route-table.ts, not a hand list of the app's own), is called with no session and as
 * each of the five roles. The expected answer comes from EXPECTED below (route → action, the
 * decision written down once more on purpose) and the permission map (action → roles):
 *   - no session: 401, except public routes;
 *   - a role the action does not allow: exactly 403 (never 2xx, never another 4xx, which would
 *     mean the route parsed or looked up something before it checked who asks);
 *   - a role it allows: anything but 401/403 (a 400 for the empty body, a 404 for the made-up id).
 * A route missing from EXPECTED, or a route whose endpoint names another access, fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/constants';
import { rolesFor, type Action } from '../../shared/permissions';
import { createApp } from '../../server/app';
import { routeTable, type RouteEntry } from '../../server/route-table';
import type { Access } from '../../server/http';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';

/** Who may call each route: 'public', 'signed-in' (every role) or an action of the permission map. */
const EXPECTED: Record<string, Access> = {
  'GET /api/health': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': 'public',
  'GET /api/auth/me': 'signed-in',
  'GET /api/users': 'users.manage',
  'POST /api/users': 'users.manage',
  'PATCH /api/users/:id': 'users.manage',
  'POST /api/users/:id/password-reset': 'users.manage',
  'POST /api/auth/reset': 'public',
  'GET /api/auth/sessions': 'signed-in',
  'DELETE /api/auth/sessions/:id': 'signed-in',

  'GET /api/drivers/:serial/trace': 'signed-in',
  'GET /api/lots/stats': 'signed-in',
  'GET /api/lots/:id/trace': 'signed-in',
  'GET /api/lots/:id/trace.csv': 'signed-in',

  'GET /api/defect-codes': 'signed-in',
  'POST /api/defect-codes': 'defects.edit',
  'PATCH /api/defect-codes/:code': 'defects.edit',
  'POST /api/tests': 'tests.record',
  'GET /api/drivers/:serial': 'signed-in',
  'POST /api/drivers/:serial/scrap': 'drivers.scrap',
  'POST /api/drivers/:serial/rework/start': 'drivers.rework',
  'POST /api/drivers/:serial/rework/finish': 'drivers.rework',

  'GET /api/stations': 'signed-in',
  'POST /api/stations': 'stations.edit',
  'GET /api/stations/:id': 'signed-in',
  'PATCH /api/stations/:id': 'stations.edit',
  'POST /api/stations/:id/retire': 'stations.edit',
  'POST /api/stations/:id/load': 'stations.load',
  'GET /api/stations/:id/loaded': 'signed-in',
  'POST /api/stations/:id/unload': 'stations.load',
  'POST /api/stations/:id/mixes': 'mixes.create',

  'GET /api/models': 'signed-in',
  'POST /api/models': 'models.edit',
  'GET /api/models/:id': 'signed-in',
  'PATCH /api/models/:id': 'models.edit',

  'GET /api/batches': 'signed-in',
  'POST /api/batches': 'batches.create',
  'GET /api/batches/:id': 'signed-in',
  'GET /api/batches/:id/cure': 'signed-in',
  'POST /api/batches/:id/steps/:stepId/start': 'steps.run',
  'POST /api/batches/:id/steps/:stepId/finish': 'steps.run',
  'GET /api/mixes/:id': 'signed-in',
  'GET /api/deviations': 'signed-in',
  'POST /api/deviations': 'deviations.record',
  'GET /api/readings': 'signed-in',
  'POST /api/readings': 'readings.record',
  'POST /api/cure/estimate': 'signed-in',
  'GET /api/cure/board': 'signed-in',

  'GET /api/materials': 'signed-in',
  'GET /api/materials/:id': 'signed-in',
  'GET /api/materials/:id/fefo': 'signed-in',
  'POST /api/materials': 'materials.edit',
  'PATCH /api/materials/:id': 'materials.edit',
  'POST /api/materials/:id/retire': 'materials.edit',
  'POST /api/materials/:id/sds': 'materials.edit',
  'GET /api/suppliers': 'signed-in',
  'GET /api/suppliers/:id': 'signed-in',
  'POST /api/suppliers': 'suppliers.edit',
  'PATCH /api/suppliers/:id': 'suppliers.edit',
  'POST /api/suppliers/:id/retire': 'suppliers.edit',

  'GET /api/lots': 'signed-in',
  'POST /api/lots': 'lots.receive',
  'GET /api/lots/:id': 'signed-in',
  'GET /api/lots/:id/history': 'lots.readHistory',
  'GET /api/lots/:id/status-changes': 'signed-in',
  'POST /api/lots/:id/status': 'lots.release',
  'POST /api/lots/:id/certificate': 'lots.attachCertificate',
  'GET /api/containers/:id': 'signed-in',
  'POST /api/containers/:id/open': 'containers.handle',
  'POST /api/containers/:id/thaw': 'containers.handle',
  'POST /api/containers/:id/location': 'containers.handle',
  'POST /api/containers/:id/empty': 'containers.empty',
  'POST /api/containers/:id/scrap': 'containers.scrap',
  'POST /api/containers/:id/out-of-storage': 'containers.handle',
  'POST /api/containers/:id/return-to-storage': 'containers.handle',
  'POST /api/scans/resolve': 'signed-in',
  'GET /api/labels/layouts': 'signed-in',
  'GET /api/labels/render': 'labels.print',
  'GET /api/labels/stations': 'labels.print',
  'GET /api/attachments/:id/meta': 'signed-in',
  'GET /api/attachments/:id': 'signed-in',

  'GET /api/alerts': 'signed-in',
  'POST /api/alerts/:id/acknowledge': 'alerts.acknowledge',
  'POST /api/alerts/:id/resolve': 'alerts.resolve',
  'POST /api/compliance/run': 'compliance.run',

  // Routes merged to main without a row here (added with the oversight pages).
  'GET /api/config': 'public',
  'POST /api/auth/password': 'signed-in',
  'GET /api/users/:id/notifications': 'notifications.manageAll',
  'PUT /api/users/:id/notifications': 'notifications.manageAll',
  'GET /api/me/notifications': 'signed-in',
  'PUT /api/me/notifications': 'signed-in',
  'GET /api/mail': 'signed-in',
  'GET /api/mail/:id': 'signed-in',
  'POST /api/notifications/digest': 'notifications.sendDigest',
  'POST /api/models/:id/revisions': 'recipes.edit',
  'POST /api/models/:id/make-current': 'recipes.edit',
  'GET /api/stock': 'stock.read',
  'POST /api/stock/simulate': 'stock.read',
  'GET /api/stock/outlook': 'stock.read',
  'GET /api/stock/today': 'stock.read',
  'GET /api/stock/materials/:id': 'stock.read',
  'GET /api/audit': 'audit.read',
  'POST /api/audit/verify': 'audit.verify',
  'GET /api/quality/overview': 'quality.overview',
  'POST /api/quality/baseline': 'quality.overrideBaseline',
  // Open to everyone signed in; each section inside is checked against the map's home.<role> actions.
  'GET /api/home': 'signed-in',
};

/** Roles allowed by an access; null for public (no session needed). */
function allowedRoles(access: Access): readonly Role[] | null {
  if (access === 'public') return null;
  if (access === 'signed-in') return ROLES;
  return rolesFor(access as Action);
}

/** A path with made-up but well-formed parameters: nothing real is found or changed. */
function concrete(path: string): string {
  const fill: Record<string, string> = {
    id: '00000000-0000-4000-8000-00000000a11e',
    stepId: '00000000-0000-4000-8000-00000000a11f',
    serial: 'NO-SUCH-SERIAL',
    code: 'NO-SUCH-CODE',
  };
  return path.replace(/:([A-Za-z]+)/g, (_m, name: string) => fill[name] ?? 'x');
}

const key = (r: Pick<RouteEntry, 'method' | 'path'>) => `${r.method} ${r.path}`;

// Signing out last, so that a session ended by it cannot spoil the calls after it.
const routes = routeTable(createApp()).sort((a, b) => Number(a.path === '/api/auth/logout') - Number(b.path === '/api/auth/logout'));

let app: TestApp;
const users = new Map<Role, TestUser>();
beforeAll(async () => {
  app = await startApp();
  for (const role of ROLES) users.set(role, await ensureUser([role]));
});
afterAll(() => app.close());

describe('access matrix', () => {
  it('every registered route is in the expected table with the same access, and every expected route exists', () => {
    const registered = new Map(routes.map((r) => [key(r), r.access]));
    expect(routes.filter((r) => !(key(r) in EXPECTED)).map(key), 'routes missing from EXPECTED').toEqual([]);
    expect(
      Object.keys(EXPECTED).filter((k) => !registered.has(k)),
      'EXPECTED routes the app does not register',
    ).toEqual([]);
    const differ = routes
      .filter((r) => EXPECTED[key(r)] !== r.access)
      .map((r) => `${key(r)}: app ${String(r.access)}, expected ${EXPECTED[key(r)]}`);
    expect(differ).toEqual([]);
  });

  it('answers each route as the permission map says, with no session and for each of the five roles', async () => {
    const wrong: string[] = [];
    for (const route of routes) {
      const access = EXPECTED[key(route)];
      if (!access) continue; // reported by the test above
      const allowed = allowedRoles(access);
      const path = concrete(route.path);
      const body = route.method === 'GET' ? undefined : {};

      const anonymous = await api(app.baseUrl).request(route.method, path, body);
      if (allowed === null ? anonymous.status === 401 || anonymous.status === 403 : anonymous.status !== 401) {
        wrong.push(`${key(route)} without a session → ${anonymous.status}`);
      }
      if (allowed === null && route.path === '/api/auth/login') continue; // one sign-in attempt is enough (rate limit)
      for (const role of ROLES) {
        const res = await api(app.baseUrl, users.get(role)?.token).request(route.method, path, body);
        const may = allowed === null || allowed.includes(role);
        if (may && (res.status === 401 || res.status === 403)) wrong.push(`${key(route)} as ${role} (allowed) → ${res.status}`);
        if (!may && res.status !== 403) wrong.push(`${key(route)} as ${role} (refused) → ${res.status}`);
        if (!may && res.status === 403 && (res.body as { error?: { code?: string } } | null)?.error?.code !== 'FORBIDDEN')
          wrong.push(`${key(route)} as ${role} → 403 without FORBIDDEN`);
        if (res.status >= 500) wrong.push(`${key(route)} as ${role} → ${res.status}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('a person holding no role is signed in but refused every action', async () => {
    const nobody = await ensureUser([]);
    const wrong: string[] = [];
    for (const route of routes) {
      const access = EXPECTED[key(route)];
      if (!access || access === 'public' || access === 'signed-in') continue;
      const res = await api(app.baseUrl, nobody.token).request(route.method, concrete(route.path), route.method === 'GET' ? undefined : {});
      if (res.status !== 403) wrong.push(`${key(route)} → ${res.status}`);
    }
    expect(wrong).toEqual([]);
  });
});
