import crypto from 'node:crypto';
import { eq } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Tx } from '../client';
import * as s from '../schema';
import { DEMO_DEFECT_CODES, DEMO_MATERIALS, DEMO_MODELS, DEMO_STATIONS, DEMO_SUPPLIERS } from './catalogue';
import { DEMO_LAMP_IRRADIANCE, simulateHistory, type SimContainer, type SimMix } from './history';
import { CROCKFORD_ALPHABET, containerCodeFromBody } from '../../../shared/schemas/containers';

/** A container code in the format the receiving service issues (see shared/schemas/containers.ts). */
function demoContainerCode(): string {
  const bytes = crypto.randomBytes(8);
  let body = '';
  for (let i = 0; i < 8; i++) body += CROCKFORD_ALPHABET[bytes[i] % 32];
  return containerCodeFromBody(body);
}

async function insertChunked<T>(rows: T[], size: number, insert: (chunk: T[]) => Promise<unknown>): Promise<void> {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

const iso = (dt: DateTime) => dt.toJSDate();

/** Writes the invented demo plant and a few weeks of its history (relative to `now`). */
export async function seedPlant(tx: Tx, users: Record<string, string>, now = DateTime.utc()): Promise<void> {
  const admin = users['admin@tacklog.test'];
  const receiving = users['receiving@tacklog.test'];
  const assembler = users['assembler@tacklog.test'];
  const quality = users['quality@tacklog.test'];

  const supplierRows = await tx
    .insert(s.suppliers)
    .values(DEMO_SUPPLIERS.map((x) => ({ ...x })))
    .returning();
  const supplierId = new Map(supplierRows.map((r) => [r.code, r.id]));

  const materialRows = await tx
    .insert(s.materials)
    .values(
      DEMO_MATERIALS.map((m) => ({
        code: m.code,
        name: m.name,
        kind: m.kind,
        unit: m.unit,
        storageClass: m.storageClass,
        shelfLifeDays: m.shelfLifeDays ?? null,
        openLifeHours: m.openLifeHours ?? null,
        thawedLifeHours: m.thawedLifeHours ?? null,
        outOfStorageAllowanceHours: m.outOfStorageAllowanceHours ?? null,
        potLifeMinutes: m.potLifeMinutes ?? null,
        mixRatio: m.mixRatio != null ? String(m.mixRatio) : null,
        cure: m.cure ?? null,
        requiresInspection: m.requiresInspection,
        hazards: m.hazards ?? { pictograms: [], statements: [] },
        gtin: m.gtin ?? null,
        reorderPoint: m.reorderPoint != null ? String(m.reorderPoint) : null,
        orderQuantity: m.orderQuantity != null ? String(m.orderQuantity) : null,
        leadTimeDays: m.leadTimeDays ?? null,
      })),
    )
    .returning();
  const materialId = new Map(materialRows.map((r) => [r.code, r.id]));
  for (const m of DEMO_MATERIALS) {
    if (!m.partner) continue;
    await tx
      .update(s.materials)
      .set({ partnerMaterialId: materialId.get(m.partner)! })
      .where(eq(s.materials.id, materialId.get(m.code)!));
  }

  const stationRows = await tx.insert(s.stations).values(DEMO_STATIONS).returning();
  const station = new Map(stationRows.map((r) => [r.code, r]));

  const stepIds = new Map<string, string[]>();
  for (const model of DEMO_MODELS) {
    const [row] = await tx
      .insert(s.driverModels)
      .values({ code: model.code, name: model.name, description: model.description })
      .returning();
    const ids: string[] = [];
    for (const [i, step] of model.steps.entries()) {
      const [st] = await tx
        .insert(s.recipeSteps)
        .values({ modelId: row.id, seq: i + 1, name: step.name, stationKind: step.stationKind, waitForCure: step.waitForCure })
        .returning();
      ids.push(st.id);
      if (step.materials.length) {
        await tx
          .insert(s.recipeStepMaterials)
          .values(
            step.materials.map(([code, amount]) => ({ stepId: st.id, materialId: materialId.get(code)!, amountPerUnit: String(amount) })),
          );
      }
    }
    stepIds.set(model.code, ids);
    stepIds.set(`${model.code}:model`, [row.id]);
  }
  await tx.insert(s.defectCodes).values(DEMO_DEFECT_CODES);

  const h = simulateHistory(now, DEMO_MATERIALS, DEMO_MODELS);

  // Lots and containers.
  const containerId = new Map<SimContainer, string>();
  for (const lot of h.lots) {
    const [row] = await tx
      .insert(s.lots)
      .values({
        materialId: materialId.get(lot.materialCode)!,
        supplierId: supplierId.get(lot.supplierCode)!,
        supplierLot: lot.supplierLot,
        status: lot.status,
        receivedAt: iso(lot.receivedAt),
        manufacturedOn: lot.manufacturedOn,
        expiresOn: lot.expiresOn,
        receivedBy: receiving,
        statusReason: lot.statusReason ?? null,
        statusChangedAt: lot.status === 'on_hold' ? null : iso(lot.receivedAt.plus({ hours: 4 })),
        statusChangedBy: lot.status === 'on_hold' ? null : quality,
      })
      .returning({ id: s.lots.id });
    const cRows = await tx
      .insert(s.containers)
      .values(
        lot.containers.map((c) => ({
          code: demoContainerCode(),
          lotId: row.id,
          seq: c.seq,
          quantity: String(c.quantity),
          remaining: String(Math.max(0, c.remaining)),
          status: c.remaining <= 0 ? ('empty' as const) : c.openedAt ? ('open' as const) : ('sealed' as const),
          openedAt: c.openedAt ? iso(c.openedAt) : null,
          thawedAt: c.thawedAt ? iso(c.thawedAt) : null,
          location: c.location,
        })),
      )
      .returning({ id: s.containers.id, seq: s.containers.seq });
    for (const c of lot.containers) containerId.set(c, cRows.find((r) => r.seq === c.seq)!.id);
    await tx.insert(s.auditLog).values({
      at: iso(lot.receivedAt),
      actorId: receiving,
      action: 'lot.receive',
      entityType: 'lot',
      entityId: row.id,
      after: { supplierLot: lot.supplierLot, containers: lot.containers.length, status: 'on_hold' },
    });
    if (lot.status !== 'on_hold') {
      await tx.insert(s.auditLog).values({
        at: iso(lot.receivedAt.plus({ hours: 4 })),
        actorId: quality,
        action: 'lot.status',
        entityType: 'lot',
        entityId: row.id,
        before: { status: 'on_hold' },
        after: { status: lot.status === 'used_up' ? 'released' : lot.status },
        reason: lot.statusReason ?? 'Incoming inspection passed.',
      });
    }
  }

  // Mixes.
  const mixId = new Map<SimMix, string>();
  const mixesPerDay = new Map<string, number>();
  for (const m of h.mixes) {
    // MX-<yyMMdd>-<seq of the day>, as the mixing service numbers them.
    const day = m.mixedAt.toFormat('yyMMdd');
    const seq = (mixesPerDay.get(day) ?? 0) + 1;
    mixesPerDay.set(day, seq);
    const [row] = await tx
      .insert(s.mixes)
      .values({
        code: `MX-${day}-${String(seq).padStart(3, '0')}`,
        stationId: station.get(m.stationCode)!.id,
        resinContainerId: containerId.get(m.resin)!,
        hardenerContainerId: containerId.get(m.hardener)!,
        resinQuantity: String(m.resinQuantity),
        hardenerQuantity: String(m.hardenerQuantity),
        remaining: String(m.remaining),
        mixedAt: iso(m.mixedAt),
        potLifeEndsAt: iso(m.potLifeEndsAt),
        tempC: '23',
        status: m.status,
        mixedBy: assembler,
      })
      .returning({ id: s.mixes.id });
    mixId.set(m, row.id);
  }

  // Batches and drivers.
  const batchId = new Map<string, string>();
  const driverId = new Map<string, string>();
  for (const b of h.batches) {
    const [row] = await tx
      .insert(s.buildBatches)
      .values({
        code: b.code,
        modelId: stepIds.get(`${b.modelCode}:model`)![0],
        quantity: b.quantity,
        status: b.status,
        createdBy: assembler,
        createdAt: iso(b.createdAt),
        completedAt: b.status === 'completed' && b.completedAt ? iso(b.completedAt) : null,
      })
      .returning({ id: s.buildBatches.id });
    batchId.set(b.key, row.id);
    const dRows = await tx
      .insert(s.drivers)
      .values(b.drivers.map((d) => ({ serial: d.serial, batchId: row.id, status: d.status, createdAt: iso(b.createdAt) })))
      .returning({ id: s.drivers.id, serial: s.drivers.serial });
    for (const d of dRows) driverId.set(d.serial, d.id);
  }
  const tests = h.batches.flatMap((b) =>
    b.drivers.flatMap((d) =>
      d.tests.map((t) => ({
        driverId: driverId.get(d.serial)!,
        result: t.result,
        defectCode: t.defectCode ?? null,
        testedAt: iso(t.at),
        testedBy: assembler,
      })),
    ),
  );
  await insertChunked(tests, 2000, (chunk) => tx.insert(s.testResults).values(chunk));

  // Step runs and what they used.
  for (const run of h.stepRuns) {
    const batch = h.batches.find((b) => b.key === run.batchKey)!;
    const stepId = stepIds.get(batch.modelCode)![run.stepIndex];
    let deviationId: string | null = null;
    if (run.deviationReason) {
      const [dev] = await tx
        .insert(s.deviations)
        .values({
          kind: 'early_start',
          batchId: batchId.get(run.batchKey)!,
          stepId,
          reason: run.deviationReason,
          signedBy: quality,
          signedAt: iso(run.startedAt.minus({ minutes: 20 })),
          usedAt: iso(run.startedAt),
        })
        .returning({ id: s.deviations.id });
      deviationId = dev.id;
    }
    const cure = run.cureMinutes && run.finishedAt;
    const [row] = await tx
      .insert(s.stepRuns)
      .values({
        batchId: batchId.get(run.batchKey)!,
        stepId,
        stationId: station.get(run.stationCode)!.id,
        driverId: run.driverSerial ? driverId.get(run.driverSerial)! : null,
        kind: run.kind,
        startedAt: iso(run.startedAt),
        finishedAt: run.finishedAt ? iso(run.finishedAt) : null,
        startedBy: assembler,
        finishedBy: run.finishedAt ? assembler : null,
        handlingAt: cure ? iso(run.finishedAt!.plus({ minutes: run.cureMinutes!.handling })) : null,
        cureCompleteAt: cure ? iso(run.finishedAt!.plus({ minutes: run.cureMinutes!.full })) : null,
        shortCure: run.shortCure,
        deviationId,
        unitsDone: run.finishedAt ? (run.driverSerial ? 1 : batch.quantity) : null,
        ...(run.uv
          ? {
              exposureSeconds: String(run.uv.exposureSeconds),
              uvIrradianceMWcm2: String(run.uv.irradianceMWcm2),
              uvDoseMJcm2: String(run.uv.doseMJcm2),
              uvDoseNeededMJcm2: String(run.uv.neededMJcm2),
            }
          : {}),
      })
      .returning({ id: s.stepRuns.id });
    if (run.uses.length) {
      await tx.insert(s.stepRunMaterials).values(
        run.uses.map((u) => ({
          stepRunId: row.id,
          containerId: u.container ? containerId.get(u.container)! : null,
          mixId: u.mix ? mixId.get(u.mix)! : null,
          quantityUsed: String(Math.round(u.quantity * 1000) / 1000),
          loadedAt: iso(run.startedAt),
          loadedBy: assembler,
        })),
      );
    }
  }

  // What is loaded at the stations right now.
  if (h.loads.length) {
    await tx.insert(s.stationLoads).values(
      h.loads.map((l) => ({
        stationId: station.get(l.stationCode)!.id,
        batchId: batchId.get(l.batchKey)!,
        containerId: l.container ? containerId.get(l.container)! : null,
        mixId: l.mix ? mixId.get(l.mix)! : null,
        loadedAt: iso(l.at),
        loadedBy: assembler,
      })),
    );
  }

  await insertChunked(h.readings, 2000, (chunk) =>
    tx.insert(s.readings).values(
      chunk.map((r) => ({
        area: r.area,
        at: iso(r.at),
        tempC: String(r.tempC),
        rhPct: String(r.rhPct),
        source: 'sensor',
        recordedBy: admin,
      })),
    ),
  );

  // The oven's own readings (held at 150 °C through the last shift) and the UV lamp's radiometer
  // readings, the last one 9 days ago: its check is due (lampCheckDays, default 7).
  const oven = stationRows.find((r) => r.code === 'ST-OVN-1');
  const lamp = stationRows.find((r) => r.code === 'ST-UV-1');
  if (oven && lamp) {
    const ovenReadings = Array.from({ length: 17 }, (_, i) => ({
      stationId: oven.id,
      at: iso(now.minus({ minutes: 480 - i * 30 })),
      tempC: String(i === 0 ? 25 : 150 - (i % 3)),
      source: 'oven controller',
      recordedBy: admin,
    }));
    const lampReadings = [23, 16, 9].map((days, i) => ({
      stationId: lamp.id,
      at: iso(now.minus({ days })),
      irradianceMWcm2: String([104, 101, DEMO_LAMP_IRRADIANCE][i]),
      source: 'radiometer',
      recordedBy: admin,
    }));
    await tx.insert(s.readings).values([...ovenReadings, ...lampReadings]);
  }

  await tx.insert(s.settings).values([
    // The plant's name as pages show it (its time zone is TACKLOG_PLANT_ZONE, a server setting).
    { key: 'plant', value: { name: 'Halvard Bay Driver Works' }, updatedBy: admin },
    // The plant's long-run final-test failure rate: lots are judged against it.
    { key: 'baselineFailureRate', value: 0.015, updatedBy: admin },
    { key: 'expiringSoonDays', value: 14, updatedBy: admin },
    // Stock view: daily use over 28 days of finished runs, open batches are one day's build,
    // and orders should arrive 3 days before the run-out.
    { key: 'stockUseWindowDays', value: 28, updatedBy: admin },
    { key: 'stockPlanDays', value: 1, updatedBy: admin },
    { key: 'reorderSafetyDays', value: 3, updatedBy: admin },
  ]);
}
