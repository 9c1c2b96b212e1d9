import { readonly, ref } from 'vue';
import { defineStore } from 'pinia';
import type { Container } from '@shared/schemas/containers';
import type { Attachment } from '@shared/schemas/attachments';
import type {
  HistoryEntry,
  Lot,
  LotDetail,
  LotListItem,
  LotStatusChange,
  ReceiveLotInput,
  ReceiveLotResult,
  StatusChangeEntry,
} from '@shared/schemas/lots';
import * as lotsApi from '@/api/lots';
import * as containersApi from '@/api/containers';
import type { ContainerAction } from '@/api/containers';

/**
 * Lots: the current page of the lots table, lot details and histories keyed by lot id, and
 * the last receipt. One request in flight per lot and per page query; a newer page query
 * replaces an older one. Notifications come from the pages, never from here.
 */
export const useLotsStore = defineStore('lots', () => {
  const page = ref<{ items: LotListItem[]; total: number; key: string } | null>(null);
  const details = ref<Record<string, LotDetail>>({});
  const histories = ref<Record<string, HistoryEntry[]>>({});
  const statusChanges = ref<Record<string, StatusChangeEntry[]>>({});
  const lastReceipt = ref<ReceiveLotResult | null>(null);

  const detailInFlight = new Map<string, Promise<LotDetail>>();
  const historyInFlight = new Map<string, Promise<HistoryEntry[]>>();
  const statusChangesInFlight = new Map<string, Promise<StatusChangeEntry[]>>();
  let pageInFlight: { key: string; promise: Promise<void>; controller: AbortController } | null = null;

  function putDetail(detail: LotDetail): LotDetail {
    details.value = { ...details.value, [detail.lot.id]: detail };
    return detail;
  }

  /** Loads one page of lots; the same query in flight is shared, a different one cancels it. */
  function loadPage(query: lotsApi.LotQuery): Promise<void> {
    const key = JSON.stringify(query);
    if (pageInFlight?.key === key) return pageInFlight.promise;
    pageInFlight?.controller.abort();
    const controller = new AbortController();
    const promise = lotsApi
      .listLots(query, controller.signal)
      .then((result) => {
        page.value = { items: result.items, total: result.total, key };
      })
      .finally(() => {
        if (pageInFlight?.promise === promise) pageInFlight = null;
      });
    pageInFlight = { key, promise, controller };
    return promise;
  }

  /** Loads a lot's detail (again with `force`); concurrent callers share one request. */
  function loadLot(id: string, force = false): Promise<LotDetail> {
    const known = details.value[id];
    if (known && !force) return Promise.resolve(known);
    let promise = detailInFlight.get(id);
    if (!promise) {
      promise = lotsApi
        .getLot(id)
        .then(putDetail)
        .finally(() => detailInFlight.delete(id));
      detailInFlight.set(id, promise);
    }
    return promise;
  }

  function loadHistory(id: string): Promise<HistoryEntry[]> {
    let promise = historyInFlight.get(id);
    if (!promise) {
      promise = lotsApi
        .lotHistory(id)
        .then((items) => {
          histories.value = { ...histories.value, [id]: items };
          return items;
        })
        .finally(() => historyInFlight.delete(id));
      historyInFlight.set(id, promise);
    }
    return promise;
  }

  /** The lot's status changes only (for people who may not read its full history). */
  function loadStatusChanges(id: string): Promise<StatusChangeEntry[]> {
    let promise = statusChangesInFlight.get(id);
    if (!promise) {
      promise = lotsApi
        .lotStatusChanges(id)
        .then((items) => {
          statusChanges.value = { ...statusChanges.value, [id]: items };
          return items;
        })
        .finally(() => statusChangesInFlight.delete(id));
      statusChangesInFlight.set(id, promise);
    }
    return promise;
  }

  async function receive(input: ReceiveLotInput, idempotencyKey: string): Promise<ReceiveLotResult> {
    const result = await lotsApi.receiveLot(input, idempotencyKey);
    lastReceipt.value = result;
    return result;
  }

  function clearReceipt(): void {
    lastReceipt.value = null;
  }

  /** Changes a lot's status (then call `refreshLot` for the recomputed expiry, FEFO and history). */
  async function changeStatus(id: string, change: LotStatusChange): Promise<Lot> {
    const lot = await lotsApi.changeLotStatus(id, change);
    const detail = details.value[id];
    if (detail) putDetail({ ...detail, lot });
    return lot;
  }

  /**
   * Reloads a lot's detail and its history after a change: the full history for people who may
   * read it (`lots.readHistory`), its status changes for everyone else.
   */
  async function refreshLot(id: string, fullHistory: boolean): Promise<void> {
    await Promise.all([loadLot(id, true), fullHistory ? loadHistory(id) : loadStatusChanges(id)]);
  }

  function putContainer(lotId: string, container: Container): void {
    const detail = details.value[lotId];
    if (!detail) return;
    putDetail({ ...detail, containers: detail.containers.map((c) => (c.id === container.id ? container : c)) });
  }

  /** Runs a container action and keeps the answer (then call `refreshLot`: the lot may follow). */
  async function actOnContainer(
    lotId: string,
    containerId: string,
    action: ContainerAction | { location: string } | { scrapReason: string },
  ): Promise<Container> {
    let container: Container;
    if (typeof action === 'string') container = await containersApi.containerAction(containerId, action);
    else if ('location' in action) container = await containersApi.moveContainer(containerId, { location: action.location });
    else container = await containersApi.scrapContainer(containerId, { reason: action.scrapReason });
    putContainer(lotId, container);
    return container;
  }

  /** Uploads the certificate of analysis and keeps the lot's new certificate fields. */
  async function uploadCertificate(lotId: string, file: File, expiresOn?: string): Promise<Attachment> {
    const result = await lotsApi.uploadCertificate(lotId, file, expiresOn);
    const detail = details.value[lotId];
    if (detail) putDetail({ ...detail, lot: result.lot, certificate: result.attachment });
    if (lastReceipt.value?.lot.id === lotId) lastReceipt.value = { ...lastReceipt.value, lot: result.lot };
    return result.attachment;
  }

  return {
    page: readonly(page),
    details: readonly(details),
    histories: readonly(histories),
    statusChanges: readonly(statusChanges),
    lastReceipt: readonly(lastReceipt),
    loadPage,
    loadLot,
    loadHistory,
    loadStatusChanges,
    receive,
    clearReceipt,
    changeStatus,
    refreshLot,
    actOnContainer,
    uploadCertificate,
  };
});
