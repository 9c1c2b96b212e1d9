import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import type { BatchCreated, BatchDetail, BatchInput, BatchPage } from '@shared/schemas/batches';
import * as batchesApi from '@/api/batches';
import type { BatchListOptions } from '@/api/batches';

/**
 * Build batches: the current list page and travelers by id. One in-flight request per
 * traveler is shared by everyone asking for it. No notifications here: pages show them.
 */
export const useBatchesStore = defineStore('batches', () => {
  const page = ref<BatchPage | null>(null);
  const query = ref<BatchListOptions>({ limit: 25, offset: 0 });
  const travelers = ref<Record<string, BatchDetail>>({});
  const loadingList = ref(false);
  const inFlight = new Map<string, Promise<BatchDetail>>();
  let listToken = 0;

  async function loadPage(next: BatchListOptions = query.value): Promise<BatchPage> {
    query.value = { ...next };
    const token = ++listToken;
    loadingList.value = true;
    try {
      const result = await batchesApi.listBatches(next);
      // A slower answer to an older query must not overwrite a newer one.
      if (token === listToken) page.value = result;
      return result;
    } finally {
      if (token === listToken) loadingList.value = false;
    }
  }

  function loadTraveler(id: string): Promise<BatchDetail> {
    let request = inFlight.get(id);
    if (!request) {
      request = batchesApi
        .getBatch(id)
        .then((detail) => {
          travelers.value = { ...travelers.value, [id]: detail };
          return detail;
        })
        .finally(() => inFlight.delete(id));
      inFlight.set(id, request);
    }
    return request;
  }

  async function create(input: BatchInput, idempotencyKey: string): Promise<BatchCreated> {
    const created = await batchesApi.createBatch(input, idempotencyKey);
    if (page.value && (query.value.offset ?? 0) === 0) {
      page.value = { items: [created.batch, ...page.value.items].slice(0, query.value.limit ?? 25), total: page.value.total + 1 };
    }
    return created;
  }

  return {
    page: computed(() => page.value),
    query: computed(() => query.value),
    loadingList: computed(() => loadingList.value),
    traveler: (id: string) => travelers.value[id] ?? null,
    loadPage,
    loadTraveler,
    create,
  };
});
