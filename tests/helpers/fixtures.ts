/**
 * Reusable fixtures for API tests, inserted straight into the database with drizzle (no other
 * routes involved). Every code and name carries a random suffix, so tests can run side by side
 * in one database and again on the next run. All names are invented.
 *
 *   const sup = await createSupplier();
 *   const glue = await createMaterial({ kind: 'adhesive', cure: { refTempC: 25, handlingMinutes: 60, fullCureMinutes: 1440 } });
 *   const lot = await createLot({ materialId: glue.id, supplierId: sup.id, containers: 2, quantity: 100 });
 *   const st = await createStation({ kind: 'cap glue' });
 *   const model = await createModel({ steps: [{ stationKind: st.kind, materials: [{ materialId: glue.id, amountPerUnit: 2 }] }] });
 *   const batch = await createBatch({ modelId: model.id, quantity: 4 });
 *   await createStepRun({ batchId: batch.id, stepId: model.steps[0].id, stationId: st.id, finishedAt: hoursAgo(2),
 *                         used: [{ containerId: lot.containers[0].id, quantity: 8 }] });
 */
import crypto from 'node:crypto';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import {
  buildBatches,
  containers,
  driverModels,
  drivers,
  lots,
  materials,
  mixes,
  readings,
  recipeStepMaterials,
  recipeSteps,
  stationLoads,
  stations,
  stepRunMaterials,
  stepRuns,
  suppliers,
  type CureProfileJson,
} from '../../server/db/schema';
import type { ContainerStatus, LotStatus, MaterialKind, StorageClass } from '../../shared/constants';

export const sfx = (): string => crypto.randomBytes(3).toString('hex').toUpperCase();
export const hoursAgo = (h: number): Date => new Date(Date.now() - h * 3_600_000);
export const minutesAgo = (m: number): Date => new Date(Date.now() - m * 60_000);
export const daysAgo = (d: number): Date => new Date(Date.now() - d * 86_400_000);
/** YYYY-MM-DD of a date (UTC). */
export const ymd = (d: Date): string => d.toISOString().slice(0, 10);

export async function createSupplier(name = 'Brackenridge Adhesive Works') {
  const s = sfx();
  const [row] = await db
    .insert(suppliers)
    .values({ code: `SUP-${s}`, name: `${name} ${s}` })
    .returning();
  return row;
}

export interface MaterialFixture {
  name?: string;
  kind?: MaterialKind;
  unit?: string;
  storageClass?: StorageClass;
  shelfLifeDays?: number | null;
  openLifeHours?: number | null;
  potLifeMinutes?: number | null;
  partnerMaterialId?: string | null;
  cure?: CureProfileJson | null;
}

export async function createMaterial(m: MaterialFixture = {}) {
  const s = sfx();
  const [row] = await db
    .insert(materials)
    .values({
      code: `MAT-${s}`,
      name: `${m.name ?? 'Test material'} ${s}`,
      kind: m.kind ?? 'adhesive',
      unit: m.unit ?? 'g',
      storageClass: m.storageClass ?? 'ambient',
      shelfLifeDays: m.shelfLifeDays ?? null,
      openLifeHours: m.openLifeHours ?? null,
      potLifeMinutes: m.potLifeMinutes ?? null,
      partnerMaterialId: m.partnerMaterialId ?? null,
      cure: m.cure ?? null,
      requiresInspection: false,
      hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H317'] },
    })
    .returning();
  return row;
}

/** Resin and hardener that name each other as mix partners. */
export async function createTwoPart(opts: { potLifeMinutes?: number; cure?: CureProfileJson } = {}) {
  const resin = await createMaterial({
    name: 'Two-part epoxy resin',
    potLifeMinutes: opts.potLifeMinutes ?? 30,
    cure: opts.cure ?? { refTempC: 25, handlingMinutes: 120, fullCureMinutes: 1440 },
  });
  const hardener = await createMaterial({ name: 'Two-part epoxy hardener', kind: 'hardener', partnerMaterialId: resin.id });
  await db.update(materials).set({ partnerMaterialId: hardener.id }).where(eq(materials.id, resin.id));
  return { resin: { ...resin, partnerMaterialId: hardener.id }, hardener };
}

export interface LotFixture {
  materialId: string;
  supplierId?: string;
  status?: LotStatus;
  containers?: number;
  quantity?: number;
  receivedAt?: Date;
  manufacturedOn?: string | null;
  expiresOn?: string | null;
  containerStatus?: ContainerStatus;
  openedAt?: Date | null;
  remaining?: number;
}

export async function createLot(l: LotFixture) {
  const s = sfx();
  const supplierId = l.supplierId ?? (await createSupplier()).id;
  const [lot] = await db
    .insert(lots)
    .values({
      materialId: l.materialId,
      supplierId,
      supplierLot: `SL-${s}`,
      status: l.status ?? 'released',
      receivedAt: l.receivedAt ?? daysAgo(1),
      manufacturedOn: l.manufacturedOn ?? null,
      expiresOn: l.expiresOn ?? null,
    })
    .returning();
  const n = l.containers ?? 1;
  const quantity = l.quantity ?? 100;
  const rows = await db
    .insert(containers)
    .values(
      Array.from({ length: n }, (_, i) => ({
        code: `TC${s}${String(i + 1).padStart(2, '0')}`,
        lotId: lot.id,
        seq: i + 1,
        quantity: quantity.toFixed(3),
        remaining: (l.remaining ?? quantity).toFixed(3),
        status: l.containerStatus ?? 'sealed',
        openedAt: l.openedAt ?? null,
      })),
    )
    .returning();
  return { ...lot, containers: rows };
}

export async function createStation(st: { kind?: string; area?: string; active?: boolean; cureEnvironment?: 'area' | 'own' } = {}) {
  const s = sfx();
  const [row] = await db
    .insert(stations)
    .values({
      code: `ST-${s}`,
      name: `Test station ${s}`,
      kind: st.kind ?? `kind-${s}`,
      area: st.area ?? `area-${s}`,
      active: st.active ?? true,
      cureEnvironment: st.cureEnvironment ?? 'area',
    })
    .returning();
  return row;
}

export interface StepFixture {
  name?: string;
  stationKind: string;
  waitForCure?: boolean;
  materials?: { materialId: string; amountPerUnit: number }[];
}

export async function createModel(m: { steps: StepFixture[]; code?: string }) {
  const s = sfx();
  const [model] = await db
    .insert(driverModels)
    .values({ code: m.code ?? `TM${s}`, name: `Test woofer ${s}` })
    .returning();
  const steps = [];
  for (const [i, st] of m.steps.entries()) {
    const [row] = await db
      .insert(recipeSteps)
      .values({
        modelId: model.id,
        seq: i + 1,
        name: st.name ?? `Step ${i + 1}`,
        stationKind: st.stationKind,
        waitForCure: st.waitForCure ?? false,
      })
      .returning();
    if (st.materials?.length) {
      await db
        .insert(recipeStepMaterials)
        .values(st.materials.map((x) => ({ stepId: row.id, materialId: x.materialId, amountPerUnit: String(x.amountPerUnit) })));
    }
    steps.push(row);
  }
  return { ...model, steps };
}

export async function createBatch(b: { modelId: string; quantity?: number; status?: 'open' | 'in_process' | 'completed' | 'cancelled' }) {
  const s = sfx();
  const quantity = b.quantity ?? 2;
  const [batch] = await db
    .insert(buildBatches)
    .values({ code: `TB-${s}`, modelId: b.modelId, quantity, status: b.status ?? 'open' })
    .returning();
  const units = await db
    .insert(drivers)
    .values(Array.from({ length: quantity }, (_, i) => ({ serial: `TB-${s}-${String(i + 1).padStart(4, '0')}`, batchId: batch.id })))
    .returning();
  return { ...batch, drivers: units };
}

/** A step run with chosen (past) times and what it used. */
export async function createStepRun(r: {
  batchId: string;
  stepId: string;
  stationId: string;
  startedAt?: Date;
  finishedAt?: Date | null;
  driverId?: string;
  used?: { containerId?: string; mixId?: string; quantity: number }[];
  cureCompleteAt?: Date | null;
}) {
  const finishedAt = r.finishedAt === undefined ? hoursAgo(1) : r.finishedAt;
  const [run] = await db
    .insert(stepRuns)
    .values({
      batchId: r.batchId,
      stepId: r.stepId,
      stationId: r.stationId,
      driverId: r.driverId ?? null,
      kind: r.driverId ? 'rework' : 'build',
      startedAt: r.startedAt ?? new Date((finishedAt ?? new Date()).getTime() - 600_000),
      finishedAt,
      cureCompleteAt: r.cureCompleteAt ?? null,
    })
    .returning();
  if (r.used?.length) {
    await db.insert(stepRunMaterials).values(
      r.used.map((u) => ({
        stepRunId: run.id,
        containerId: u.containerId ?? null,
        mixId: u.mixId ?? null,
        quantityUsed: u.quantity.toFixed(3),
      })),
    );
  }
  return run;
}

/** A station's own reading (an oven's temperature, a UV lamp's radiometer irradiance). */
export async function createStationReading(stationId: string, at: Date, r: { tempC?: number; irradianceMWcm2?: number }) {
  const [row] = await db
    .insert(readings)
    .values({
      stationId,
      at,
      tempC: r.tempC === undefined ? null : r.tempC.toFixed(2),
      irradianceMWcm2: r.irradianceMWcm2 === undefined ? null : r.irradianceMWcm2.toFixed(2),
      source: 'fixture',
    })
    .returning();
  return row;
}

export async function createReading(area: string, at: Date, tempC: number, rhPct?: number) {
  const [row] = await db
    .insert(readings)
    .values({ area, at, tempC: tempC.toFixed(2), rhPct: rhPct === undefined ? null : rhPct.toFixed(2), source: 'fixture' })
    .returning();
  return row;
}

/** A mix row with a chosen pot-life end (e.g. in the past), drawn from two containers. */
export async function createMix(m: {
  stationId: string;
  resinContainerId: string;
  hardenerContainerId: string;
  mixedAt?: Date;
  potLifeEndsAt: Date;
  remaining?: number;
}) {
  const [row] = await db
    .insert(mixes)
    .values({
      code: `TMX-${sfx()}`,
      stationId: m.stationId,
      resinContainerId: m.resinContainerId,
      hardenerContainerId: m.hardenerContainerId,
      resinQuantity: '20.000',
      hardenerQuantity: '10.000',
      remaining: (m.remaining ?? 30).toFixed(3),
      mixedAt: m.mixedAt ?? hoursAgo(1),
      potLifeEndsAt: m.potLifeEndsAt,
    })
    .returning();
  return row;
}

/** Something loaded at a station for a batch, written directly (e.g. to age it). */
export async function createStationLoad(l: { stationId: string; batchId: string; containerId?: string; mixId?: string; loadedAt?: Date }) {
  const [row] = await db
    .insert(stationLoads)
    .values({
      stationId: l.stationId,
      batchId: l.batchId,
      containerId: l.containerId ?? null,
      mixId: l.mixId ?? null,
      loadedAt: l.loadedAt ?? new Date(),
    })
    .returning();
  return row;
}
