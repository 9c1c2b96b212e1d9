import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import pg from 'pg';
import stdlibCdf from '@stdlib/stats-base-dists-binomial-cdf';
import { db } from '../../server/db/client';
import { alerts, containers, defectCodes, lots, materials, stepRuns, testResults, outgoingEmails } from '../../server/db/schema';
import { sweep } from '../../server/services/compliance';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, pinBaseline, testDatabaseUrl, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createMix,
  createModel,
  createStation,
  createStationLoad,
  createStepRun,
  createTwoPart,
  daysAgo,
  hoursAgo,
  minutesAgo,
  ymd,
} from '../helpers/fixtures';

interface AlertBody {
  id: string;
  kind: string;
  subjectId: string;
  state: string;
  severity: string;
  message: string;
  data: Record<string, number> | null;
}

async function liveAlertsFor(subjectId: string) {
  return db.select().from(alerts).where(eq(alerts.subjectId, subjectId));
}

describe('compliance watch', () => {
  let app: TestApp;
  let quality: TestUser, purchasing: TestUser, receiving: TestUser, admin: TestUser;
  const ids: Record<string, string> = {};

  let unpinBaseline: () => Promise<void> = async () => undefined;
  beforeAll(async () => {
    unpinBaseline = await pinBaseline(0.01); // the plant default; see pinBaseline
    app = await startApp();
    quality = await ensureUser(['quality']);
    purchasing = await ensureUser(['purchasing']);
    receiving = await ensureUser(['receiving']);
    admin = await ensureUser(['admin']);

    // A two-part mix loaded at a station, past its pot life.
    const { resin, hardener } = await createTwoPart({ potLifeMinutes: 30 });
    const resinLot = await createLot({ materialId: resin.id });
    const hardLot = await createLot({ materialId: hardener.id });
    const station = await createStation({ kind: 'moving_parts' });
    const model = await createModel({ steps: [{ stationKind: 'moving_parts' }, { stationKind: 'dust_cap' }] });
    const batch = await createBatch({ modelId: model.id, quantity: 100 });
    const mix = await createMix({
      stationId: station.id,
      resinContainerId: resinLot.containers[0].id,
      hardenerContainerId: hardLot.containers[0].id,
      mixedAt: minutesAgo(50),
      potLifeEndsAt: minutesAgo(20),
    });
    await createStationLoad({ stationId: station.id, batchId: batch.id, mixId: mix.id });
    ids.mix = mix.id;

    // A step started before the previous cure was complete.
    const run = await createStepRun({
      batchId: batch.id,
      stepId: model.steps[1].id,
      stationId: station.id,
      startedAt: hoursAgo(3),
      finishedAt: hoursAgo(2),
    });
    await db.update(stepRuns).set({ shortCure: true }).where(eq(stepRuns.id, run.id));
    ids.shortRun = run.id;

    // Stock past its supplier expiry, and stock expiring within the window.
    const glue = await createMaterial({ name: 'Dust-cap adhesive', shelfLifeDays: 365 });
    const expired = await createLot({ materialId: glue.id, expiresOn: ymd(daysAgo(2)), receivedAt: daysAgo(100) });
    ids.expiredContainer = expired.containers[0].id;
    const soon = await createLot({ materialId: glue.id, expiresOn: ymd(new Date(Date.now() + 5 * 86_400_000)) });
    ids.soonLot = soon.id;
    // The same, loaded at a station: critical, for the station's people too.
    const expiredLoaded = await createLot({ materialId: glue.id, expiresOn: ymd(daysAgo(3)), receivedAt: daysAgo(100) });
    await createStationLoad({ stationId: station.id, batchId: batch.id, containerId: expiredLoaded.containers[0].id });
    ids.expiredLoaded = expiredLoaded.containers[0].id;

    // Refrigerated adhesive with 8 h out of cold storage allowed (common practice: a total
    // out-of-refrigeration time on the container's record): out now and past it; back in cold
    // storage with the whole allowance used; out for five minutes of it (a candidate within the
    // sweep's day of margin, which the exact computation clears); in cold storage with time to spare.
    const cold = await createMaterial({ name: 'Refrigerated cone adhesive', storageClass: 'refrigerated' });
    await db.update(materials).set({ outOfStorageAllowanceHours: 8 }).where(eq(materials.id, cold.id));
    const coldLot = await createLot({ materialId: cold.id, containers: 4, containerStatus: 'open', openedAt: hoursAgo(30) });
    const [outNow, usedUp, outWithTime, inStore] = coldLot.containers;
    await db
      .update(containers)
      .set({ outOfStorageMinutes: 300, outOfStorageSince: hoursAgo(4) })
      .where(eq(containers.id, outNow.id));
    await db.update(containers).set({ outOfStorageMinutes: 480, outOfStorageSince: null }).where(eq(containers.id, usedUp.id));
    await db
      .update(containers)
      .set({ outOfStorageMinutes: 0, outOfStorageSince: minutesAgo(5) })
      .where(eq(containers.id, outWithTime.id));
    await db.update(containers).set({ outOfStorageMinutes: 120, outOfStorageSince: null }).where(eq(containers.id, inStore.id));
    Object.assign(ids, { coldOutNow: outNow.id, coldUsedUp: usedUp.id, coldOutWithTime: outWithTime.id, coldInStore: inStore.id });

    // Low stock against a reorder point.
    const wire = await createMaterial({ name: 'Lead wire', kind: 'wire', unit: 'm' });
    await db.update(materials).set({ reorderPoint: '1000', orderQuantity: '5000' }).where(eq(materials.id, wire.id));
    await createLot({ materialId: wire.id, quantity: 100 });
    ids.lowMaterial = wire.id;

    // A lot built into 100 drivers of which 10 failed final test (baseline 1 %).
    const cone = await createMaterial({ name: 'Paper cone', kind: 'cone', unit: 'pcs' });
    const suspect = await createLot({ materialId: cone.id, quantity: 500 });
    await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      used: [{ containerId: suspect.containers[0].id, quantity: 100 }],
    });
    await db.insert(defectCodes).values({ code: 'T-RUB', description: 'Rub in sweep' }).onConflictDoNothing();
    await db.insert(testResults).values(
      batch.drivers.map((d, i) => ({
        driverId: d.id,
        result: i < 10 ? ('fail' as const) : ('pass' as const),
        defectCode: i < 10 ? 'T-RUB' : null,
      })),
    );
    ids.suspectLot = suspect.id;

    // A lot whose certificate of analysis has expired.
    const certLot = await createLot({ materialId: cone.id });
    await db
      .update(lots)
      .set({ certificateExpiresOn: ymd(daysAgo(1)) })
      .where(eq(lots.id, certLot.id));
    ids.certLot = certLot.id;
  });
  afterAll(async () => {
    await unpinBaseline();
    await app.close();
  });

  it('refuses a run without a session (401) and for a role that may not run it (403)', async () => {
    expect((await api(app.baseUrl).post('/api/compliance/run')).status).toBe(401);
    const res = await api(app.baseUrl, receiving.token).post('/api/compliance/run');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('FORBIDDEN');
    expect((await api(app.baseUrl).get('/api/alerts')).status).toBe(401);
  });

  it('raises one alert of each kind for the subjects in breach', async () => {
    const res = await api(app.baseUrl, quality.token).post('/api/compliance/run');
    expect(res.status).toBe(200);
    expect(res.body.ran).toBe(true);
    expect(res.body.raised).toBeGreaterThanOrEqual(7);
    const expectKind = async (subjectId: string, kind: string) => {
      const rows = await liveAlertsFor(subjectId);
      expect(rows.map((r) => r.kind)).toContain(kind);
      return rows.find((r) => r.kind === kind)!;
    };
    expect((await expectKind(ids.mix, 'pot_life_exceeded')).severity).toBe('critical');
    await expectKind(ids.shortRun, 'short_cure');
    const expired = await expectKind(ids.expiredContainer, 'expired_in_stock');
    expect(expired.message).toMatch(/supplier's expiry date/);
    expect(expired.severity).toBe('warning');
    const loaded = await expectKind(ids.expiredLoaded, 'expired_in_stock');
    expect(loaded.severity).toBe('critical');
    expect(loaded.message).toMatch(/loaded at a station/);
    // Out of cold storage since 4 h with 5 h used before: the 8 h ran out an hour ago.
    const outNow = await expectKind(ids.coldOutNow, 'expired_in_stock');
    expect((outNow.data as unknown as { cause: string }).cause).toBe('out_of_storage');
    const expiredAt = Date.parse((outNow.data as unknown as { expiredAt: string }).expiredAt);
    expect(Math.abs(expiredAt - (Date.now() - 3600_000))).toBeLessThan(120_000);
    expect((await expectKind(ids.coldUsedUp, 'expired_in_stock')).data).toMatchObject({ cause: 'out_of_storage' });
    for (const fine of [ids.coldOutWithTime, ids.coldInStore]) {
      expect((await liveAlertsFor(fine)).map((a) => a.kind)).not.toContain('expired_in_stock');
    }
    await expectKind(ids.soonLot, 'expiring_soon');
    await expectKind(ids.lowMaterial, 'below_reorder_point');
    await expectKind(ids.certLot, 'quarantine_advised');
    const suspect = await expectKind(ids.suspectLot, 'quarantine_advised');
    // One-sided exact binomial p-value for 10 failures in 100 at p = 0.01, checked against the
    // reference library @stdlib/stats-base-dists-binomial-cdf: P(X ≥ 10) = 1 − F(9).
    const data = suspect.data as { pValue: number; inspected: number; defectives: number };
    expect(data.inspected).toBe(100);
    expect(data.defectives).toBe(10);
    expect(data.pValue).toBeCloseTo(1 - stdlibCdf(9, 100, 0.01), 10);
  });

  it('never raises a duplicate on the next sweep', async () => {
    const before = (await db.select().from(alerts)).length;
    const res = await api(app.baseUrl, admin.token).post('/api/compliance/run');
    expect(res.status).toBe(200);
    expect((await db.select().from(alerts)).length).toBe(before);
    for (const id of Object.values(ids)) {
      const live = (await liveAlertsFor(id)).filter((a) => a.state !== 'resolved');
      const kinds = live.map((a) => a.kind);
      expect(new Set(kinds).size).toBe(kinds.length);
    }
  });

  it('runs exactly once while another process holds the watch lock', async () => {
    const other = new pg.Client({ connectionString: testDatabaseUrl() });
    await other.connect();
    try {
      await other.query('SELECT pg_advisory_lock(7226002)');
      expect(await sweep()).toEqual({ raised: 0, resolved: 0, ran: false });
    } finally {
      await other.query('SELECT pg_advisory_unlock(7226002)');
      await other.end();
    }
    const both = await Promise.all([sweep(), sweep()]);
    expect(both.filter((r) => r.ran).length).toBeGreaterThanOrEqual(1);
  });

  it('shows each role the alerts it cares about', async () => {
    const forPurchasing = (await api(app.baseUrl, purchasing.token).get('/api/alerts?state=open&limit=500')).body.items as AlertBody[];
    expect(forPurchasing.some((a) => a.subjectId === ids.lowMaterial && a.kind === 'below_reorder_point')).toBe(true);
    expect(forPurchasing.some((a) => a.kind === 'pot_life_exceeded')).toBe(false);
    const forQuality = (await api(app.baseUrl, quality.token).get('/api/alerts?state=open&limit=500')).body.items as AlertBody[];
    expect(forQuality.some((a) => a.subjectId === ids.suspectLot)).toBe(true);
    const bad = await api(app.baseUrl, quality.token).get('/api/alerts?state=sleeping');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('query.state');
  });

  it('queues e-mail, one per person, to those whose role the alert concerns and who want it at once', async () => {
    // Pot life passed is critical: assemblers and quality hear of it at once (their default).
    const [potLife] = (await liveAlertsFor(ids.mix)).filter((a) => a.kind === 'pot_life_exceeded');
    const mails = await db.select().from(outgoingEmails).where(eq(outgoingEmails.alertId, potLife.id));
    expect(mails.every((m) => m.to.length === 1)).toBe(true);
    const to = mails.map((m) => m.to[0]);
    expect(to).toContain(quality.email);
    expect(to).not.toContain(receiving.email);
    expect(to).not.toContain(purchasing.email);
    // Below reorder point is not critical: purchasing gets it in the daily digest, not at once.
    const [low] = (await liveAlertsFor(ids.lowMaterial)).filter((a) => a.kind === 'below_reorder_point');
    expect(await db.select().from(outgoingEmails).where(eq(outgoingEmails.alertId, low.id))).toHaveLength(0);
  });

  it('acknowledges and resolves with a reason, and refuses bad input', async () => {
    const [alert] = (await liveAlertsFor(ids.certLot)).filter((a) => a.state === 'open');
    const ack = await api(app.baseUrl, quality.token).post(`/api/alerts/${alert.id}/acknowledge`);
    expect(ack.status).toBe(200);
    expect(ack.body.alert.state).toBe('acknowledged');
    const short = await api(app.baseUrl, quality.token).post(`/api/alerts/${alert.id}/resolve`, { resolution: 'ok' });
    expect(short.status).toBe(400);
    expect(short.body.error.details[0].field).toBe('resolution');
    expect(
      (await api(app.baseUrl, receiving.token).post(`/api/alerts/${alert.id}/resolve`, { resolution: 'New certificate on file.' })).status,
    ).toBe(403);
    expect((await api(app.baseUrl, quality.token).post('/api/alerts/not-an-id/acknowledge')).status).toBe(400);
    const done = await api(app.baseUrl, quality.token).post(`/api/alerts/${alert.id}/resolve`, {
      resolution: 'Lot quarantined until a new certificate arrives.',
    });
    expect(done.status).toBe(200);
    expect(done.body.alert.state).toBe('resolved');
  });

  it('clears an alert by itself when its condition goes away', async () => {
    await db.update(containers).set({ status: 'scrapped' }).where(eq(containers.id, ids.expiredContainer));
    const res = await sweep();
    expect(res.resolved).toBeGreaterThanOrEqual(1);
    const rows = await liveAlertsFor(ids.expiredContainer);
    expect(rows.every((a) => a.state === 'resolved')).toBe(true);
  });
});
