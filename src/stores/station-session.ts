import { stationKindWords } from '@shared/words';
import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import type { BatchDetail } from '@shared/schemas/batches';
import type { MixInput, MixResult } from '@shared/schemas/mixes';
import type { LoadResult, StationLoad, UnloadResult } from '@shared/schemas/station-loads';
import type { Station } from '@shared/schemas/stations';
import type { StepRunResult } from '@shared/schemas/steps';
import * as stationsApi from '@/api/stations';
import * as batchesApi from '@/api/batches';
import * as deviationsApi from '@/api/deviations';
import * as readingsApi from '@/api/readings';
import { activeCureGate } from '@/components/station/startGate';
import { ApiError } from '@/api/http';
import { useOfflineQueue, type QueuedAction, type QueueOutcome } from '@/composables/useOfflineQueue';
import { alignWithServer } from '@/composables/useNow';
import { usePlantStore } from './plant';
import { formatTime } from '@shared/plant-time';
import { feedback, queuedFeedback, refusalFeedback, type StationFeedback } from './station-feedback';
import { cureGateBefore, interpretScan, stepAtStation } from './station-scan';
import { CURRENT_STATION_KEY, readStored, writeStored } from './station-storage';
import { sendStationAction, type LoadPayload, type MixPayload, type StepPayload, type UnloadPayload } from './station-actions';

export type { StationFeedback };

const KEYS = {
  station: CURRENT_STATION_KEY,
  stations: 'tacklog.station.stations',
  traveler: 'tacklog.station.traveler',
  queue: 'tacklog.station.queue',
};

/**
 * One assembler's session at one station: the station (remembered on this device), the build
 * batch, what is loaded, and every action, queued so that a lost network loses nothing.
 * No notifications or sounds here: the page shows `feedback`.
 */
export const useStationSessionStore = defineStore('station-session', () => {
  const plant = usePlantStore();
  /** Feedback names times in plant time: "07:25" today, "Thu 07:25" another day. */
  const timeOf = (iso: string) => formatTime(iso, plant.zone, Date.now() + clockOffsetMs.value);
  const stations = ref<Station[]>(readStored<Station[]>(KEYS.stations) ?? []);
  const station = ref<Station | null>(readStored<Station>(KEYS.station));
  const traveler = ref<BatchDetail | null>(readStored<BatchDetail>(KEYS.traveler));
  const loads = ref<StationLoad[]>([]);
  /** Server clock minus this device's clock, so countdowns match what the server enforces. */
  const clockOffsetMs = ref(0);
  const current = ref<StationFeedback | null>(null);
  const history = ref<StationFeedback[]>([]);
  /** Set when a start was refused with CURE_INCOMPLETE: the cure that is still running. */
  const cureBlock = ref<{ stepName: string; cureCompleteAt: string | null; handlingAt: string | null } | null>(null);

  /** Quality signed an early start (unused deviation) for the step here: Start may go on while curing. */
  const earlyStartSigned = ref(false);
  /** The UV lamp's latest radiometer reading at this station (read for a UV step only; null: none recorded). */
  const lamp = ref<{ irradianceMWcm2: number; at: string } | null>(null);

  const queue = useOfflineQueue({ storageKey: KEYS.queue, send: sendStationAction, onResult });
  const stepHere = computed(() => stepAtStation(traveler.value, station.value?.kind));

  function say(next: StationFeedback) {
    current.value = next;
    history.value = [next, ...history.value].slice(0, 12);
  }

  function setStation(next: Station | null) {
    station.value = next;
    writeStored(KEYS.station, next);
  }

  function setTraveler(next: BatchDetail | null) {
    traveler.value = next;
    writeStored(KEYS.traveler, next);
  }

  function onResult(action: QueuedAction, outcome: QueueOutcome) {
    if (!outcome.ok) onRefused(action, outcome.error);
    else onAccepted(action, outcome.value);
    if (queue.items.value.length === 0) void refresh();
  }

  function onRefused(action: QueuedAction, error: ApiError) {
    if (action.kind === 'load') {
      const p = action.payload as LoadPayload;
      // A code that is neither container nor mix by its look: try it as the other kind once.
      if (error.code === 'NOT_FOUND' && !p.retried) {
        const retry: LoadPayload = p.mixCode
          ? { stationId: p.stationId, batchId: p.batchId, containerCode: p.mixCode, retried: true }
          : { stationId: p.stationId, batchId: p.batchId, mixCode: p.containerCode, retried: true };
        queue.submit('load', retry, action.label);
        return;
      }
      if (error.code === 'NOT_FOUND') {
        const code = p.containerCode ?? p.mixCode ?? '';
        say(
          feedback(
            'refuse',
            'Refused: unknown code',
            `No container or mix has the code "${code}". Check the label and scan again.`,
            'NOT_FOUND',
          ),
        );
        return;
      }
    }
    if (action.kind === 'start' && error.code === 'CURE_INCOMPLETE') {
      const p = action.payload as StepPayload;
      const gate = cureGateBefore(traveler.value, traveler.value?.steps.find((s) => s.id === p.stepId) ?? null);
      cureBlock.value = {
        stepName: gate?.name ?? 'the previous step',
        cureCompleteAt: gate?.cureCompleteAt ?? null,
        handlingAt: gate?.handlingAt ?? null,
      };
    }
    say(refusalFeedback(error, action.label));
  }

  function onAccepted(action: QueuedAction, value: unknown) {
    if (action.kind === 'load') {
      const r = value as LoadResult;
      loads.value = [...loads.value.filter((l) => l.id !== r.id), r];
      const what = r.container ? `container ${r.container.code}` : `mix ${r.mix?.code ?? ''}`;
      const notes = [r.alreadyLoaded ? 'It was already loaded.' : '', r.opened ? 'Opened now: its after-opening life starts.' : ''];
      say(
        feedback(
          'accept',
          `Accepted: ${r.material.name}`,
          `${what}, lot ${r.lot.supplierLot}, for step "${r.step.name}". ${notes.join(' ')}`.trim(),
        ),
      );
    } else if (action.kind === 'start' || action.kind === 'finish') {
      const run = (value as StepRunResult).stepRun;
      const name = (action.payload as StepPayload).stepName;
      if (action.kind === 'start') cureBlock.value = null;
      const cure = action.kind === 'finish' && run.cureCompleteAt ? ` Curing until ${timeOf(run.cureCompleteAt)}.` : '';
      say(feedback('accept', action.kind === 'start' ? `Started: ${name}` : `Finished: ${name}`, `${action.label} recorded.${cure}`));
    } else if (action.kind === 'unload') {
      const gone = (value as UnloadResult).unloaded;
      loads.value = loads.value.filter((l) => !gone.includes(l.id));
      say(feedback('info', 'Unloaded', `${(action.payload as UnloadPayload).code} is no longer loaded here.`));
    } else if (action.kind === 'mix') {
      const { mix } = value as MixResult;
      say(feedback('accept', `Mixed: ${mix.code}`, `Pot life ends at ${timeOf(mix.potLifeEndsAt)}. Label the mix with its code.`));
      const p = action.payload as MixPayload;
      if (p.batchId) queue.submit('load', { stationId: p.stationId, batchId: p.batchId, mixCode: mix.code }, `Load mix ${mix.code}`);
    }
  }

  /** Submits an action; says "queued" when it cannot be sent now. */
  function act(kind: string, payload: unknown, label: string) {
    queue.submit(kind, payload, label);
    if (!queue.online.value) say(queuedFeedback(label));
  }

  /** The station list being fetched, so a scan that comes first can wait for it. */
  let stationsLoading: Promise<void> | null = null;

  function refreshStations(): Promise<void> {
    const loading = (async () => {
      const list = await stationsApi.listStations();
      stations.value = list;
      writeStored(KEYS.stations, list);
      if (station.value) setStation(list.find((s) => s.id === station.value?.id) ?? null);
    })();
    stationsLoading = loading;
    void loading
      .finally(() => {
        if (stationsLoading === loading) stationsLoading = null;
      })
      .catch(() => undefined);
    return loading;
  }

  /** The traveler and what is loaded here, from the server (kept as they were when it cannot be reached). */
  async function refresh(): Promise<void> {
    const st = station.value;
    const batch = traveler.value?.batch;
    try {
      if (batch) setTraveler(await batchesApi.getBatch(batch.id));
      await checkEarlyStart();
      await readLamp();
      if (st) {
        const loaded = await stationsApi.listLoaded(st.id, batch?.id);
        loads.value = loaded.items;
        clockOffsetMs.value = alignWithServer(loaded.now);
      }
    } catch (err) {
      if (!(err instanceof ApiError && err.status === 0)) throw err;
    }
  }

  /** The lamp's latest radiometer reading, when the step here cures by UV dose (the finish computes the same). */
  async function readLamp(): Promise<void> {
    const st = station.value;
    if (!st || stepHere.value?.cure?.method !== 'uv') {
      lamp.value = null;
      return;
    }
    const [latest] = await readingsApi.listReadings({ stationId: st.id, measure: 'irradiance', limit: 1 });
    lamp.value = latest && latest.irradianceMWcm2 !== null ? { irradianceMWcm2: latest.irradianceMWcm2, at: latest.at } : null;
  }

  /** Looks for an unused early-start deviation, only while the step here waits for a cure. */
  async function checkEarlyStart(): Promise<void> {
    const t = traveler.value;
    const step = stepHere.value;
    if (!t || !step || step.state !== 'pending' || !activeCureGate(t, step, Date.now() + clockOffsetMs.value)) {
      earlyStartSigned.value = false;
      return;
    }
    const signed = await deviationsApi.listDeviations({ batchId: t.batch.id, stepId: step.id });
    earlyStartSigned.value = signed.some((d) => d.kind === 'early_start' && d.usedAt === null);
  }

  function selectStation(next: Station) {
    setStation(next);
    cureBlock.value = null;
    const step = stepAtStation(traveler.value, next.kind);
    const hint = traveler.value
      ? step
        ? ` Next step here: "${step.name}".`
        : ' The batch has no step left at this station.'
      : ' Scan the build batch next.';
    say(feedback('info', `Station ${next.code}`, `${next.name} (${next.kind}, ${next.area}).${hint}`));
    void refresh().catch((err: unknown) => console.error('[station] refresh failed', err));
  }

  async function selectBatch(code: string): Promise<void> {
    let found: BatchDetail | null = null;
    try {
      const page = await batchesApi.listBatches({ q: code, limit: 5 });
      const match = page.items.find((b) => b.code.toUpperCase() === code.toUpperCase());
      if (match) found = await batchesApi.getBatch(match.id);
    } catch (err) {
      if (err instanceof ApiError && err.status === 0) {
        say(
          feedback(
            'refuse',
            'Offline: batch not looked up',
            `Batch ${code} cannot be looked up without the network. The current batch stays selected.`,
            'OFFLINE',
          ),
        );
        return;
      }
      throw err;
    }
    if (!found) {
      say(
        feedback(
          'refuse',
          'Not a build batch',
          `"${code}" is not a known build batch code. Scan the batch's traveler label.`,
          'UNKNOWN_BATCH',
        ),
      );
      return;
    }
    setTraveler(found);
    cureBlock.value = null;
    const step = stepAtStation(found, station.value?.kind);
    if (step)
      say(
        feedback(
          'info',
          `Batch ${found.batch.code}`,
          `${found.batch.modelName}, ${found.batch.quantity} units. Step here: "${step.name}". Scan each container or mix to load.`,
        ),
      );
    else
      say(
        feedback(
          'refuse',
          `Batch ${found.batch.code}: nothing to do here`,
          `The batch has no step left at a ${stationKindWords(station.value?.kind).toLowerCase()} station.`,
          'WRONG_STATION',
        ),
      );
    await refresh();
  }

  /** One scan (or typed code + Enter). */
  async function scan(code: string): Promise<void> {
    // A scanner is fast: the first scan may come before the station list has arrived.
    if (!station.value && stationsLoading) await stationsLoading.catch(() => undefined);
    const meaning = interpretScan(code, stations.value, traveler.value !== null);
    if (meaning.type === 'station') return selectStation(meaning.station);
    if (!station.value) {
      say(
        feedback(
          'refuse',
          'Scan the station first',
          `"${code}" is not a station code. Scan the code on the station (or pick the station).`,
          'NO_STATION',
        ),
      );
      return;
    }
    if (meaning.type === 'batch') return selectBatch(meaning.code);
    const batch = traveler.value!.batch;
    const payload: LoadPayload = {
      stationId: station.value.id,
      batchId: batch.id,
      [meaning.type === 'mix' ? 'mixCode' : 'containerCode']: meaning.code,
    };
    act('load', payload, `Load ${meaning.code}`);
  }

  function stepAction(kind: 'start' | 'finish', exposureSeconds?: number) {
    const step = stepHere.value;
    if (!station.value || !traveler.value || !step) return;
    const payload: StepPayload = { stationId: station.value.id, batchId: traveler.value.batch.id, stepId: step.id, stepName: step.name };
    if (kind === 'finish' && exposureSeconds !== undefined) payload.exposureSeconds = exposureSeconds;
    act(
      kind,
      payload,
      `${kind === 'start' ? 'Start' : 'Finish'} "${step.name}"${payload.exposureSeconds !== undefined ? ` (${payload.exposureSeconds} s under the lamp)` : ''}`,
    );
    // Shown at once, corrected by the server's answer (or refusal) when it comes.
    setTraveler({
      ...traveler.value,
      steps: traveler.value.steps.map((s) => (s.id === step.id ? { ...s, state: kind === 'start' ? 'running' : 'done' } : s)),
    });
  }

  function unload(load: StationLoad) {
    if (!station.value) return;
    const code = load.container?.code ?? load.mix?.code ?? load.id;
    act('unload', { stationId: station.value.id, loadId: load.id, code }, `Unload ${code}`);
  }

  function recordMix(input: MixInput) {
    if (!station.value) return;
    act(
      'mix',
      { ...input, stationId: station.value.id, batchId: traveler.value?.batch.id ?? null },
      `Mix ${input.resinCode} + ${input.hardenerCode}`,
    );
  }

  function leaveBatch() {
    setTraveler(null);
    loads.value = [];
    cureBlock.value = null;
    earlyStartSigned.value = false;
    lamp.value = null;
  }

  function forgetStation() {
    setStation(null);
    leaveBatch();
  }

  return {
    stations: computed(() => stations.value),
    station: computed(() => station.value),
    traveler: computed(() => traveler.value),
    loads: computed(() => loads.value),
    clockOffsetMs: computed(() => clockOffsetMs.value),
    feedback: computed(() => current.value),
    history: computed(() => history.value),
    cureBlock: computed(() => cureBlock.value),
    earlyStartSigned: computed(() => earlyStartSigned.value),
    lamp: computed(() => lamp.value),
    stepHere,
    /** Actions waiting to be sent (offline), oldest first. */
    queued: computed(() => queue.items.value),
    online: computed(() => queue.online.value),
    sending: computed(() => queue.sending.value),
    flushQueue: () => queue.flush(),
    setOnline: (value: boolean) => queue.setOnline(value),
    refreshStations,
    refresh,
    scan,
    selectStation,
    selectBatch,
    startStep: () => stepAction('start'),
    /** `exposureSeconds`: a UV step's time under the lamp (the server computes the dose from it). */
    finishStep: (exposureSeconds?: number) => stepAction('finish', exposureSeconds),
    unload,
    recordMix,
    leaveBatch,
    forgetStation,
  };
});
