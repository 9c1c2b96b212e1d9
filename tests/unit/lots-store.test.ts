import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Container } from '../../shared/schemas/containers';
import type { Lot, LotDetail, LotListItem } from '../../shared/schemas/lots';
import type { Material } from '../../shared/schemas/materials';
import type { Supplier } from '../../shared/schemas/suppliers';

const unexpected = (name: string) =>
  vi.fn((...args: unknown[]) => Promise.reject(new Error(`unexpected request: ${name}(${JSON.stringify(args)})`)));

vi.mock('@/api/lots', () => ({
  listLots: unexpected('listLots'),
  getLot: unexpected('getLot'),
  lotHistory: unexpected('lotHistory'),
  lotStatusChanges: unexpected('lotStatusChanges'),
  receiveLot: unexpected('receiveLot'),
  changeLotStatus: unexpected('changeLotStatus'),
  uploadCertificate: unexpected('uploadCertificate'),
}));
vi.mock('@/api/containers', () => ({
  containerAction: unexpected('containerAction'),
  moveContainer: unexpected('moveContainer'),
  scrapContainer: unexpected('scrapContainer'),
}));

const lotsApi = await import('@/api/lots');
const containersApi = await import('@/api/containers');
const { useLotsStore } = await import('@/stores/lots');

const T = '2026-03-01T08:00:00.000Z';
const LOT_ID = '00000000-0000-4000-8000-00000000010a';
const C1 = '00000000-0000-4000-8000-0000000001c1';
const C2 = '00000000-0000-4000-8000-0000000001c2';
const M = '00000000-0000-4000-8000-000000000001';
const S = '00000000-0000-4000-8000-0000000000a1';

const lot: Lot = {
  id: LOT_ID,
  materialId: M,
  supplierId: S,
  supplierLot: 'E2E-1',
  gtin: null,
  status: 'on_hold',
  receivedAt: T,
  manufacturedOn: null,
  expiresOn: '2027-12-31',
  certificateId: null,
  certificateExpiresOn: null,
  notes: null,
  receivedBy: null,
  statusReason: null,
  statusChangedAt: null,
  effectiveExpiry: '2027-12-31T23:00:00.000Z',
  expiryCause: 'supplier_expiry',
  createdAt: T,
};

function container(id: string, seq: number, over: Partial<Container> = {}): Container {
  return {
    id,
    code: `TLC-0000000${seq}X`,
    lotId: LOT_ID,
    seq,
    quantity: 250,
    remaining: 250,
    status: 'sealed',
    openedAt: null,
    thawedAt: null,
    location: 'Cabinet 1',
    outOfStorageMinutes: 0,
    outOfStorageSince: null,
    effectiveExpiry: lot.effectiveExpiry,
    expiryCause: 'supplier_expiry',
    createdAt: T,
    updatedAt: T,
    ...over,
  };
}

const detail: LotDetail = {
  lot,
  material: { id: M } as Material,
  supplier: { id: S } as Supplier,
  containers: [container(C1, 1), container(C2, 2)],
  effectiveExpiry: lot.effectiveExpiry,
  expiryCause: 'supplier_expiry',
  certificate: null,
  fefoNext: null,
};

const row = {
  ...lot,
  materialCode: 'ADH-AN-220',
  materialName: 'Acrylic',
  materialUnit: 'g',
  supplierName: 'Alder',
  containerCount: 2,
  activeContainerCount: 2,
  remaining: 500,
} satisfies LotListItem;

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

describe('lots store: the table page', () => {
  it('shares one request for the same query and keeps the page', async () => {
    vi.mocked(lotsApi.listLots).mockResolvedValueOnce({ items: [row], total: 41 });
    const store = useLotsStore();
    const query = { limit: 25, offset: 0, sort: 'receivedAt' as const, dir: 'desc' as const };
    await Promise.all([store.loadPage(query), store.loadPage({ ...query })]);
    expect(lotsApi.listLots).toHaveBeenCalledTimes(1);
    expect(store.page?.total).toBe(41);
    expect(store.page?.items[0].supplierLot).toBe('E2E-1');
  });

  it('cancels an older query when a newer one starts, and keeps the newer answer', async () => {
    const signals: AbortSignal[] = [];
    vi.mocked(lotsApi.listLots).mockImplementation((query, signal) => {
      if (signal) signals.push(signal);
      return new Promise((resolve, reject) => {
        signal?.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError')));
        if (query.offset === 25) resolve({ items: [], total: 41 });
      });
    });
    const store = useLotsStore();
    const first = store.loadPage({ limit: 25, offset: 0 });
    const second = store.loadPage({ limit: 25, offset: 25 });
    await expect(first).rejects.toThrow('aborted');
    await second;
    expect(signals[0].aborted).toBe(true);
    expect(signals[1].aborted).toBe(false);
    expect(store.page?.items).toEqual([]);
  });
});

describe('lots store: one lot', () => {
  it('loads a lot once for concurrent callers and again when forced', async () => {
    vi.mocked(lotsApi.getLot).mockResolvedValue(detail);
    const store = useLotsStore();
    await Promise.all([store.loadLot(LOT_ID), store.loadLot(LOT_ID)]);
    expect(lotsApi.getLot).toHaveBeenCalledTimes(1);
    await store.loadLot(LOT_ID);
    expect(lotsApi.getLot).toHaveBeenCalledTimes(1);
    await store.loadLot(LOT_ID, true);
    expect(lotsApi.getLot).toHaveBeenCalledTimes(2);
    expect(store.details[LOT_ID].containers).toHaveLength(2);
  });

  it('keeps the new status after a quality decision', async () => {
    vi.mocked(lotsApi.getLot).mockResolvedValueOnce(detail);
    vi.mocked(lotsApi.changeLotStatus).mockResolvedValueOnce({ ...lot, status: 'quarantined', statusReason: 'Supplier notice' });
    const store = useLotsStore();
    await store.loadLot(LOT_ID);
    await store.changeStatus(LOT_ID, { status: 'quarantined', reason: 'Supplier notice' });
    expect(lotsApi.changeLotStatus).toHaveBeenCalledWith(LOT_ID, { status: 'quarantined', reason: 'Supplier notice' });
    expect(store.details[LOT_ID].lot.status).toBe('quarantined');
  });

  it("puts a container action's answer in place, leaving the others", async () => {
    vi.mocked(lotsApi.getLot).mockResolvedValueOnce(detail);
    vi.mocked(containersApi.containerAction).mockResolvedValueOnce(container(C2, 2, { status: 'open', openedAt: T }));
    vi.mocked(containersApi.scrapContainer).mockResolvedValueOnce(container(C1, 1, { status: 'scrapped' }));
    const store = useLotsStore();
    await store.loadLot(LOT_ID);
    await store.actOnContainer(LOT_ID, C2, 'open');
    expect(containersApi.containerAction).toHaveBeenCalledWith(C2, 'open');
    await store.actOnContainer(LOT_ID, C1, { scrapReason: 'Dropped, cartridge cracked' });
    expect(containersApi.scrapContainer).toHaveBeenCalledWith(C1, { reason: 'Dropped, cartridge cracked' });
    expect(store.details[LOT_ID].containers.map((c) => c.status)).toEqual(['scrapped', 'open']);
  });

  it("refreshes a lot's detail and history together", async () => {
    vi.mocked(lotsApi.getLot).mockResolvedValue(detail);
    vi.mocked(lotsApi.lotHistory).mockResolvedValueOnce([
      {
        id: 1,
        at: T,
        actorId: null,
        actorName: 'Receiving clerk',
        action: 'lot.received',
        entityType: 'lot',
        entityId: LOT_ID,
        containerCode: null,
        before: null,
        after: { status: 'on_hold' },
        reason: null,
        names: {},
      },
    ]);
    const store = useLotsStore();
    await store.refreshLot(LOT_ID, true);
    expect(store.histories[LOT_ID]).toHaveLength(1);
    expect(lotsApi.getLot).toHaveBeenCalledTimes(1);
    expect(lotsApi.lotStatusChanges).not.toHaveBeenCalled();
  });

  it('refreshes only the status changes for someone who may not read the full history', async () => {
    vi.mocked(lotsApi.getLot).mockResolvedValue(detail);
    vi.mocked(lotsApi.lotStatusChanges).mockResolvedValueOnce([{ at: T, from: null, to: 'on_hold', reason: null }]);
    const store = useLotsStore();
    await store.refreshLot(LOT_ID, false);
    expect(store.statusChanges[LOT_ID]).toEqual([{ at: T, from: null, to: 'on_hold', reason: null }]);
    expect(store.histories[LOT_ID]).toBeUndefined();
    expect(lotsApi.lotHistory).not.toHaveBeenCalled();
  });

  it('keeps the last receipt and the certificate uploaded for it', async () => {
    vi.mocked(lotsApi.receiveLot).mockResolvedValueOnce({ lot, containers: detail.containers });
    const store = useLotsStore();
    const input = { materialId: M, supplierId: S, supplierLot: 'E2E-1', containers: 2, quantityPerContainer: 250 };
    await store.receive(input, 'key-7');
    expect(lotsApi.receiveLot).toHaveBeenCalledWith(input, 'key-7');
    expect(store.lastReceipt?.containers).toHaveLength(2);
    const att = {
      id: '00000000-0000-4000-8000-0000000000f1',
      kind: 'certificate' as const,
      filename: 'coa.pdf',
      mimeType: 'application/pdf',
      sizeBytes: 1000,
      sha256: 'a'.repeat(64),
      uploadedBy: null,
      uploadedAt: T,
      url: '/api/attachments/x',
    };
    vi.mocked(lotsApi.uploadCertificate).mockResolvedValueOnce({ attachment: att, lot: { ...lot, certificateId: att.id } });
    await store.uploadCertificate(LOT_ID, new File(['%PDF-1.4'], 'coa.pdf', { type: 'application/pdf' }));
    expect(store.lastReceipt?.lot.certificateId).toBe(att.id);
    store.clearReceipt();
    expect(store.lastReceipt).toBeNull();
  });
});
