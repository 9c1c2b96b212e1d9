import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { alerts, defectCodes, stepRuns, testResults } from '../../server/db/schema';
import { config } from '../../server/config';
import { sweep } from '../../server/services/compliance';
import { plantConfigSchema } from '../../shared/schemas/plant';
import { alertSchema, alertListSchema } from '../../shared/schemas/alerts';
import { lotHistorySchema } from '../../shared/schemas/lots';
import { formatDateTime } from '../../shared/plant-time';
import { api, startApp, type TestApp } from '../helpers/api';
import { ensureUser, pinBaseline, type TestUser } from '../helpers/db';
import { createBatch, createLot, createMaterial, createModel, createStation, createStepRun, hoursAgo } from '../helpers/fixtures';
import { newMaterial, newSupplier, pdfBytes, receive, upload } from '../helpers/receiving';

/**
 * Plant time and plain words through the API: the public plant settings, alert texts read in
 * one go with their figures in a detail line, who acknowledged and resolved an alert, and lot
 * history that names the things its ids point at.
 */
let app: TestApp;
let quality: TestUser, admin: TestUser;
const ids: Record<string, string> = {};
let cureCompleteAt: Date;
let shortStartedAt: Date;

let unpinBaseline: () => Promise<void> = async () => undefined;
beforeAll(async () => {
  unpinBaseline = await pinBaseline(0.01); // the plant default; see pinBaseline
  app = await startApp();
  quality = await ensureUser(['quality']);
  admin = await ensureUser(['admin']);

  const station = await createStation({ kind: 'moving_parts' });
  const model = await createModel({ steps: [{ stationKind: 'moving_parts' }, { stationKind: 'dust_cap' }] });
  const batch = await createBatch({ modelId: model.id, quantity: 100 });

  // Step 1 cured until 2 h ago; step 2 started 3 h ago under no deviation: a short cure.
  cureCompleteAt = new Date(Math.floor(hoursAgo(2).getTime() / 60_000) * 60_000);
  shortStartedAt = new Date(Math.floor(hoursAgo(3).getTime() / 60_000) * 60_000);
  await createStepRun({
    batchId: batch.id,
    stepId: model.steps[0].id,
    stationId: station.id,
    startedAt: hoursAgo(5),
    finishedAt: hoursAgo(4),
    cureCompleteAt,
  });
  const run = await createStepRun({
    batchId: batch.id,
    stepId: model.steps[1].id,
    stationId: station.id,
    startedAt: shortStartedAt,
    finishedAt: hoursAgo(2),
  });
  await db.update(stepRuns).set({ shortCure: true }).where(eq(stepRuns.id, run.id));
  ids.shortRun = run.id;

  // A lot built into 100 drivers of which 12 failed final test.
  const cone = await createMaterial({ name: 'Pressed cone', kind: 'cone', unit: 'pcs' });
  const suspect = await createLot({ materialId: cone.id, quantity: 500 });
  await createStepRun({
    batchId: batch.id,
    stepId: model.steps[0].id,
    stationId: station.id,
    used: [{ containerId: suspect.containers[0].id, quantity: 100 }],
  });
  await db.insert(defectCodes).values({ code: 'T-BUZZ', description: 'Buzz in sweep' }).onConflictDoNothing();
  await db.insert(testResults).values(
    batch.drivers.map((d, i) => ({
      driverId: d.id,
      result: i < 12 ? ('fail' as const) : ('pass' as const),
      defectCode: i < 12 ? 'T-BUZZ' : null,
    })),
  );
  ids.suspectLot = suspect.id;
  ids.material = cone.id;
  await sweep();
});
afterAll(async () => {
  await unpinBaseline();
  await app.close();
});

describe('GET /api/config', () => {
  it('tells anyone the plant zone and name, so the sign-in page already shows plant time', async () => {
    const res = await api(app.baseUrl).get('/api/config');
    expect(res.status).toBe(200);
    const body = plantConfigSchema.parse(res.body);
    expect(body.plantZone).toBe(config.plantZone);
    expect(body.plantName.length).toBeGreaterThan(0);
  });
});

describe('alert texts', () => {
  async function alertOf(subjectId: string, kind: string) {
    const res = await api(app.baseUrl, admin.token).get(`/api/alerts?kind=${kind}&state=live&limit=500`);
    expect(res.status).toBe(200);
    const found = alertListSchema.parse(res.body).items.find((a) => a.subjectId === subjectId);
    expect(found, `${kind} alert for ${subjectId}`).toBeTruthy();
    return found!;
  }

  it('says a suspect lot in one sentence and keeps the figures in a detail line and in data', async () => {
    const a = await alertOf(ids.suspectLot, 'quarantine_advised');
    const data = a.data as { pValue: number; qValue: number; ucl: number; baseline: number; inspected: number; defectives: number };
    const base = `${(data.baseline * 100).toFixed(1)} %`;
    expect(a.message).toContain(`fails 12.0 % of drivers at final test (12 of 100) against a plant rate of ${base}`);
    expect(a.message).toMatch(/; this is (very )?unlikely to be chance\. Consider quarantining it/);
    expect(a.message).not.toMatch(/q = |p-chart|e-\d/);
    expect(a.detail).toMatch(
      /^Exact one-sided binomial test: p = \S+; Benjamini–Hochberg q = \S+; p-chart upper limit for 100 drivers: \d+\.\d % \(above it\)\.$/,
    );
    // The p-chart limit, standard given (Montgomery §7.3): p + 3·sqrt(p(1−p)/n).
    expect(data.ucl).toBeCloseTo(data.baseline + 3 * Math.sqrt((data.baseline * (1 - data.baseline)) / 100), 12);
    expect(data).toMatchObject({ inspected: 100, defectives: 12 });
  });

  it('names when the previous cure was complete in a short-cure alert, in plant time', async () => {
    const a = await alertOf(ids.shortRun, 'short_cure');
    expect(a.message).toContain(`started at ${formatDateTime(shortStartedAt, config.plantZone)}`);
    expect(a.message).toContain(`full cure at ${formatDateTime(cureCompleteAt, config.plantZone)}`);
    expect(a.message).not.toMatch(/UTC|T\d\d:\d\d/);
  });

  it('says who acknowledged and who resolved an alert', async () => {
    const a = await alertOf(ids.shortRun, 'short_cure');
    const ack = await api(app.baseUrl, quality.token).post(`/api/alerts/${a.id}/acknowledge`);
    expect(ack.status).toBe(200);
    const acked = alertSchema.parse(ack.body.alert);
    expect(acked).toMatchObject({
      state: 'acknowledged',
      acknowledgedBy: quality.id,
      acknowledgedByName: quality.name,
      resolvedByName: null,
    });
    const done = await api(app.baseUrl, admin.token).post(`/api/alerts/${a.id}/resolve`, {
      resolution: 'Drivers of the batch re-tested; all passed.',
    });
    expect(done.status).toBe(200);
    const resolved = alertSchema.parse(done.body.alert);
    expect(resolved).toMatchObject({
      state: 'resolved',
      acknowledgedByName: quality.name,
      resolvedBy: admin.id,
      resolvedByName: admin.name,
    });
    // The list says the same.
    const list = alertListSchema.parse(
      (await api(app.baseUrl, admin.token).get('/api/alerts?state=resolved&kind=short_cure&limit=500')).body,
    );
    expect(list.items.find((x) => x.id === a.id)).toMatchObject({ acknowledgedByName: quality.name, resolvedByName: admin.name });
    const [row] = await db.select().from(alerts).where(eq(alerts.id, a.id));
    expect(row.resolvedBy).toBe(admin.id);
  });
});

describe('lot history names what its ids point at', () => {
  it('carries the material and supplier of a receipt and the certificate by its file name', async () => {
    const clerk = await ensureUser(['receiving']);
    const supplier = await newSupplier(api(app.baseUrl, admin.token));
    const material = await newMaterial(api(app.baseUrl, admin.token));
    const { lot } = await receive(api(app.baseUrl, clerk.token), { materialId: material.id, supplierId: supplier.id });
    const up = await upload(app.baseUrl, `/api/lots/${lot.id}/certificate`, {
      bytes: pdfBytes(),
      type: 'application/pdf',
      filename: 'CoA 7781.pdf',
      token: clerk.token,
    });
    expect(up.status).toBe(201);
    const res = await api(app.baseUrl, quality.token).get(`/api/lots/${lot.id}/history`);
    expect(res.status).toBe(200);
    const { items } = lotHistorySchema.parse(res.body);
    const received = items.find((e) => e.action === 'lot.receive')!;
    expect(received.names[material.id]).toBe(material.name);
    expect(received.names[supplier.id]).toBe(supplier.name);
    const cert = items.find((e) => e.action === 'lot.certificate')!;
    const certificateId = (cert.after as { certificateId: string }).certificateId;
    expect(cert.names).toEqual({ [certificateId]: 'CoA 7781.pdf' });
  });
});
