import type { MixInput } from '@shared/schemas/mixes';
import * as stationsApi from '@/api/stations';
import * as stepsApi from '@/api/steps';
import * as mixesApi from '@/api/mixes';
import type { QueuedAction } from '@/composables/useOfflineQueue';

/** What each queued station action carries (persisted with the queue, so plain data only). */
export interface LoadPayload {
  stationId: string;
  batchId: string;
  containerCode?: string;
  mixCode?: string;
  retried?: boolean;
}
export interface StepPayload {
  stationId: string;
  batchId: string;
  stepId: string;
  stepName: string;
  /** Finish of a UV step: the exposure under the lamp, seconds. */
  exposureSeconds?: number;
}
export interface UnloadPayload {
  stationId: string;
  loadId: string;
  code: string;
}
export interface MixPayload extends MixInput {
  stationId: string;
  batchId: string | null;
}

/** Sends one queued station action to the API with its Idempotency-Key. */
export function sendStationAction(action: QueuedAction): Promise<unknown> {
  const key = action.key;
  switch (action.kind) {
    case 'load': {
      const p = action.payload as LoadPayload;
      const body = p.mixCode ? { batchId: p.batchId, mixCode: p.mixCode } : { batchId: p.batchId, containerCode: p.containerCode };
      return stationsApi.loadAtStation(p.stationId, body, key);
    }
    case 'start':
    case 'finish': {
      const p = action.payload as StepPayload;
      const call = action.kind === 'start' ? stepsApi.startStep : stepsApi.finishStep;
      const body =
        p.exposureSeconds !== undefined ? { stationId: p.stationId, exposureSeconds: p.exposureSeconds } : { stationId: p.stationId };
      return call(p.batchId, p.stepId, body, key);
    }
    case 'unload': {
      const p = action.payload as UnloadPayload;
      return stationsApi.unloadAtStation(p.stationId, { loadId: p.loadId }, key);
    }
    case 'mix': {
      const { stationId, resinCode, hardenerCode, resinQuantity, hardenerQuantity } = action.payload as MixPayload;
      return mixesApi.createMix(stationId, { resinCode, hardenerCode, resinQuantity, hardenerQuantity }, key);
    }
    default:
      return Promise.reject(new Error(`unknown station action "${action.kind}"`));
  }
}
