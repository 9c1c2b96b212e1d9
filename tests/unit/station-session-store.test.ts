import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { BatchDetail, TravelerStep } from '@shared/schemas/batches';
import type { LoadResult } from '@shared/schemas/station-loads';
import type { Station } from '@shared/schemas/stations';
import type { StepRun } from '@shared/schemas/steps';
import { ApiError } from '@/api/http';

// Every API call the store may make is mocked; any call a test did not set up fails the test.
const unexpected = (name: string) =>
  vi.fn((...args: unknown[]) => {
    throw new Error(`unexpected request: ${name}(${JSON.stringify(args)})`);
  });
vi.mock('@/api/stations', () => ({
  listStations: unexpected('listStations'),
  loadAtStation: unexpected('loadAtStation'),
  listLoaded: unexpected('listLoaded'),
  unloadAtStation: unexpected('unloadAtStation'),
}));
vi.mock('@/api/batches', () => ({ listBatches: unexpected('listBatches'), getBatch: unexpected('getBatch') }));
vi.mock('@/api/steps', () => ({ startStep: unexpected('startStep'), finishStep: unexpected('finishStep') }));
vi.mock('@/api/mixes', () => ({ createMix: unexpected('createMix') }));
vi.mock('@/api/readings', () => ({ listReadings: unexpected('listReadings') }));

const stationsApi = await import('@/api/stations');
const batchesApi = await import('@/api/batches');
const stepsApi = await import('@/api/steps');
const readingsApi = await import('@/api/readings');
const { useStationSessionStore } = await import('@/stores/station-session');

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const NOW = '2026-03-04T08:00:00.000Z';

const magStation: Station = {
  id: id(1),
  code: 'ST-MAG-1',
  name: 'Magnet bond robot 1',
  kind: 'magnet_assembly',
  area: 'Line A',
  cureEnvironment: 'area',
  active: true,
  createdAt: NOW,
};
const capStation: Station = {
  id: id(2),
  code: 'ST-CAP-1',
  name: 'Dust cap bench 1',
  kind: 'dust_cap',
  area: 'Line A',
  cureEnvironment: 'area',
  active: true,
  createdAt: NOW,
};

function step(n: number, name: string, kind: string, state: TravelerStep['state'], extra: Partial<TravelerStep> = {}): TravelerStep {
  return {
    id: id(100 + n),
    seq: n,
    name,
    stationKind: kind,
    waitForCure: false,
    materials: [],
    state,
    run: null,
    handlingAt: null,
    cureCompleteAt: null,
    cure: null,
    humidity: null,
    ...extra,
  };
}

function traveler(steps: TravelerStep[]): BatchDetail {
  return {
    batch: {
      id: id(50),
      code: 'HB12W-260304-01',
      modelId: id(60),
      modelCode: 'HB12W',
      modelName: '12 in woofer',
      modelRevision: 1,
      quantity: 4,
      status: 'open',
      createdBy: null,
      createdAt: NOW,
      completedAt: null,
    },
    steps,
    currentStepId: steps[0].id,
    drivers: [],
    reworkRuns: [],
  };
}

const magTraveler = () =>
  traveler([step(1, 'Magnet assembly', 'magnet_assembly', 'pending'), step(2, 'Moving parts', 'moving_parts', 'pending')]);

function loadResult(code: string): LoadResult {
  return {
    id: id(200),
    stationId: magStation.id,
    batchId: id(50),
    batchCode: 'HB12W-260304-01',
    loadedAt: NOW,
    loadedBy: null,
    container: { id: id(300), code, lotId: id(400), quantity: 50, remaining: 50, status: 'open', openedAt: NOW },
    mix: null,
    lot: { id: id(400), supplierLot: 'AN-2207', status: 'released' },
    material: {
      id: id(500),
      code: 'ADH-AN-220',
      name: 'Anaerobic bond 220',
      kind: 'adhesive',
      unit: 'g',
      hazards: { pictograms: ['GHS07'], statements: ['H317'] },
      sdsAttachmentId: null,
    },
    partMaterial: null,
    partLot: null,
    expiresAt: '2026-03-05T08:00:00.000Z',
    expiryCause: 'open_life',
    accepted: true,
    step: { id: id(101), seq: 1, name: 'Magnet assembly' },
    opened: true,
    alreadyLoaded: false,
  };
}

const flush = () => new Promise((resolve) => setTimeout(resolve, 0));

function memoryLocalStorage() {
  const data = new Map<string, string>();
  return {
    data,
    getItem: (k: string) => data.get(k) ?? null,
    setItem: (k: string, v: string) => void data.set(k, v),
    removeItem: (k: string) => void data.delete(k),
  };
}

let storage: ReturnType<typeof memoryLocalStorage>;

beforeEach(() => {
  vi.clearAllMocks();
  storage = memoryLocalStorage();
  vi.stubGlobal('localStorage', storage);
  vi.stubGlobal(
    'fetch',
    vi.fn(() => {
      throw new Error('unexpected fetch: the store must call src/api only');
    }),
  );
  setActivePinia(createPinia());
});
afterEach(() => vi.unstubAllGlobals());

/** A store with the station list loaded, the station scanned and the batch scanned. */
async function sessionAtMagnetStation(t = magTraveler()) {
  const store = useStationSessionStore();
  vi.mocked(stationsApi.listStations).mockResolvedValueOnce([magStation, capStation]);
  await store.refreshStations();
  vi.mocked(stationsApi.listLoaded).mockResolvedValue({ items: [], now: NOW });
  vi.mocked(batchesApi.getBatch).mockResolvedValue(t);
  await store.scan('st-mag-1');
  vi.mocked(batchesApi.listBatches).mockResolvedValueOnce({ items: [t.batch], total: 1 });
  await store.scan('HB12W-260304-01');
  await flush();
  return store;
}

describe('station session store', () => {
  it('refuses anything but a station code before the station is known, without a request', async () => {
    const store = useStationSessionStore();
    await store.scan('HB12W-260304-01');
    expect(store.feedback?.kind).toBe('refuse');
    expect(store.feedback?.code).toBe('NO_STATION');
  });

  it('waits for the station list when the first scan comes before it has arrived', async () => {
    const store = useStationSessionStore();
    vi.mocked(stationsApi.listLoaded).mockResolvedValue({ items: [], now: NOW });
    let arrive: (list: Station[]) => void = () => undefined;
    vi.mocked(stationsApi.listStations).mockReturnValueOnce(
      new Promise((resolve) => {
        arrive = resolve;
      }),
    );
    const listing = store.refreshStations();
    const scanning = store.scan('ST-MAG-1'); // a fast scanner, right after the page opened
    arrive([magStation, capStation]);
    await listing;
    await scanning;
    expect(store.station?.code).toBe('ST-MAG-1');
    expect(store.feedback?.code).not.toBe('NO_STATION');
  });

  it('takes the station from its scanned code and remembers it on this device', async () => {
    const store = await sessionAtMagnetStation();
    expect(store.station?.code).toBe('ST-MAG-1');
    expect(JSON.parse(storage.data.get('tacklog.station.current')!).id).toBe(magStation.id);
    expect(store.traveler?.batch.code).toBe('HB12W-260304-01');
    expect(store.stepHere?.name).toBe('Magnet assembly');
    expect(batchesApi.listBatches).toHaveBeenCalledWith({ q: 'HB12W-260304-01', limit: 5 });

    // A new session on the same device starts at the same station.
    setActivePinia(createPinia());
    expect(useStationSessionStore().station?.code).toBe('ST-MAG-1');
  });

  it('loads a scanned container for the batch with an Idempotency-Key and shows the accept', async () => {
    const store = await sessionAtMagnetStation();
    vi.mocked(stationsApi.loadAtStation).mockResolvedValueOnce(loadResult('TLC-4D7QX2MB9'));
    // After the answer the store reads the station's loads again: the server now lists it.
    vi.mocked(stationsApi.listLoaded).mockResolvedValueOnce({ items: [loadResult('TLC-4D7QX2MB9')], now: NOW });
    await store.scan('TLC-4D7QX2MB9');
    await flush();
    const [stationId, body, key] = vi.mocked(stationsApi.loadAtStation).mock.calls[0];
    expect(stationId).toBe(magStation.id);
    expect(body).toEqual({ batchId: id(50), containerCode: 'TLC-4D7QX2MB9' });
    expect(key).toMatch(/^[0-9a-f-]{36}$/);
    expect(store.feedback?.kind).toBe('accept');
    expect(store.feedback?.title).toContain('Anaerobic bond 220');
    expect(store.loads.map((l) => l.container?.code)).toEqual(['TLC-4D7QX2MB9']);
  });

  it('shows a refusal with the server reason text and code', async () => {
    const store = await sessionAtMagnetStation();
    const reason = 'Wrong material: container TLC-X is Cone paper 12, but step "Magnet assembly" uses Anaerobic bond 220.';
    vi.mocked(stationsApi.loadAtStation).mockRejectedValueOnce(new ApiError(409, 'WRONG_MATERIAL', reason));
    await store.scan('TLC-0000000X0');
    await flush();
    expect(store.feedback).toMatchObject({ kind: 'refuse', code: 'WRONG_MATERIAL', message: reason });
    expect(store.loads).toHaveLength(0);
  });

  it('queues a load while offline, says so, and sends it with the same key when the network is back', async () => {
    const store = await sessionAtMagnetStation();
    vi.mocked(stationsApi.loadAtStation).mockRejectedValueOnce(new ApiError(0, 'NETWORK', 'unreachable'));
    await store.scan('TLC-4D7QX2MB9');
    await flush();
    expect(store.online).toBe(false);
    expect(store.queued).toHaveLength(1);
    expect(JSON.parse(storage.data.get('tacklog.station.queue')!)).toHaveLength(1);

    // While offline a second scan is queued at once, behind the first.
    await store.scan('TLC-4D7QX2MB8');
    expect(store.feedback).toMatchObject({ kind: 'queued', code: 'OFFLINE' });
    expect(store.queued.map((a) => a.label)).toEqual(['Load TLC-4D7QX2MB9', 'Load TLC-4D7QX2MB8']);

    vi.mocked(stationsApi.loadAtStation)
      .mockResolvedValueOnce(loadResult('TLC-4D7QX2MB9'))
      .mockRejectedValueOnce(new ApiError(409, 'LOT_ON_HOLD', 'The lot is on hold for incoming inspection.'));
    store.setOnline(true);
    await store.flushQueue();
    await flush();
    const calls = vi.mocked(stationsApi.loadAtStation).mock.calls;
    expect(calls).toHaveLength(3);
    expect(calls[1][2]).toBe(calls[0][2]); // the resend carries the first key
    expect(calls[2][1]).toEqual({ batchId: id(50), containerCode: 'TLC-4D7QX2MB8' });
    expect(store.feedback).toMatchObject({ kind: 'refuse', code: 'LOT_ON_HOLD' });
    expect(store.history.map((f) => f.kind).slice(0, 2)).toEqual(['refuse', 'accept']);
    expect(storage.data.has('tacklog.station.queue')).toBe(false);
  });

  it('starts and finishes the step that runs at this station', async () => {
    const store = await sessionAtMagnetStation();
    const run: StepRun = {
      id: id(700),
      batchId: id(50),
      stepId: id(101),
      stationId: magStation.id,
      driverId: null,
      serial: null,
      kind: 'build',
      startedAt: NOW,
      finishedAt: null,
      startedBy: null,
      finishedBy: null,
      handlingAt: null,
      cureCompleteAt: null,
      shortCure: false,
      deviationId: null,
      unitsDone: null,
      uv: null,
      materials: [],
    };
    vi.mocked(stepsApi.startStep).mockResolvedValueOnce({ stepRun: run });
    store.startStep();
    expect(store.stepHere?.state).toBe('running');
    await flush();
    expect(stepsApi.startStep).toHaveBeenCalledWith(id(50), id(101), { stationId: magStation.id }, expect.any(String));
    expect(store.feedback).toMatchObject({ kind: 'accept', title: 'Started: Magnet assembly' });
  });

  it("a UV step: reads the lamp's latest radiometer reading and sends the exposure time with the finish", async () => {
    const uvStation: Station = { ...capStation, id: id(3), code: 'ST-UV-1', kind: 'uv_cure', cureEnvironment: 'own' };
    const cure = { method: 'uv' as const, uvDoseMJcm2: 3000, minTempC: null, schedule: [], rhMinPct: null, rhMaxPct: null };
    const t = traveler([step(4, 'Dust cap (UV)', 'uv_cure', 'running', { cure })]);
    const store = useStationSessionStore();
    vi.mocked(stationsApi.listStations).mockResolvedValueOnce([uvStation]);
    await store.refreshStations();
    vi.mocked(stationsApi.listLoaded).mockResolvedValue({ items: [], now: NOW });
    vi.mocked(batchesApi.getBatch).mockResolvedValue(t);
    const lampReading = {
      id: id(800),
      area: null,
      stationId: uvStation.id,
      at: '2026-03-01T08:00:00.000Z',
      tempC: null,
      rhPct: null,
      irradianceMWcm2: 97,
      source: 'radiometer',
      recordedBy: null,
      createdAt: NOW,
    };
    vi.mocked(readingsApi.listReadings).mockResolvedValue([lampReading]);
    await store.scan('ST-UV-1');
    vi.mocked(batchesApi.listBatches).mockResolvedValueOnce({ items: [t.batch], total: 1 });
    await store.scan('HB12W-260304-01');
    await flush();
    expect(readingsApi.listReadings).toHaveBeenCalledWith({ stationId: uvStation.id, measure: 'irradiance', limit: 1 });
    expect(store.lamp).toEqual({ irradianceMWcm2: 97, at: lampReading.at });

    vi.mocked(stepsApi.finishStep).mockRejectedValueOnce(
      new ApiError(409, 'UV_DOSE_LOW', 'The UV dose reached is 1,940 mJ/cm² (97 mW/cm² × 20 s); the adhesive needs 3,000 mJ/cm².'),
    );
    store.finishStep(20);
    await flush();
    expect(stepsApi.finishStep).toHaveBeenCalledWith(
      t.batch.id,
      id(104),
      { stationId: uvStation.id, exposureSeconds: 20 },
      expect.any(String),
    );
    expect(store.feedback).toMatchObject({ kind: 'refuse', code: 'UV_DOSE_LOW', title: 'Refused: UV dose too low' });
    expect(store.feedback?.message).toContain('1,940 mJ/cm²');
  });

  it('on CURE_INCOMPLETE shows when the previous step cure completes', async () => {
    const cureAt = '2026-03-04T22:30:00.000Z';
    const t = traveler([
      step(3, 'Lead termination', 'lead', 'done', { waitForCure: true, handlingAt: '2026-03-04T10:00:00.000Z', cureCompleteAt: cureAt }),
      step(4, 'Dust cap', 'dust_cap', 'pending'),
    ]);
    const store = useStationSessionStore();
    vi.mocked(stationsApi.listStations).mockResolvedValueOnce([magStation, capStation]);
    await store.refreshStations();
    vi.mocked(stationsApi.listLoaded).mockResolvedValue({ items: [], now: NOW });
    vi.mocked(batchesApi.getBatch).mockResolvedValue(t);
    await store.scan('ST-CAP-1');
    vi.mocked(batchesApi.listBatches).mockResolvedValueOnce({ items: [t.batch], total: 1 });
    await store.scan('HB12W-260304-01');
    vi.mocked(stepsApi.startStep).mockRejectedValueOnce(new ApiError(409, 'CURE_INCOMPLETE', 'The previous step is still curing.'));
    store.startStep();
    await flush();
    expect(store.feedback).toMatchObject({ kind: 'refuse', code: 'CURE_INCOMPLETE' });
    expect(store.cureBlock).toEqual({ stepName: 'Lead termination', cureCompleteAt: cureAt, handlingAt: '2026-03-04T10:00:00.000Z' });
  });

  it('retries an unknown container code as a mix code once, then says neither is known', async () => {
    const store = await sessionAtMagnetStation();
    vi.mocked(stationsApi.loadAtStation)
      .mockRejectedValueOnce(new ApiError(404, 'NOT_FOUND', 'No container has the code "XYZ-1".'))
      .mockRejectedValueOnce(new ApiError(404, 'NOT_FOUND', 'No mix has the code "XYZ-1".'));
    await store.scan('XYZ-1');
    await flush();
    await flush();
    const bodies = vi.mocked(stationsApi.loadAtStation).mock.calls.map((c) => c[1]);
    expect(bodies).toEqual([
      { batchId: id(50), containerCode: 'XYZ-1' },
      { batchId: id(50), mixCode: 'XYZ-1' },
    ]);
    expect(store.feedback).toMatchObject({ kind: 'refuse', code: 'NOT_FOUND' });
  });
});
