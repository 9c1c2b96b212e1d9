import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { ALERT_KINDS, ALERT_SEVERITIES, ALERT_STATES } from '../../shared/constants';
import type { Alert } from '../../shared/schemas/alerts';

const unexpected = (name: string) =>
  vi.fn((...args: unknown[]) => Promise.reject(new Error(`unexpected request: ${name}(${JSON.stringify(args)})`)));

vi.mock('@/api/alerts', () => ({
  listAlerts: unexpected('listAlerts'),
  acknowledgeAlert: unexpected('acknowledgeAlert'),
  resolveAlert: unexpected('resolveAlert'),
  runComplianceWatch: unexpected('runComplianceWatch'),
}));

const alertsApi = await import('@/api/alerts');
const { useAlertsStore, COUNT_PAGE_SIZE } = await import('@/stores/alerts');
const { alertSubject, handledText, kindWords, severityLook, stateLook, whenText } = await import('@/components/alerts/alertLook');

const T = '2026-03-01T08:00:00.000Z';
let seq = 0;

function alert(over: Partial<Alert> = {}): Alert {
  seq += 1;
  return {
    id: `00000000-0000-4000-8000-${String(seq).padStart(12, '0')}`,
    kind: 'expiring_soon',
    severity: 'info',
    state: 'open',
    subjectType: 'lot',
    subjectId: '00000000-0000-4000-8000-00000000010a',
    message: 'Lot X expires soon.',
    audience: ['quality'],
    detail: null,
    data: null,
    raisedAt: T,
    acknowledgedAt: null,
    acknowledgedBy: null,
    acknowledgedByName: null,
    resolvedAt: null,
    resolvedBy: null,
    resolvedByName: null,
    resolution: null,
    ...over,
  };
}

beforeEach(() => {
  setActivePinia(createPinia());
  vi.stubGlobal('fetch', () => {
    throw new Error('unexpected network request: stores must call src/api only');
  });
});

afterEach(() => {
  vi.unstubAllGlobals();
  vi.resetAllMocks(); // back to "unexpected request" for every fetcher
});

describe('alerts store: the list page', () => {
  it('shares one request for the same query and keeps the page', async () => {
    const a = alert();
    vi.mocked(alertsApi.listAlerts).mockResolvedValueOnce({ items: [a], total: 31 });
    const store = useAlertsStore();
    const query = { limit: 25, offset: 0, state: 'live' as const, kind: null };
    await Promise.all([store.loadPage(query), store.loadPage({ ...query })]);
    expect(alertsApi.listAlerts).toHaveBeenCalledTimes(1);
    expect(vi.mocked(alertsApi.listAlerts).mock.calls[0][0]).toEqual(query);
    expect(store.page?.items.map((i) => i.id)).toEqual([a.id]);
    expect(store.page?.total).toBe(31);
  });

  it('cancels an older query when a newer one starts', async () => {
    const signals: AbortSignal[] = [];
    vi.mocked(alertsApi.listAlerts).mockImplementation((_q, signal) => {
      if (signal) signals.push(signal);
      return new Promise((resolve, reject) => {
        signal?.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError')));
        setTimeout(() => resolve({ items: [], total: 0 }), 5);
      });
    });
    const store = useAlertsStore();
    const first = store.loadPage({ limit: 25, offset: 0, state: 'live' });
    const second = store.loadPage({ limit: 25, offset: 0, state: 'resolved' });
    await expect(first).rejects.toThrow('aborted');
    await second;
    expect(signals[0].aborted).toBe(true);
    expect(signals[1].aborted).toBe(false);
    expect(store.page?.key).toContain('resolved');
  });
});

describe('alerts store: live critical count', () => {
  it('reads every page of live alerts and counts only the critical ones', async () => {
    const firstPage = Array.from({ length: COUNT_PAGE_SIZE }, (_, i) =>
      alert({ severity: i % 100 === 0 ? 'critical' : 'warning', state: i % 2 ? 'acknowledged' : 'open' }),
    );
    const secondPage = [alert({ severity: 'critical' }), alert({ severity: 'info' })];
    vi.mocked(alertsApi.listAlerts)
      .mockResolvedValueOnce({ items: firstPage, total: COUNT_PAGE_SIZE + 2 })
      .mockResolvedValueOnce({ items: secondPage, total: COUNT_PAGE_SIZE + 2 });
    const store = useAlertsStore();
    const expected = [...firstPage, ...secondPage].filter((a) => a.severity === 'critical').length;
    const [n, again] = await Promise.all([store.loadLiveCriticalCount(), store.loadLiveCriticalCount()]);
    expect(n).toBe(expected);
    expect(again).toBe(expected);
    expect(store.liveCritical).toBe(expected);
    expect(vi.mocked(alertsApi.listAlerts).mock.calls.map((c) => c[0])).toEqual([
      { state: 'live', limit: COUNT_PAGE_SIZE, offset: 0 },
      { state: 'live', limit: COUNT_PAGE_SIZE, offset: COUNT_PAGE_SIZE },
    ]);
  });

  it('keeps the last count when the request fails', async () => {
    vi.mocked(alertsApi.listAlerts).mockResolvedValueOnce({ items: [alert({ severity: 'critical' })], total: 1 });
    const store = useAlertsStore();
    await store.loadLiveCriticalCount();
    vi.mocked(alertsApi.listAlerts).mockRejectedValueOnce(new Error('offline'));
    await expect(store.loadLiveCriticalCount()).rejects.toThrow('offline');
    expect(store.liveCritical).toBe(1);
  });
});

describe('alerts store: acknowledge, resolve and the watch', () => {
  it('shows an acknowledged or resolved alert in the current page', async () => {
    const a = alert();
    const b = alert({ kind: 'below_reorder_point', subjectType: 'material' });
    vi.mocked(alertsApi.listAlerts).mockResolvedValueOnce({ items: [a, b], total: 2 });
    const store = useAlertsStore();
    await store.loadPage({ limit: 25, offset: 0 });

    vi.mocked(alertsApi.acknowledgeAlert).mockResolvedValueOnce({ ...a, state: 'acknowledged', acknowledgedAt: T, acknowledgedBy: 'u' });
    await store.acknowledge(a.id);
    expect(alertsApi.acknowledgeAlert).toHaveBeenCalledWith(a.id);
    expect(store.page?.items.map((i) => i.state)).toEqual(['acknowledged', 'open']);

    vi.mocked(alertsApi.resolveAlert).mockResolvedValueOnce({ ...b, state: 'resolved', resolution: 'Order placed.', resolvedAt: T });
    const resolved = await store.resolve(b.id, 'Order placed.');
    expect(alertsApi.resolveAlert).toHaveBeenCalledWith(b.id, { resolution: 'Order placed.' });
    expect(resolved.state).toBe('resolved');
    expect(store.page?.items.map((i) => i.state)).toEqual(['acknowledged', 'resolved']);
  });

  it('does not let a page asked for before an acknowledgement bring the old state back', async () => {
    const a = alert();
    const store = useAlertsStore();
    let arrive: (v: { items: Alert[]; total: number }) => void = () => undefined;
    vi.mocked(alertsApi.listAlerts).mockReturnValueOnce(
      new Promise((resolve) => {
        arrive = resolve;
      }),
    );
    const loading = store.loadPage({ limit: 25, offset: 0 });
    vi.mocked(alertsApi.acknowledgeAlert).mockResolvedValueOnce({ ...a, state: 'acknowledged', acknowledgedAt: T, acknowledgedBy: 'u' });
    await store.acknowledge(a.id);
    arrive({ items: [a], total: 1 }); // read by the server before the acknowledgement
    await loading;
    expect(store.page?.items.map((i) => i.state)).toEqual(['acknowledged']);

    // A page asked for after the change shows what the server says now (here: resolved by someone else).
    vi.mocked(alertsApi.listAlerts).mockResolvedValueOnce({ items: [{ ...a, state: 'resolved' }], total: 1 });
    await store.loadPage({ limit: 25, offset: 0, state: 'resolved' });
    expect(store.page?.items.map((i) => i.state)).toEqual(['resolved']);
  });

  it('leaves the page as it was when the server refuses', async () => {
    const a = alert();
    vi.mocked(alertsApi.listAlerts).mockResolvedValueOnce({ items: [a], total: 1 });
    const store = useAlertsStore();
    await store.loadPage({ limit: 25, offset: 0 });
    vi.mocked(alertsApi.resolveAlert).mockRejectedValueOnce(new Error('This alert is already resolved.'));
    await expect(store.resolve(a.id, 'Discarded the mix.')).rejects.toThrow('already resolved');
    expect(store.page?.items[0].state).toBe('open');
  });

  it('keeps the result of the last compliance watch', async () => {
    vi.mocked(alertsApi.runComplianceWatch).mockResolvedValueOnce({ raised: 7, resolved: 2, ran: true });
    const store = useAlertsStore();
    expect(store.lastRun).toBeNull();
    await store.runWatch();
    expect(store.lastRun).toEqual({ raised: 7, resolved: 2, ran: true });
  });

  it('fails on a request it did not expect', async () => {
    const store = useAlertsStore();
    await expect(store.acknowledge('00000000-0000-4000-8000-000000000999')).rejects.toThrow('unexpected request: acknowledgeAlert');
  });
});

describe('how alerts read', () => {
  it('names every alert kind in words, and unknown kinds readably', () => {
    for (const kind of ALERT_KINDS) expect(kindWords(kind)).not.toContain('_');
    expect(kindWords('pot_life_exceeded')).toBe('Pot life passed');
    expect(kindWords('humidity_high')).toBe('Humidity high');
  });

  it('shows every severity and state with a word and an icon, never colour alone', () => {
    for (const s of ALERT_SEVERITIES) expect(severityLook(s)).toMatchObject({ label: expect.any(String), icon: expect.any(String) });
    for (const s of ALERT_STATES) expect(stateLook(s).label).toMatch(/^[A-Z]/);
    expect(new Set(ALERT_SEVERITIES.map((s) => severityLook(s).icon)).size).toBe(ALERT_SEVERITIES.length);
  });

  it('links each subject to the page that shows it', () => {
    const lotId = '00000000-0000-4000-8000-00000000010a';
    expect(alertSubject({ subjectType: 'lot', subjectId: lotId, data: null }).links[0].to).toEqual({
      name: 'lots.detail',
      params: { id: lotId },
    });
    // A container is shown on its lot's page (the alert carries the lot id).
    const container = alertSubject({ subjectType: 'container', subjectId: 'c', data: { containerCode: 'TLC-1', lotId } });
    expect(container.label).toBe('Container TLC-1');
    expect(container.links[0].to).toEqual({ name: 'lots.detail', params: { id: lotId } });
    expect(alertSubject({ subjectType: 'material', subjectId: 'm1', data: null }).links.map((l) => l.to.name)).toEqual([
      'catalogue.materials.edit',
      'lots.list',
    ]);
    expect(alertSubject({ subjectType: 'step_run', subjectId: 's', data: { batchCode: 'B-7' } }).batchCode).toBe('B-7');
    expect(alertSubject({ subjectType: 'mix', subjectId: 'x', data: { mixCode: 'MX-3', station: 'Glue 2' } })).toEqual({
      label: 'Mix MX-3 at Glue 2',
      links: [],
    });
  });

  it('says when an alert was raised relative to now and in full in plant time', () => {
    const now = new Date('2026-03-01T11:00:00.000Z');
    expect(whenText('2026-03-01T08:00:00.000Z', 'Europe/Berlin', now)).toEqual({ relative: '3 h ago', absolute: '2026-03-01 09:00' });
    expect(whenText('2026-02-27T11:00:00.000Z', 'UTC', now).relative).toBe('2 d ago');
  });

  it('says who acknowledged and resolved an alert, and when, in plant time', () => {
    const a = alert({
      state: 'resolved',
      acknowledgedAt: '2026-03-01T08:05:00.000Z',
      acknowledgedBy: 'u1',
      acknowledgedByName: 'Dana Quill',
      resolvedAt: '2026-03-01T09:40:00.000Z',
      resolvedBy: 'u2',
      resolvedByName: 'Rik Tamsen',
    });
    expect(handledText(a, 'Europe/Berlin')).toEqual({
      acknowledged: 'Acknowledged by Dana Quill, 2026-03-01 09:05',
      resolved: 'Resolved by Rik Tamsen, 2026-03-01 10:40',
    });
    const cleared = alert({ state: 'resolved', resolvedAt: '2026-03-01T09:40:00.000Z', resolvedBy: null });
    expect(handledText(cleared, 'UTC')).toEqual({ acknowledged: null, resolved: 'Resolved by the compliance watch, 2026-03-01 09:40' });
  });
});
