import { readonly, ref } from 'vue';
import { defineStore } from 'pinia';
import type { Alert, ComplianceRunResult } from '@shared/schemas/alerts';
import * as alertsApi from '@/api/alerts';

/** How many live alerts one request asks for when counting the critical ones (the API's maximum). */
export const COUNT_PAGE_SIZE = 500;

/**
 * Alerts: the current page of the alerts table, the number of live critical alerts the user
 * can see, and the last compliance-watch result. One request in flight per page query (a newer
 * query cancels an older one) and one count at a time. Notifications come from the page.
 */
export const useAlertsStore = defineStore('alerts', () => {
  const page = ref<{ items: Alert[]; total: number; key: string } | null>(null);
  const liveCritical = ref<number | null>(null);
  const lastRun = ref<ComplianceRunResult | null>(null);

  let pageInFlight: { key: string; promise: Promise<void>; controller: AbortController } | null = null;
  let countInFlight: Promise<number> | null = null;
  /**
   * Alerts changed here (acknowledged, resolved), with a tick of when: a page that was asked for
   * before the change and arrives after it must not show the old state again.
   */
  let tick = 0;
  const changedHere = new Map<string, { alert: Alert; tick: number }>();
  const newestOf = (a: Alert, askedAt: number): Alert => {
    const mine = changedHere.get(a.id);
    return mine && mine.tick > askedAt ? mine.alert : a;
  };

  /** Loads one page of alerts; the same query in flight is shared, a different one cancels it. */
  function loadPage(query: alertsApi.AlertQuery): Promise<void> {
    const key = JSON.stringify(query);
    if (pageInFlight?.key === key) return pageInFlight.promise;
    pageInFlight?.controller.abort();
    const controller = new AbortController();
    const askedAt = ++tick;
    const promise = alertsApi
      .listAlerts(query, controller.signal)
      .then((result) => {
        page.value = { items: result.items.map((a) => newestOf(a, askedAt)), total: result.total, key };
      })
      .finally(() => {
        if (pageInFlight?.promise === promise) pageInFlight = null;
      });
    pageInFlight = { key, promise, controller };
    return promise;
  }

  /** Counts the live (open or acknowledged) critical alerts, reading every page of live alerts. */
  function loadLiveCriticalCount(): Promise<number> {
    if (!countInFlight) {
      countInFlight = (async () => {
        let critical = 0;
        let offset = 0;
        for (;;) {
          const result = await alertsApi.listAlerts({ state: 'live', limit: COUNT_PAGE_SIZE, offset });
          critical += result.items.filter((a) => a.severity === 'critical').length;
          offset += result.items.length;
          if (result.items.length === 0 || offset >= result.total) break;
        }
        liveCritical.value = critical;
        return critical;
      })().finally(() => {
        countInFlight = null;
      });
    }
    return countInFlight;
  }

  function putAlert(alert: Alert): Alert {
    changedHere.set(alert.id, { alert, tick: ++tick });
    if (page.value) page.value = { ...page.value, items: page.value.items.map((a) => (a.id === alert.id ? alert : a)) };
    return alert;
  }

  /** Acknowledges an alert and shows its new state in the current page. */
  async function acknowledge(id: string): Promise<Alert> {
    return putAlert(await alertsApi.acknowledgeAlert(id));
  }

  /** Resolves an alert with what was done, and shows its new state in the current page. */
  async function resolve(id: string, resolution: string): Promise<Alert> {
    return putAlert(await alertsApi.resolveAlert(id, { resolution }));
  }

  /** Runs the compliance watch now and keeps its result (reload the page and count after it). */
  async function runWatch(): Promise<ComplianceRunResult> {
    const result = await alertsApi.runComplianceWatch();
    lastRun.value = result;
    return result;
  }

  return {
    page: readonly(page),
    liveCritical: readonly(liveCritical),
    lastRun: readonly(lastRun),
    loadPage,
    loadLiveCriticalCount,
    acknowledge,
    resolve,
    runWatch,
  };
});
