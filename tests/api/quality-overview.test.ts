import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { testResults } from '../../server/db/schema';
import { plantBaseline } from '../../server/services/quality/baseline';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import { createBatch, createModel, createStation, sfx } from '../helpers/fixtures';

let app: TestApp;
let qa: TestUser;
beforeAll(async () => {
  app = await startApp();
  qa = await ensureUser(['quality']);
  await db.execute(
    sql`INSERT INTO defect_codes (code, description) VALUES ('QO-RUB', 'Rub and buzz'), ('QO-POL', 'Wrong polarity') ON CONFLICT DO NOTHING`,
  );
});
afterAll(() => app.close());

/** A batch of `n` drivers of a new model with first tests at `at`: `fails` of them fail. */
async function testedBatch(n: number, fails: number, at: Date, defect = 'QO-RUB') {
  const kind = (await createStation({ kind: `qo ${sfx()}` })).kind;
  const model = await createModel({ steps: [{ stationKind: kind }] });
  const batch = await createBatch({ modelId: model.id, quantity: n });
  await db.insert(testResults).values(
    batch.drivers.map((d, i) => ({
      driverId: d.id,
      result: i < fails ? ('fail' as const) : ('pass' as const),
      defectCode: i < fails ? defect : null,
      testedAt: at,
    })),
  );
  return { model, batch };
}

describe('plant baseline', () => {
  // A crafted history far in the future, so no other test's results fall in its window.
  const now = new Date('2091-06-30T12:00:00Z');

  it('uses the plant default when the window holds too few tests', async () => {
    const b = await plantBaseline(db, now);
    expect(b).toMatchObject({ source: 'default', rate: 0.01, tested: 0, overridden: false });
  });

  it('is failed ÷ tested over the window once enough drivers were tested', async () => {
    await testedBatch(150, 3, new Date('2091-06-01T10:00:00Z'));
    await testedBatch(150, 6, new Date('2091-06-20T10:00:00Z'));
    await testedBatch(100, 50, new Date('2091-01-02T10:00:00Z')); // outside the 90-day window
    const b = await plantBaseline(db, now);
    expect(b).toMatchObject({ source: 'window', tested: 300, failed: 9 });
    expect(b.rate).toBeCloseTo(0.03, 12);
  });
});

describe('GET /api/quality/overview', () => {
  it('gives the Pareto of failures and first-pass yield for a model and period', async () => {
    const at = new Date(Date.now() - 3 * 86_400_000);
    const { model } = await testedBatch(20, 4, at, 'QO-RUB');
    const res = await api(app.baseUrl, qa.token).get(`/api/quality/overview?modelId=${model.id}`);
    expect(res.status).toBe(200);
    expect(res.body.pareto).toEqual([{ defectCode: 'QO-RUB', description: 'Rub and buzz', count: 4, cumulativePct: 100 }]);
    expect(res.body.firstPassYield).toHaveLength(1);
    expect(res.body.firstPassYield[0]).toMatchObject({ modelId: model.id, built: 20, passedFirstTime: 16, fpy: 0.8 });
    expect(res.body.baseline).toHaveProperty('rate');
    expect(Array.isArray(res.body.pChart)).toBe(true);
  });

  it('overrides the baseline with a reason (audited), and goes back', async () => {
    const set = await api(app.baseUrl, qa.token).post('/api/quality/baseline', {
      rate: 0.015,
      reason: 'New supplier of spiders; tighter watch for a month',
    });
    expect(set.status).toBe(200);
    expect(set.body).toMatchObject({ rate: 0.015, overridden: true, source: 'override', override: { by: qa.name } });
    const audit = await db.execute<{ reason: string }>(
      sql`SELECT reason FROM audit_log WHERE action = 'baseline.override' ORDER BY id DESC LIMIT 1`,
    );
    expect(audit.rows[0].reason).toContain('New supplier');
    const tooShort = await api(app.baseUrl, qa.token).post('/api/quality/baseline', { rate: 0.02, reason: 'x' });
    expect(tooShort.status).toBe(400);
    expect(JSON.stringify(tooShort.body.error.details)).toContain('reason');
    const back = await api(app.baseUrl, qa.token).post('/api/quality/baseline', { rate: null, reason: 'Month of tighter watch is over' });
    expect(back.body.overridden).toBe(false);
  });

  it('is for quality and admin only, and names a bad field', async () => {
    const clerk = await ensureUser(['receiving']);
    expect((await api(app.baseUrl, clerk.token).get('/api/quality/overview')).status).toBe(403);
    expect((await api(app.baseUrl).get('/api/quality/overview')).status).toBe(401);
    const bad = await api(app.baseUrl, qa.token).get('/api/quality/overview?from=2026-05-10&to=2026-05-01');
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body.error.details)).toContain('from');
  });
});
