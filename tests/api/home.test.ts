/**
 * GET /api/home: each role's figures computed from rows this file writes, and who sees which
 * section. API test files share one database, so counts are checked as the change from a first
 * reading to a second one around the rows written here (files run one after another).
 *
 * The plant's zone here is Pacific/Auckland (UTC+13 in December, +12 in winter), so the plant
 * day's midnight is never UTC midnight: a row a minute before it belongs to yesterday.
 */
import { vi } from 'vitest';

vi.hoisted(() => {
  process.env.TACKLOG_PLANT_ZONE = 'Pacific/Auckland';
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { db } from '../../server/db/client';
import { alerts, defectCodes, settings, stepRuns, testResults, users } from '../../server/db/schema';
import { config } from '../../server/config';
import { ROLES, type Role } from '../../shared/constants';
import { homeFiguresSchema, type HomeFigures } from '../../shared/schemas/home';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, type TestUser } from '../helpers/db';
import {
  createBatch,
  createLot,
  createMaterial,
  createModel,
  createStation,
  createStationLoad,
  createStepRun,
  minutesAgo,
  sfx,
} from '../helpers/fixtures';

const HOUR = 3_600_000;
const ZONE = 'Pacific/Auckland';
let app: TestApp;
const as = (u?: TestUser) => api(app.baseUrl, u?.token);

async function home(user: TestUser, query = ''): Promise<HomeFigures> {
  const res = await as(user).get(`/api/home${query}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return homeFiguresSchema.parse(res.body);
}

/** This plant day's midnight (Auckland), as the test computes it with luxon on its own. */
function plantMidnight(): Date {
  return DateTime.now().setZone(ZONE).startOf('day').toJSDate();
}

beforeAll(async () => {
  app = await startApp();
  await db.insert(defectCodes).values({ code: 'T-HOME', description: 'Rub found at home test' }).onConflictDoNothing();
});
afterAll(() => app.close());

describe('GET /api/home: access', () => {
  it('the test runs in the plant zone it set, whose midnight is not UTC midnight', () => {
    expect(config.plantZone).toBe(ZONE);
    expect(plantMidnight().getUTCHours()).not.toBe(0);
  });

  it('401 without a session; 400 naming stationId when it is not an id', async () => {
    expect((await as().get('/api/home')).status).toBe(401);
    const user = await ensureUser(['assembler']);
    const bad = await as(user).get('/api/home?stationId=ST-1');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('query.stationId');
  });

  it('each role sees its own section and no other; a person with two roles sees both', async () => {
    for (const role of ROLES) {
      const figures = await home(await ensureUser([role]));
      const sections = (['receiving', 'assembler', 'quality', 'purchasing', 'admin'] as const).filter((k) => figures[k] !== undefined);
      expect(sections, role).toEqual([role]);
    }
    const both = await home(await ensureUser(['receiving', 'quality']));
    expect(both.receiving).toBeDefined();
    expect(both.quality).toBeDefined();
    expect(both.admin).toBeUndefined();
    expect(both.purchasing).toBeUndefined();
    expect(both.assembler).toBeUndefined();
  });

  it('names the plant day it counted: Auckland midnight to the next', async () => {
    const figures = await home(await ensureUser(['receiving']));
    const midnight = plantMidnight();
    expect(figures.zone).toBe(ZONE);
    expect(Date.parse(figures.day.start)).toBe(midnight.getTime());
    expect(Date.parse(figures.day.end)).toBe(DateTime.fromJSDate(midnight).setZone(ZONE).plus({ days: 1 }).toMillis());
    expect(figures.day.date).toBe(DateTime.now().setZone(ZONE).toISODate());
    expect(figures.now).toMatch(/Z$/);
  });
});

describe('receiving: lots on the dock today, lots on hold', () => {
  it('counts lots and containers received in the plant day, not the minute before it; on hold with the oldest', async () => {
    const clerk = await ensureUser(['receiving']);
    const before = (await home(clerk)).receiving!;
    const midnight = plantMidnight();
    const material = await createMaterial({ name: 'Home test spider glue' });
    // Today (plant day): 3 + 2 containers; yesterday by one minute: not counted, whatever UTC says.
    const early = await createLot({
      materialId: material.id,
      status: 'on_hold',
      containers: 3,
      receivedAt: new Date(midnight.getTime() + 60_000),
    });
    // Two minutes ahead (unless the plant day ends sooner): newer than any lot the other test files
    // write meanwhile into the shared database (the list shows the latest few of the day, newest first).
    const dayEnd = DateTime.fromJSDate(midnight).setZone(ZONE).plus({ days: 1 }).toMillis();
    const lateAt = dayEnd - Date.now() > 3 * 60_000 ? new Date(Date.now() + 2 * 60_000) : minutesAgo(1);
    const late = await createLot({ materialId: material.id, status: 'released', containers: 2, receivedAt: lateAt });
    const yesterday = await createLot({
      materialId: material.id,
      status: 'on_hold',
      containers: 4,
      receivedAt: new Date(midnight.getTime() - 60_000),
    });
    // The oldest lot on hold in the whole plant: received 400 days ago.
    const oldest = await createLot({ materialId: material.id, status: 'on_hold', receivedAt: new Date(Date.now() - 400 * 24 * HOUR) });

    const after = (await home(clerk)).receiving!;
    expect(after.receivedToday.lots - before.receivedToday.lots).toBe(2);
    expect(after.receivedToday.containers - before.receivedToday.containers).toBe(5);
    const shown = after.receivedToday.latest.map((l) => l.lotId);
    expect(shown[0]).toBe(late.id); // newest first
    // `early` is counted above; whether it is among the latest few shown depends on what other test
    // files receive today into the shared database, so only the order of ours is checked.
    if (shown.includes(early.id)) expect(shown.indexOf(early.id)).toBeGreaterThan(0);
    expect(shown).not.toContain(yesterday.id);
    expect(after.receivedToday.latest[0]).toMatchObject({ supplierLot: late.supplierLot, status: 'released', containers: 2 });

    expect(after.onHold.count - before.onHold.count).toBe(3); // early, yesterday, oldest
    expect(after.onHold.oldestLotId).toBe(oldest.id);
    expect(Date.parse(after.onHold.oldestReceivedAt!)).toBe(oldest.receivedAt.getTime());
  });
});

describe('quality: alerts by severity, awaiting inspection, failures today, quarantine advised', () => {
  async function alert(
    kind: string,
    severity: 'info' | 'warning' | 'critical',
    audience: Role[],
    state: 'open' | 'acknowledged' | 'resolved' = 'open',
  ) {
    await db.insert(alerts).values({
      kind,
      severity,
      state,
      audience,
      subjectType: 'lot',
      subjectId: `home-${sfx()}`,
      message: 'Home page test alert',
    });
  }

  it('counts what it is told, for the quality audience only, and failures in the plant day only', async () => {
    const engineer = await ensureUser(['quality']);
    const before = (await home(engineer)).quality!;
    const bySeverity = (q: NonNullable<HomeFigures['quality']>, s: string) => q.alerts.find((a) => a.severity === s)!;

    await alert('expiring_soon', 'warning', ['quality', 'purchasing']);
    await alert('expiring_soon', 'warning', ['quality'], 'acknowledged');
    await alert('pot_life_exceeded', 'critical', ['quality', 'assembler']);
    await alert('quarantine_advised', 'critical', ['quality']);
    await alert('quarantine_advised', 'critical', ['quality'], 'resolved'); // resolved: not live
    await alert('below_reorder_point', 'info', ['purchasing']); // not meant for quality

    const midnight = plantMidnight();
    const model = await createModel({ steps: [{ stationKind: `test-${sfx()}` }] });
    const batch = await createBatch({ modelId: model.id, quantity: 4 });
    const [d1, d2, d3, d4] = batch.drivers;
    await db.insert(testResults).values([
      { driverId: d1.id, result: 'fail', defectCode: 'T-HOME', testedAt: new Date(midnight.getTime() + 60_000) },
      { driverId: d2.id, result: 'fail', defectCode: 'T-HOME', testedAt: minutesAgo(2) },
      { driverId: d3.id, result: 'pass', testedAt: minutesAgo(1) },
      // A minute before the plant's midnight: yesterday's failure.
      { driverId: d4.id, result: 'fail', defectCode: 'T-HOME', testedAt: new Date(midnight.getTime() - 60_000) },
    ]);
    const material = await createMaterial({ name: 'Home test cone glue' });
    await createLot({ materialId: material.id, status: 'on_hold' });

    const after = (await home(engineer)).quality!;
    expect(after.alerts.map((a) => a.severity)).toEqual(['critical', 'warning', 'info']);
    expect(bySeverity(after, 'warning').live - bySeverity(before, 'warning').live).toBe(2);
    expect(bySeverity(after, 'warning').unacknowledged - bySeverity(before, 'warning').unacknowledged).toBe(1);
    expect(bySeverity(after, 'critical').live - bySeverity(before, 'critical').live).toBe(2);
    expect(bySeverity(after, 'info').live - bySeverity(before, 'info').live).toBe(0);
    expect(after.quarantineAdvised - before.quarantineAdvised).toBe(1);
    expect(after.failuresToday.failed - before.failuresToday.failed).toBe(2);
    expect(after.failuresToday.tested - before.failuresToday.tested).toBe(3);
    expect(after.onHold.count - before.onHold.count).toBe(1);

    // The same live alerts the alerts page lists for this person, by kind.
    const listed = await as(engineer).get('/api/alerts?state=live&kind=quarantine_advised&limit=1');
    expect(listed.body.total).toBe(after.quarantineAdvised);
    // Each severity tile links to the alerts list filtered by that severity: the same count there.
    for (const s of after.alerts) {
      const page = await as(engineer).get(`/api/alerts?state=live&severity=${s.severity}&limit=500`);
      expect(page.body.total, s.severity).toBe(s.live);
      expect(new Set(page.body.items.map((a: { severity: string }) => a.severity))).toEqual(new Set(s.live ? [s.severity] : []));
    }
    const bad = await as(engineer).get('/api/alerts?severity=urgent');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].field).toBe('query.severity');
  });
});

describe('assembler: my station, its batch, cures ending soon', () => {
  it('has no station before this person did anything, then the station of their last step, with its batch and state', async () => {
    const user = await ensureUser(['assembler'], { email: `home-assembler-${sfx()}@tacklog.test` });
    const first = (await home(user)).assembler!;
    expect(first.station).toBeNull();
    expect(first.batch).toBeNull();

    const kind = `home cap ${sfx()}`;
    const glue = await createMaterial({ name: 'Home test cap glue', cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440 } });
    const model = await createModel({
      steps: [{ name: 'Dust cap', stationKind: kind, waitForCure: true, materials: [{ materialId: glue.id, amountPerUnit: 1 }] }],
    });
    const older = await createStation({ kind });
    const station = await createStation({ kind });
    const batch = await createBatch({ modelId: model.id, quantity: 3, status: 'in_process' });
    const lot = await createLot({ materialId: glue.id, containerStatus: 'open', openedAt: minutesAgo(300) });
    // An older run elsewhere, then the dust cap finished 2 h ago at `station` (no readings: 24 h at 25 °C).
    const old = await createStepRun({ batchId: batch.id, stepId: model.steps[0].id, stationId: older.id, finishedAt: minutesAgo(600) });
    await db.update(stepRuns).set({ startedBy: user.id }).where(eq(stepRuns.id, old.id));
    const finishedAt = new Date(Math.floor((Date.now() - 2 * HOUR) / 1000) * 1000);
    const run = await createStepRun({
      batchId: batch.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      finishedAt,
      cureCompleteAt: new Date(finishedAt.getTime() + 24 * HOUR),
      used: [{ containerId: lot.containers[0].id, quantity: 3 }],
    });
    await db.update(stepRuns).set({ startedBy: user.id, finishedBy: user.id }).where(eq(stepRuns.id, run.id));

    const finished = (await home(user)).assembler!;
    expect(finished.station).toMatchObject({ id: station.id, code: station.code, source: 'last-activity' });
    expect(finished.batch).toMatchObject({
      id: batch.id,
      code: batch.code,
      state: 'finished',
      quantity: 3,
      step: { name: 'Dust cap', seq: 1 },
    });
    expect(Date.parse(finished.batch!.since)).toBe(finishedAt.getTime());
    expect(Date.parse(finished.batch!.cureCompleteAt!)).toBe(finishedAt.getTime() + 24 * HOUR);

    // Containers loaded there for a second batch: that batch is the one at the station now.
    const next = await createBatch({ modelId: model.id, quantity: 5 });
    await createStationLoad({ stationId: station.id, batchId: next.id, containerId: lot.containers[0].id, loadedAt: minutesAgo(5) });
    const loaded = (await home(user)).assembler!;
    expect(loaded.batch).toMatchObject({ id: next.id, state: 'loaded', loadedCount: 1, step: { id: model.steps[0].id } });

    // A step running there wins over both.
    const running = await createStepRun({
      batchId: next.id,
      stepId: model.steps[0].id,
      stationId: station.id,
      startedAt: minutesAgo(3),
      finishedAt: null,
    });
    const now = (await home(user)).assembler!;
    expect(now.batch).toMatchObject({ id: next.id, state: 'running', step: { name: 'Dust cap' } });
    expect(Date.parse(now.batch!.since)).toBe(running.startedAt.getTime());

    // The station this device is set to wins over the person's last station.
    const device = (await home(user, `?stationId=${older.id}`)).assembler!;
    expect(device.station).toMatchObject({ id: older.id, source: 'device' });
    expect(device.batch).toMatchObject({ id: batch.id, state: 'finished' });
  });

  it('lists cures ending within the window, soonest first, and counts them all', async () => {
    const user = await ensureUser(['assembler']);
    const before = (await home(user)).assembler!.curesEndingSoon;
    expect(before.withinHours).toBe(4);
    const kind = `home soon ${sfx()}`;
    const glue = await createMaterial({ name: 'Home test slow glue', cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440 } });
    const model = await createModel({
      steps: [
        { stationKind: kind, waitForCure: true, materials: [{ materialId: glue.id, amountPerUnit: 1 }] },
        { stationKind: `${kind} next` },
      ],
    });
    const station = await createStation({ kind });
    /** A 24 h cure (no readings: the reference 25 °C) that finished `hoursAgo` ago. */
    async function cure(hoursAgo: number) {
      const batch = await createBatch({ modelId: model.id, status: 'in_process' });
      const lot = await createLot({ materialId: glue.id, containerStatus: 'open', openedAt: minutesAgo(hoursAgo * 60 + 60) });
      const finishedAt = new Date(Date.now() - hoursAgo * HOUR);
      await createStepRun({
        batchId: batch.id,
        stepId: model.steps[0].id,
        stationId: station.id,
        finishedAt,
        cureCompleteAt: new Date(finishedAt.getTime() + 24 * HOUR),
        used: [{ containerId: lot.containers[0].id, quantity: 2 }],
      });
      return batch;
    }
    const inThree = await cure(21); // ends in 3 h: soon
    const inOne = await cure(23); // ends in 1 h: soon, first
    const inTen = await cure(14); // ends in 10 h: not within 4 h
    const done = await cure(25); // cured an hour ago: not running
    const after = (await home(user)).assembler!.curesEndingSoon;
    expect(after.count - before.count).toBe(2);
    const mine = after.items.filter((i) => [inThree.id, inOne.id, inTen.id, done.id].includes(i.batchId)).map((i) => i.batchId);
    expect(mine).toEqual([inOne.id, inThree.id]);
    const times = after.items.map((i) => Date.parse(i.cureCompleteAt));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    expect(after.items.length).toBeLessThanOrEqual(5);
  });
});

describe('purchasing: the three figures of the stock page', () => {
  it('are the figures of GET /api/stock/today', async () => {
    const buyer = await ensureUser(['purchasing']);
    const figures = (await home(buyer)).purchasing!;
    const today = (await as(buyer).get('/api/stock/today')).body;
    expect(figures.runOuts).toEqual(today.runOuts);
    expect(figures.wasteThisMonth).toEqual(today.wasteThisMonth);
    expect(figures.expiringLots).toEqual(today.expiringLots);
  });
});

describe('admin: users, stations, the audit chain', () => {
  it('counts active users and stations, and shows the last verification without walking the chain', async () => {
    const admin = await ensureUser(['admin']);
    const before = (await home(admin)).admin!;
    await ensureUser(['receiving'], { email: `home-active-${sfx()}@tacklog.test` });
    const gone = await ensureUser(['receiving'], { email: `home-gone-${sfx()}@tacklog.test` });
    await db.update(users).set({ active: false }).where(eq(users.id, gone.id));
    await createStation();
    await createStation({ active: false });
    const after = (await home(admin)).admin!;
    expect(after.users.active - before.users.active).toBe(1);
    expect(after.users.total - before.users.total).toBe(2);
    expect(after.stations.active - before.stations.active).toBe(1);
    expect(after.stations.total - before.stations.total).toBe(2);
  });

  it('no verification yet; then a person’s Verify; then a broken result kept by the watch', async () => {
    const admin = await ensureUser(['admin']);
    await db.delete(settings).where(eq(settings.key, 'auditChainLastCheck'));
    expect((await home(admin)).admin!.auditChain).toEqual({ lastCheck: null, sinceLastCheck: null });

    const verified = await as(admin).post('/api/audit/verify', {});
    expect(verified.status).toBe(200);
    const check = (await home(admin)).admin!.auditChain.lastCheck!;
    expect(check).toMatchObject({ ok: verified.body.ok, checked: verified.body.checked, firstBroken: null });
    expect(Math.abs(Date.parse(check.at) - Date.now())).toBeLessThan(10 * 60_000);
    // An audited change after the check is counted as not yet verified.
    const sinceBefore = (await home(admin)).admin!.auditChain.sinceLastCheck!;
    const made = await as(admin).post('/api/stations', { code: `ST-H${sfx()}`, name: 'Home test press', kind: 'magnet', area: 'Hall A' });
    expect(made.status).toBe(201);
    expect((await home(admin)).admin!.auditChain.sinceLastCheck! - sinceBefore).toBeGreaterThanOrEqual(1);

    const broken = {
      at: new Date().toISOString(),
      ok: false,
      checked: 41,
      firstBroken: { id: 42, at: new Date().toISOString(), problem: 'its content no longer matches its seal (a field was changed)' },
    };
    await db.update(settings).set({ value: broken }).where(eq(settings.key, 'auditChainLastCheck'));
    expect((await home(admin)).admin!.auditChain.lastCheck).toEqual(broken);
    await db.delete(settings).where(eq(settings.key, 'auditChainLastCheck'));
  });
});
