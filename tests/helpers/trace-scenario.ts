/**
 * A small, fully known genealogy inserted straight into the database with drizzle (no other
 * routes involved), for the trace and final-test API tests. Every code carries a random suffix
 * so scenarios can be built side by side in one database. All names are invented.
 *
 * Model "scenario woofer", three steps:
 *   1 Magnet bond  (ST-MAG)  a two-part mix: resin + hardener
 *   2 Moving parts (ST-MOV)  cyanoacrylate + lead wire
 *   3 Dust cap     (ST-CAP)  cap adhesive, must cure before the driver goes on
 * Batch B1 (4 drivers): all three steps finished two days ago.
 *   mix M1 = resin R1 + hardener H1; step 2 used two containers of CA1 and wire W; step 3 cap glue CAP.
 *   unit 2 failed (defect), was reworked at step 2 with CA2 (a lot used nowhere else) and wire W,
 *   then passed. Unit 1 passed; unit 3 failed; unit 4 was scrapped.
 * Batch B2 (3 drivers, in process): mix M2 = resin R1 + hardener H2; step 2 with CA3 and W;
 *   step 3 started (using CAP), not finished.
 * Lot UNUSED was received and never used.
 */
import crypto from 'node:crypto';
import { eq } from 'drizzle-orm';
import { db } from '../../server/db/client';
import {
  buildBatches,
  containers,
  defectCodes,
  driverModels,
  drivers,
  lots,
  materials,
  mixes,
  recipeStepMaterials,
  recipeSteps,
  stations,
  stepRunMaterials,
  stepRuns,
  suppliers,
  testResults,
} from '../../server/db/schema';
import type { MaterialKind } from '../../shared/constants';

const HOUR = 3600_000;

export interface ScenarioLot {
  id: string;
  supplierLot: string;
  materialId: string;
  containerCodes: string[];
}

export interface TraceScenario {
  sfx: string;
  modelId: string;
  modelCode: string;
  steps: { id: string; seq: number; name: string }[];
  stations: Record<'mag' | 'mov' | 'cap', { id: string; code: string }>;
  batches: Record<'b1' | 'b2', { id: string; code: string; serials: string[] }>;
  lots: Record<'resin' | 'hard1' | 'hard2' | 'ca1' | 'ca2' | 'ca3' | 'wire' | 'cap' | 'unused', ScenarioLot>;
  mixCodes: { m1: string; m2: string };
  defectCodes: { active: string; inactive: string };
  /** Serial of the B1 unit that failed, was reworked and passed. */
  reworkedSerial: string;
  /** The rework run's id. */
  reworkRunId: string;
}

export async function buildTraceScenario(): Promise<TraceScenario> {
  const sfx = crypto.randomBytes(3).toString('hex').toUpperCase();
  const t0 = Date.now() - 72 * HOUR;
  const at = (h: number) => new Date(t0 + h * HOUR);

  return db.transaction(async (tx) => {
    const [supA, supB] = await tx
      .insert(suppliers)
      .values([
        { code: `SUP-A-${sfx}`, name: `Fernhollow Bonding Supplies ${sfx}` },
        { code: `SUP-B-${sfx}`, name: `Quillmere Wire & Coil ${sfx}` },
      ])
      .returning();

    const mat = async (key: string, kind: MaterialKind, unit: string, name: string) => {
      const [m] = await tx
        .insert(materials)
        .values({ code: `${key}-${sfx}`, name: `${name} ${sfx}`, kind, unit, requiresInspection: false })
        .returning();
      return m;
    };
    const resin = await mat('RES', 'adhesive', 'g', 'Scenario epoxy resin');
    const hardener = await mat('HRD', 'hardener', 'g', 'Scenario epoxy hardener');
    const ca = await mat('CA', 'adhesive', 'g', 'Scenario cyanoacrylate');
    const wire = await mat('WIRE', 'wire', 'm', 'Scenario tinsel lead wire');
    const capGlue = await mat('CAPG', 'adhesive', 'g', 'Scenario dust-cap adhesive');

    const containerIds: Record<string, string[]> = {};
    const lot = async (key: keyof TraceScenario['lots'], materialId: string, supplierId: string, count: number): Promise<ScenarioLot> => {
      const supplierLot = `${key.toUpperCase()}-${sfx}`;
      const [l] = await tx
        .insert(lots)
        .values({ materialId, supplierId, supplierLot, status: 'released', receivedAt: at(-24) })
        .returning();
      const cs = await tx
        .insert(containers)
        .values(
          Array.from({ length: count }, (_, i) => ({
            code: `C-${key.toUpperCase()}-${sfx}-${i + 1}`,
            lotId: l.id,
            seq: i + 1,
            quantity: '500',
            remaining: '400',
          })),
        )
        .returning();
      containerIds[key] = cs.map((c) => c.id);
      return { id: l.id, supplierLot, materialId, containerCodes: cs.map((c) => c.code) };
    };
    const scenarioLots: TraceScenario['lots'] = {
      resin: await lot('resin', resin.id, supA.id, 1),
      hard1: await lot('hard1', hardener.id, supA.id, 1),
      hard2: await lot('hard2', hardener.id, supA.id, 1),
      ca1: await lot('ca1', ca.id, supA.id, 2),
      ca2: await lot('ca2', ca.id, supA.id, 1),
      ca3: await lot('ca3', ca.id, supA.id, 1),
      wire: await lot('wire', wire.id, supB.id, 1),
      cap: await lot('cap', capGlue.id, supA.id, 1),
      unused: await lot('unused', ca.id, supA.id, 1),
    };

    const st = await tx
      .insert(stations)
      .values([
        { code: `ST-MAG-${sfx}`, name: 'Magnet bond cell', kind: 'magnet_bond', area: `hall-${sfx}` },
        { code: `ST-MOV-${sfx}`, name: 'Moving parts bench', kind: 'moving_parts', area: `hall-${sfx}` },
        { code: `ST-CAP-${sfx}`, name: 'Dust cap bench', kind: 'dust_cap', area: `hall-${sfx}` },
      ])
      .returning();
    const [mag, mov, cap] = st;

    const [model] = await tx
      .insert(driverModels)
      .values({ code: `SW-${sfx}`, name: `Scenario woofer ${sfx}` })
      .returning();
    const steps = await tx
      .insert(recipeSteps)
      .values([
        { modelId: model.id, seq: 1, name: 'Magnet bond', stationKind: 'magnet_bond' },
        { modelId: model.id, seq: 2, name: 'Moving parts', stationKind: 'moving_parts' },
        { modelId: model.id, seq: 3, name: 'Dust cap', stationKind: 'dust_cap', waitForCure: true },
      ])
      .returning();
    await tx.insert(recipeStepMaterials).values([
      { stepId: steps[0].id, materialId: resin.id, amountPerUnit: '2' },
      { stepId: steps[0].id, materialId: hardener.id, amountPerUnit: '1' },
      { stepId: steps[1].id, materialId: ca.id, amountPerUnit: '0.5' },
      { stepId: steps[1].id, materialId: wire.id, amountPerUnit: '0.3' },
      { stepId: steps[2].id, materialId: capGlue.id, amountPerUnit: '0.8' },
    ]);

    const [m1, m2] = await tx
      .insert(mixes)
      .values([
        {
          code: `MIX-1-${sfx}`,
          stationId: mag.id,
          resinContainerId: containerIds.resin[0],
          hardenerContainerId: containerIds.hard1[0],
          resinQuantity: '20',
          hardenerQuantity: '10',
          remaining: '0',
          mixedAt: at(0.5),
          potLifeEndsAt: at(1.5),
          status: 'used_up' as const,
        },
        {
          code: `MIX-2-${sfx}`,
          stationId: mag.id,
          resinContainerId: containerIds.resin[0],
          hardenerContainerId: containerIds.hard2[0],
          resinQuantity: '20',
          hardenerQuantity: '10',
          remaining: '0',
          mixedAt: at(24.5),
          potLifeEndsAt: at(25.5),
          status: 'used_up' as const,
        },
      ])
      .returning();

    const batch = async (key: 'b1' | 'b2', quantity: number, createdAt: Date, status: 'completed' | 'in_process') => {
      const code = `SW-${sfx}-${key.toUpperCase()}`;
      const [b] = await tx.insert(buildBatches).values({ code, modelId: model.id, quantity, createdAt, status }).returning();
      const ds = await tx
        .insert(drivers)
        .values(
          Array.from({ length: quantity }, (_, i) => ({ serial: `${code}-${String(i + 1).padStart(4, '0')}`, batchId: b.id, createdAt })),
        )
        .returning();
      return { id: b.id, code, serials: ds.map((d) => d.serial), driverIds: ds.map((d) => d.id) };
    };
    const b1 = await batch('b1', 4, at(0), 'completed');
    const b2 = await batch('b2', 3, at(24), 'in_process');

    const run = async (
      batchId: string,
      stepIdx: number,
      stationId: string,
      startH: number,
      finishH: number | null,
      uses: ({ container: string } | { mix: string })[],
      extra: { driverId?: string; kind?: 'build' | 'rework'; cureH?: number } = {},
    ) => {
      const [r] = await tx
        .insert(stepRuns)
        .values({
          batchId,
          stepId: steps[stepIdx].id,
          stationId,
          startedAt: at(startH),
          finishedAt: finishH === null ? null : at(finishH),
          driverId: extra.driverId ?? null,
          kind: extra.kind ?? 'build',
          cureCompleteAt: extra.cureH === undefined ? null : at(extra.cureH),
        })
        .returning();
      await tx.insert(stepRunMaterials).values(
        uses.map((u) => ({
          stepRunId: r.id,
          quantityUsed: '5',
          loadedAt: at(startH),
          ...('container' in u ? { containerId: u.container } : { mixId: u.mix }),
        })),
      );
      return r.id;
    };
    // Batch 1: complete.
    await run(b1.id, 0, mag.id, 1, 2, [{ mix: m1.id }]);
    await run(b1.id, 1, mov.id, 3, 4, [
      { container: containerIds.ca1[0] },
      { container: containerIds.ca1[1] },
      { container: containerIds.wire[0] },
    ]);
    await run(b1.id, 2, cap.id, 5, 6, [{ container: containerIds.cap[0] }], { cureH: 20 });
    // Batch 2: step 3 still running.
    await run(b2.id, 0, mag.id, 25, 26, [{ mix: m2.id }]);
    await run(b2.id, 1, mov.id, 27, 28, [{ container: containerIds.ca3[0] }, { container: containerIds.wire[0] }]);
    await run(b2.id, 2, cap.id, 29, null, [{ container: containerIds.cap[0] }]);

    const active = `RB${sfx}`;
    const inactive = `OLD${sfx}`;
    await tx.insert(defectCodes).values([
      { code: active, description: 'Rub and buzz heard in the sweep' },
      { code: inactive, description: 'Retired code kept for old results', active: false },
    ]);

    // Unit 2 of batch 1: failed, reworked at step 2 with a fresh CA lot, passed.
    const [u1, u2, u3, u4] = b1.driverIds;
    await tx.insert(testResults).values([
      { driverId: u1, result: 'pass', testedAt: at(30) },
      { driverId: u2, result: 'fail', defectCode: active, testedAt: at(30.1) },
      { driverId: u3, result: 'fail', defectCode: active, testedAt: at(30.2) },
    ]);
    const reworkRunId = await run(b1.id, 1, mov.id, 40, 41, [{ container: containerIds.ca2[0] }, { container: containerIds.wire[0] }], {
      driverId: u2,
      kind: 'rework',
    });
    await tx.insert(testResults).values({ driverId: u2, result: 'pass', testedAt: at(50) });
    await tx.update(drivers).set({ status: 'passed' }).where(eq(drivers.id, u1));
    await tx.update(drivers).set({ status: 'passed' }).where(eq(drivers.id, u2));
    await tx.update(drivers).set({ status: 'failed' }).where(eq(drivers.id, u3));
    await tx.update(drivers).set({ status: 'scrapped' }).where(eq(drivers.id, u4));

    return {
      sfx,
      modelId: model.id,
      modelCode: model.code,
      steps: steps.map((s) => ({ id: s.id, seq: s.seq, name: s.name })),
      stations: { mag: { id: mag.id, code: mag.code }, mov: { id: mov.id, code: mov.code }, cap: { id: cap.id, code: cap.code } },
      batches: { b1: { id: b1.id, code: b1.code, serials: b1.serials }, b2: { id: b2.id, code: b2.code, serials: b2.serials } },
      lots: scenarioLots,
      mixCodes: { m1: m1.code, m2: m2.code },
      defectCodes: { active, inactive },
      reworkedSerial: b1.serials[1],
      reworkRunId,
    };
  });
}
