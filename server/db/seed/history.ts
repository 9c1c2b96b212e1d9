import { DateTime } from 'luxon';
import type { DemoMaterial, DemoStep } from './catalogue';

/**
 * In-memory simulation of a few weeks of the demo plant: lots received, containers opened and
 * used first-expiry-first-out, batches built step by step, drivers tested. The result is plain
 * rows that seed/plant.ts writes in bulk. Deterministic for a given `now` (seeded random).
 */

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface SimContainer {
  key: string;
  lotKey: string;
  materialCode: string;
  seq: number;
  quantity: number;
  remaining: number;
  openedAt: DateTime | null;
  thawedAt: DateTime | null;
  location: string;
}

export interface SimLot {
  key: string;
  materialCode: string;
  supplierCode: string;
  supplierLot: string;
  status: 'on_hold' | 'released' | 'quarantined' | 'rejected' | 'used_up';
  statusReason?: string;
  receivedAt: DateTime;
  manufacturedOn: string | null;
  expiresOn: string | null;
  containers: SimContainer[];
}

export interface SimMix {
  key: string;
  stationCode: string;
  resin: SimContainer;
  hardener: SimContainer;
  resinQuantity: number;
  hardenerQuantity: number;
  remaining: number;
  mixedAt: DateTime;
  potLifeEndsAt: DateTime;
  status: 'active' | 'used_up' | 'discarded';
}

export interface SimUse {
  container?: SimContainer;
  mix?: SimMix;
  quantity: number;
}

export interface SimStepRun {
  batchKey: string;
  stepIndex: number;
  stationCode: string;
  driverSerial?: string;
  kind: 'build' | 'rework';
  startedAt: DateTime;
  finishedAt: DateTime | null;
  shortCure: boolean;
  deviationReason?: string;
  uses: SimUse[];
  cureMinutes?: { handling: number; full: number };
  /** A UV step's finish: exposure under the lamp and its dose (the lamp's reading × time). */
  uv?: { exposureSeconds: number; irradianceMWcm2: number; doseMJcm2: number; neededMJcm2: number };
}

export interface SimDriver {
  serial: string;
  status: 'in_process' | 'passed' | 'failed' | 'reworked' | 'scrapped';
  tests: { result: 'pass' | 'fail'; defectCode?: string; at: DateTime }[];
}

export interface SimBatch {
  key: string;
  code: string;
  modelCode: string;
  quantity: number;
  createdAt: DateTime;
  /** When the last driver was tested (completed batches only). */
  completedAt?: DateTime;
  status: 'open' | 'in_process' | 'completed';
  drivers: SimDriver[];
}

export interface History {
  lots: SimLot[];
  mixes: SimMix[];
  batches: SimBatch[];
  stepRuns: SimStepRun[];
  /** Containers loaded at stations now (what the station screen shows). */
  loads: { stationCode: string; batchKey: string; container?: SimContainer; mix?: SimMix; at: DateTime }[];
  readings: { area: string; at: DateTime; tempC: number; rhPct: number }[];
}

const STATION_FOR_KIND: Record<string, string> = {
  magnet_assembly: 'ST-MAG-1',
  moving_parts: 'ST-MOV-1',
  lead_termination: 'ST-LEAD-1',
  dust_cap: 'ST-CAP-1',
  magnetize_test: 'ST-MZT-1',
  cure_oven: 'ST-OVN-1',
  uv_cure: 'ST-UV-1',
};

/** The UV lamp's last radiometer reading in the demo (seed/plant.ts writes it, 9 days before now). */
export const DEMO_LAMP_IRRADIANCE = 97;

function dateOnly(dt: DateTime): string {
  return dt.toISODate() as string;
}

/** Shop temperature model: warmer in the afternoon, cooler at night. */
function shopTemp(at: DateTime, rnd: () => number, base: number): number {
  const hour = at.hour + at.minute / 60;
  const swing = Math.sin(((hour - 9) / 24) * 2 * Math.PI) * 2.2;
  return Math.round((base + swing + (rnd() - 0.5) * 0.6) * 10) / 10;
}

export function simulateHistory(now: DateTime, materials: DemoMaterial[], models: { code: string; steps: DemoStep[] }[]): History {
  const rnd = mulberry32(20261201);
  const byCode = new Map(materials.map((m) => [m.code, m]));
  const lots: SimLot[] = [];
  const mixes: SimMix[] = [];
  const batches: SimBatch[] = [];
  const stepRuns: SimStepRun[] = [];
  const loads: History['loads'] = [];
  const readings: History['readings'] = [];
  let lotCounter = 0;

  function receive(
    materialCode: string,
    receivedAt: DateTime,
    containers: number,
    opts: Partial<Pick<SimLot, 'status' | 'statusReason' | 'expiresOn' | 'manufacturedOn' | 'supplierLot'>> = {},
  ): SimLot {
    const m = byCode.get(materialCode);
    if (!m) throw new Error(`demo: unknown material ${materialCode}`);
    lotCounter += 1;
    const key = `L${lotCounter}`;
    const manufactured = receivedAt.minus({ days: 12 + Math.floor(rnd() * 20) });
    const lot: SimLot = {
      key,
      materialCode,
      supplierCode: m.supplier,
      supplierLot:
        opts.supplierLot ?? `${materialCode.split('-')[0]}${receivedAt.toFormat('yyMM')}-${String(1000 + lotCounter * 37).slice(-4)}`,
      status: opts.status ?? 'released',
      statusReason: opts.statusReason,
      receivedAt,
      manufacturedOn: opts.manufacturedOn !== undefined ? opts.manufacturedOn : dateOnly(manufactured),
      expiresOn:
        opts.expiresOn !== undefined ? opts.expiresOn : m.shelfLifeDays ? dateOnly(manufactured.plus({ days: m.shelfLifeDays })) : null,
      containers: [],
    };
    const storage = m.storageClass === 'frozen' ? 'Freezer F1' : m.storageClass === 'refrigerated' ? 'Fridge R1' : 'Cabinet A';
    for (let i = 1; i <= containers; i++) {
      lot.containers.push({
        key: `${key}-${i}`,
        lotKey: key,
        materialCode,
        seq: i,
        quantity: m.perContainer,
        remaining: m.perContainer,
        openedAt: null,
        thawedAt: null,
        location: `${storage}, shelf ${1 + (i % 4)}`,
      });
    }
    lots.push(lot);
    return lot;
  }

  const start = now.minus({ days: 24 }).startOf('day');

  // Opening stock: two released lots of everything, received before the history starts.
  for (const m of materials) {
    const count = Math.max(4, Math.ceil((m.reorderPoint ?? m.perContainer * 4) / m.perContainer) + 2);
    receive(m.code, start.minus({ days: 40 }).set({ hour: 9 }), count);
    receive(m.code, start.minus({ days: 12 }).set({ hour: 10 }), count);
  }
  // The suspect epoxy resin lot: released, received at the start of the history; drivers built
  // with it fail more often (rub and buzz from a soft glue line).
  const suspect = receive('ADH-EP-410A', start.plus({ days: 6, hours: 9 }), 8, { supplierLot: 'EPA2611-7741' });

  /** Takes `quantity` of a material first-expiry-first-out from released lots; opens containers as needed. */
  function consume(materialCode: string, quantity: number, at: DateTime, prefer?: SimLot): SimUse[] {
    const uses: SimUse[] = [];
    let left = quantity;
    const candidates = lots
      .filter((l) => l.materialCode === materialCode && l.status === 'released' && l.receivedAt <= at)
      .sort((a, b) => {
        if (prefer) {
          if (a === prefer && b !== prefer) return -1;
          if (b === prefer && a !== prefer) return 1;
        }
        return (a.expiresOn ?? '9999').localeCompare(b.expiresOn ?? '9999') || a.receivedAt.toMillis() - b.receivedAt.toMillis();
      });
    for (const lot of candidates) {
      for (const c of lot.containers) {
        if (left <= 1e-9) break;
        if (c.remaining <= 1e-9) continue;
        const take = Math.min(c.remaining, left);
        c.remaining = Math.round((c.remaining - take) * 1000) / 1000;
        c.openedAt ??= at;
        left = Math.round((left - take) * 1000) / 1000;
        uses.push({ container: c, quantity: take });
      }
      if (left <= 1e-9) break;
    }
    if (left > 1e-6) {
      // Top up with a fresh released lot rather than fail: the demo plant never runs dry mid-history.
      const m = byCode.get(materialCode)!;
      receive(materialCode, at.minus({ days: 2 }), Math.ceil(left / m.perContainer) + 2);
      return uses.concat(consume(materialCode, left, at));
    }
    return uses;
  }

  // Readings every 30 minutes per area over the history and until now.
  for (let t = start.minus({ days: 1 }); t <= now; t = t.plus({ minutes: 30 })) {
    readings.push({ area: 'Line A', at: t, tempC: shopTemp(t, rnd, 22.5), rhPct: Math.round(45 + rnd() * 10) });
    readings.push({ area: 'Test bay', at: t, tempC: shopTemp(t, rnd, 21.5), rhPct: Math.round(42 + rnd() * 10) });
    if (t.minute === 0 && t.hour % 2 === 0) {
      readings.push({ area: 'Rework', at: t, tempC: shopTemp(t, rnd, 21), rhPct: Math.round(44 + rnd() * 8) });
    }
  }

  let batchCounter = 0;
  const runStep = (
    batch: SimBatch,
    model: { steps: DemoStep[] },
    stepIndex: number,
    startedAt: DateTime,
    minutes: number,
    opts: { finished?: boolean; preferResin?: SimLot; shortCure?: boolean; deviationReason?: string } = {},
  ): SimStepRun => {
    const step = model.steps[stepIndex];
    const stationCode = STATION_FOR_KIND[step.stationKind];
    const finishedAt = opts.finished === false ? null : startedAt.plus({ minutes });
    const uses: SimUse[] = [];
    const resinLine = step.materials.find(([c]) => byCode.get(c)?.partner && byCode.get(c)?.kind === 'adhesive');
    for (const [code, perUnit] of step.materials) {
      const m = byCode.get(code)!;
      if (m.partner && resinLine) continue; // two-part: consumed through a mix below
      uses.push(...consume(code, perUnit * batch.quantity, startedAt));
    }
    if (resinLine) {
      const [resinCode, resinPerUnit] = resinLine;
      const resinMat = byCode.get(resinCode)!;
      const hardenerLine = step.materials.find(([c]) => c === resinMat.partner)!;
      const rq = resinPerUnit * batch.quantity;
      const hq = hardenerLine[1] * batch.quantity;
      const resinUses = consume(resinCode, rq, startedAt, opts.preferResin);
      const hardUses = consume(hardenerLine[0], hq, startedAt);
      const mix: SimMix = {
        key: `M${mixes.length + 1}`,
        stationCode,
        resin: resinUses[0].container!,
        hardener: hardUses[0].container!,
        resinQuantity: rq,
        hardenerQuantity: hq,
        remaining: 0,
        mixedAt: startedAt.minus({ minutes: 3 }),
        potLifeEndsAt: startedAt.minus({ minutes: 3 }).plus({ minutes: resinMat.potLifeMinutes ?? 45 }),
        status: 'used_up',
      };
      mixes.push(mix);
      uses.push({ mix, quantity: rq + hq });
    }
    const cureMat = step.materials.map(([c]) => byCode.get(c)!).find((m) => m.cure && step.waitForCure);
    const run: SimStepRun = {
      batchKey: batch.key,
      stepIndex,
      stationCode,
      kind: 'build',
      startedAt,
      finishedAt,
      shortCure: opts.shortCure ?? false,
      deviationReason: opts.deviationReason,
      uses,
      cureMinutes: cureMat?.cure ? { handling: cureMat.cure.handlingMinutes, full: cureMat.cure.fullCureMinutes } : undefined,
    };
    stepRuns.push(run);
    return run;
  };

  const perModelDay = new Map<string, number>();
  const newBatch = (modelCode: string, quantity: number, createdAt: DateTime): SimBatch => {
    batchCounter += 1;
    // <model code>-<yyMMdd>-<seq of the day>, as the batch service numbers them.
    const prefix = `${modelCode}-${createdAt.toFormat('yyMMdd')}-`;
    const seq = (perModelDay.get(prefix) ?? 0) + 1;
    perModelDay.set(prefix, seq);
    const code = `${prefix}${String(seq).padStart(2, '0')}`;
    const batch: SimBatch = {
      key: `B${batchCounter}`,
      code,
      modelCode,
      quantity,
      createdAt,
      status: 'completed',
      drivers: Array.from({ length: quantity }, (_, i) => ({
        serial: `${code}-${String(i + 1).padStart(4, '0')}`,
        status: 'in_process' as const,
        tests: [],
      })),
    };
    batches.push(batch);
    return batch;
  };

  const modelByCode = new Map(models.map((m) => [m.code, m]));
  const woofer = modelByCode.get('HB12W')!;
  const fullRange = modelByCode.get('HB65F')!;

  // Completed history: working days (Mon–Fri) up to yesterday.
  for (let day = start; day < now.startOf('day'); day = day.plus({ days: 1 })) {
    if (day.weekday > 5) continue;
    const plan: [typeof woofer, string, number][] = [
      [woofer, 'HB12W', 120],
      [fullRange, 'HB65F', 150],
    ];
    plan.forEach(([model, code, qty], idx) => {
      const t0 = day.set({ hour: 6 + idx * 2, minute: 30 });
      const batch = newBatch(code, qty, t0.minus({ minutes: 20 }));
      const suspectWindow = model === woofer && day >= suspect.receivedAt.startOf('day') && day < suspect.receivedAt.plus({ days: 7 });
      runStep(batch, model, 0, t0, 50);
      runStep(batch, model, 1, t0.plus({ minutes: 60 }), 110, { preferResin: suspectWindow ? suspect : undefined });
      runStep(batch, model, 2, t0.plus({ minutes: 180 }), 60);
      runStep(batch, model, 3, t0.plus({ minutes: 250 }), 70);
      // Dust-cap adhesive cures overnight; magnetize and test the next morning. Nothing is seeded
      // after `now`: a batch whose test would not have finished yet waits for it (in process).
      const testStart = t0.plus({ days: 1 }).set({ hour: 7 + idx, minute: 0 });
      const early = model === fullRange && day.equals(start.plus({ days: 9 }));
      const testAt = early ? t0.plus({ minutes: 250 + 70 + 480 }) : testStart;
      if (testAt.plus({ minutes: 150 }) > now) {
        batch.status = 'in_process';
        return;
      }
      const runs = runStep(batch, model, 4, testAt, 150, {
        shortCure: early,
        deviationReason: early ? 'Customer sample order; quality agreed to test after 8 h at 24 °C shop temperature.' : undefined,
      });
      batch.completedAt = runs.finishedAt ?? undefined;
      const usedSuspect = runs && stepRuns.some((r) => r.batchKey === batch.key && r.uses.some((u) => u.mix?.resin.lotKey === suspect.key));
      for (const d of batch.drivers) {
        const failRate = usedSuspect ? 0.06 : 0.009;
        const at = (runs.finishedAt ?? testStart).minus({ minutes: Math.floor(rnd() * 120) });
        if (rnd() < failRate) {
          const code = usedSuspect && rnd() < 0.8 ? 'RUB' : ['OPEN', 'FS-HI', 'SENS-LO', 'LEAD', 'CAP'][Math.floor(rnd() * 5)];
          d.tests.push({ result: 'fail', defectCode: code, at });
          d.status = 'failed';
        } else {
          d.tests.push({ result: 'pass', at });
          d.status = 'passed';
        }
      }
    });
  }

  // Rework a few failed drivers at the rework bench with new cone, spider and adhesive; retest passes.
  // Only reworks whose retest (20 h after the rework) lies in the past.
  const failed = batches
    .flatMap((b) => b.drivers.map((d) => ({ b, d })))
    .filter(({ d }) => d.status === 'failed' && d.tests[d.tests.length - 1].at.plus({ hours: 3 + 4 + 20 + 1 }) <= now);
  failed.slice(0, Math.min(4, failed.length)).forEach(({ b, d }, i) => {
    const last = d.tests[d.tests.length - 1].at;
    const startedAt = last.plus({ hours: 3 + i });
    const model = modelByCode.get(b.modelCode)!;
    const uses = [...consume(b.modelCode === 'HB12W' ? 'CON-12P' : 'CON-6P', 1, startedAt), ...consume('ADH-CA-40', 0.5, startedAt)];
    stepRuns.push({
      batchKey: b.key,
      stepIndex: 1,
      stationCode: 'ST-RWK-1',
      driverSerial: d.serial,
      kind: 'rework',
      startedAt,
      finishedAt: startedAt.plus({ minutes: 40 }),
      shortCure: false,
      uses,
    });
    void model;
    d.status = 'passed';
    d.tests.push({ result: 'pass', at: startedAt.plus({ hours: 20 }) });
  });

  // Today: a woofer batch curing overnight after its dust cap, and a full-range batch mid-line.
  const today = now.startOf('day');
  const curing = newBatch('HB12W', 120, now.minus({ hours: 7 }));
  curing.status = 'in_process';
  runStep(curing, woofer, 0, now.minus({ hours: 6, minutes: 40 }), 50);
  runStep(curing, woofer, 1, now.minus({ hours: 5, minutes: 40 }), 110);
  runStep(curing, woofer, 2, now.minus({ hours: 3, minutes: 40 }), 60);
  runStep(curing, woofer, 3, now.minus({ hours: 2, minutes: 30 }), 70);
  // A smaller woofer batch a little behind it, its dust cap glued an hour ago.
  const curingLater = newBatch('HB12W', 8, now.minus({ hours: 5 }));
  curingLater.status = 'in_process';
  runStep(curingLater, woofer, 0, now.minus({ hours: 4, minutes: 40 }), 20);
  runStep(curingLater, woofer, 1, now.minus({ hours: 3, minutes: 50 }), 40);
  runStep(curingLater, woofer, 2, now.minus({ hours: 2, minutes: 20 }), 25);
  runStep(curingLater, woofer, 3, now.minus({ hours: 1, minutes: 20 }), 30);

  // The oven-and-UV woofer (HB12X), today only (the oven's and the lamp's own readings cover today):
  // one batch whose UV dust cap was cured 40 min ago (35 s × 97 mW/cm² = 3,395 mJ/cm², 3,000 needed)
  // and waits for its final test, one at the UV lamp next (its lead termination done), and one
  // whose motor bond has just come out of the oven and is still curing (15 min at 150 °C).
  const ovenUv = modelByCode.get('HB12X');
  if (ovenUv) {
    const uvDone = newBatch('HB12X', 24, now.minus({ hours: 6 }));
    uvDone.status = 'in_process';
    runStep(uvDone, ovenUv, 0, now.minus({ hours: 5, minutes: 45 }), 25);
    runStep(uvDone, ovenUv, 1, now.minus({ hours: 5 }), 60);
    runStep(uvDone, ovenUv, 2, now.minus({ hours: 3, minutes: 30 }), 30);
    const capRun = runStep(uvDone, ovenUv, 3, now.minus({ minutes: 50 }), 10);
    const needed = byCode.get('ADH-UV-30')?.cure?.uvDoseMJcm2 ?? 3000;
    capRun.uv = { exposureSeconds: 35, irradianceMWcm2: DEMO_LAMP_IRRADIANCE, doseMJcm2: 35 * DEMO_LAMP_IRRADIANCE, neededMJcm2: needed };

    const atLamp = newBatch('HB12X', 12, now.minus({ hours: 4 }));
    atLamp.status = 'in_process';
    runStep(atLamp, ovenUv, 0, now.minus({ hours: 3, minutes: 50 }), 25);
    runStep(atLamp, ovenUv, 1, now.minus({ hours: 3 }), 50);
    runStep(atLamp, ovenUv, 2, now.minus({ hours: 1, minutes: 50 }), 30);

    const inOven = newBatch('HB12X', 24, now.minus({ minutes: 50 }));
    inOven.status = 'in_process';
    runStep(inOven, ovenUv, 0, now.minus({ minutes: 30 }), 22);
  }

  const running = newBatch('HB65F', 150, now.minus({ hours: 2 }));
  running.status = 'in_process';
  runStep(running, fullRange, 0, now.minus({ hours: 1, minutes: 40 }), 50);
  const movingRun = runStep(running, fullRange, 1, now.minus({ minutes: 40 }), 0, { finished: false });
  for (const u of movingRun.uses)
    if (u.container) loads.push({ stationCode: 'ST-MOV-2', batchKey: running.key, container: u.container, at: movingRun.startedAt });

  // A third batch, just released to the line: epoxy mixed at the moving-parts bench.
  const next = newBatch('HB12W', 80, now.minus({ hours: 1 }));
  next.status = 'in_process';
  runStep(next, woofer, 0, now.minus({ minutes: 55 }), 45);
  const resinLots = lots.filter((l) => l.materialCode === 'ADH-EP-410A' && l.status === 'released' && l !== suspect);
  const hardLots = lots.filter((l) => l.materialCode === 'HRD-EP-410B' && l.status === 'released');
  const resinC = resinLots.flatMap((l) => l.containers).find((c) => c.remaining >= 300)!;
  const hardC = hardLots.flatMap((l) => l.containers).find((c) => c.remaining >= 300)!;
  const potLife = byCode.get('ADH-EP-410A')!.potLifeMinutes!;
  for (const [minutesAgo, status, station] of [
    [37, 'active', 'ST-MOV-1'],
    [75, 'active', 'ST-RWK-1'],
  ] as const) {
    const mixedAt = now.minus({ minutes: minutesAgo });
    resinC.remaining -= 120;
    hardC.remaining -= 120;
    resinC.openedAt ??= mixedAt;
    hardC.openedAt ??= mixedAt;
    const mix: SimMix = {
      key: `M${mixes.length + 1}`,
      stationCode: station,
      resin: resinC,
      hardener: hardC,
      resinQuantity: 120,
      hardenerQuantity: 120,
      remaining: 240,
      mixedAt,
      potLifeEndsAt: mixedAt.plus({ minutes: potLife }),
      status,
    };
    mixes.push(mix);
    loads.push({ stationCode: station, batchKey: next.key, mix, at: mixedAt.plus({ minutes: 2 }) });
  }

  // Receiving situations for quality and purchasing to act on.
  receive('ADH-AN-220', now.minus({ hours: 20 }), 6, { status: 'on_hold' });
  receive('WIR-AL-EW', now.minus({ hours: 5 }), 3, { status: 'on_hold' });
  receive('CON-12P', now.minus({ days: 9 }), 5, {
    status: 'quarantined',
    statusReason: 'Cones warped in transit; moisture damage suspected, awaiting supplier response.',
  });
  // A large cyanoacrylate lot bought near the end of its life: more than the line can use in the
  // 9 days left, so purchasing sees predicted waste and days of cover shorter than on hand ÷ use.
  const soon = receive('ADH-CA-40', now.minus({ days: 200 }), 20, { expiresOn: dateOnly(now.plus({ days: 9 })) });
  soon.containers[0].openedAt = now.minus({ days: 3 });
  receive('ACT-220', now.minus({ days: 300 }), 2, { expiresOn: dateOnly(now.minus({ days: 2 })) });
  const frozen = receive('ADH-FZ-7', now.minus({ days: 20 }), 6);
  frozen.containers[0].thawedAt = now.minus({ hours: 6 });
  frozen.containers[0].location = 'Line A, dust cap bench';
  frozen.containers[1].thawedAt = now.minus({ hours: 1 });
  frozen.containers[1].location = 'Line A, dust cap bench';

  // Purchasing has kept up: every material but one is stocked above its reorder point and for
  // its lead time plus four weeks of a full working day's use (so the stock page shows most
  // materials with enough cover, and the exceptions stand out).
  const dayUse = new Map<string, number>();
  for (const [model, qty] of [
    [woofer, 120],
    [fullRange, 150],
  ] as const) {
    for (const step of model.steps) for (const [code, perUnit] of step.materials) dayUse.set(code, (dayUse.get(code) ?? 0) + perUnit * qty);
  }
  for (const m of materials) {
    if (m.code === 'MAG-NEO-SH') continue;
    const onHand = lots
      .filter((l) => l.materialCode === m.code && l.status === 'released')
      .reduce((sum, l) => sum + l.containers.reduce((s, c) => s + Math.max(0, c.remaining), 0), 0);
    const want = Math.max((m.reorderPoint ?? 0) * 1.5, (dayUse.get(m.code) ?? 0) * ((m.leadTimeDays ?? 0) + 28));
    if (onHand < want) receive(m.code, now.minus({ days: 3, hours: 2 }), Math.ceil((want - onHand) / m.perContainer) + 1);
  }

  // The neodymium slugs run low: below their reorder point.
  lots
    .filter((x) => x.materialCode === 'MAG-NEO-SH' && x.status === 'released')
    .flatMap((l) => l.containers)
    .forEach((c, i) => {
      c.remaining = i === 0 ? 70 : i === 1 ? 45 : 0;
      if (c.remaining < c.quantity) c.openedAt ??= today.minus({ days: 3 });
    });
  for (const l of lots) if (l.status === 'released' && l.containers.every((c) => c.remaining <= 0)) l.status = 'used_up';
  return { lots, mixes, batches, stepRuns, loads, readings };
}
