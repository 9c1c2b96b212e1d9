import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Material } from '../../shared/schemas/materials';
import type { Supplier } from '../../shared/schemas/suppliers';

// Every fetcher fails unless a test says what it answers: an unexpected request fails the test.
const unexpected = (name: string) =>
  vi.fn((...args: unknown[]) => Promise.reject(new Error(`unexpected request: ${name}(${JSON.stringify(args)})`)));

vi.mock('@/api/materials', () => ({
  listMaterials: unexpected('listMaterials'),
  getMaterial: unexpected('getMaterial'),
  createMaterial: unexpected('createMaterial'),
  updateMaterial: unexpected('updateMaterial'),
  retireMaterial: unexpected('retireMaterial'),
  uploadSds: unexpected('uploadSds'),
  materialFefo: unexpected('materialFefo'),
}));
vi.mock('@/api/suppliers', () => ({
  listSuppliers: unexpected('listSuppliers'),
  createSupplier: unexpected('createSupplier'),
  updateSupplier: unexpected('updateSupplier'),
  retireSupplier: unexpected('retireSupplier'),
}));

const materialsApi = await import('@/api/materials');
const suppliersApi = await import('@/api/suppliers');
const { useCatalogueStore } = await import('@/stores/catalogue');

const T = '2026-03-01T08:00:00.000Z';

function material(over: Partial<Material>): Material {
  return {
    id: '00000000-0000-4000-8000-000000000001',
    code: 'ADH-AN-220',
    name: 'Anaerobic acrylic',
    kind: 'adhesive',
    unit: 'g',
    storageClass: 'ambient',
    shelfLifeDays: 365,
    openLifeHours: 720,
    thawedLifeHours: null,
    outOfStorageAllowanceHours: null,
    potLifeMinutes: null,
    partnerMaterialId: null,
    mixRatio: null,
    cure: null,
    requiresInspection: true,
    hazards: { signalWord: 'Warning', pictograms: ['GHS07'], statements: ['H317'] },
    gtin: '09501101530003',
    sdsAttachmentId: null,
    reorderPoint: null,
    orderQuantity: null,
    leadTimeDays: null,
    active: true,
    createdAt: T,
    updatedAt: T,
    ...over,
  };
}

function supplier(over: Partial<Supplier>): Supplier {
  return {
    id: '00000000-0000-4000-8000-0000000000a1',
    code: 'SUP-A',
    name: 'Alder Test Supplies',
    contactName: null,
    email: null,
    phone: null,
    address: null,
    notes: null,
    active: true,
    createdAt: T,
    updatedAt: T,
    ...over,
  };
}

const A = material({});
const B = material({ id: '00000000-0000-4000-8000-000000000002', code: 'ACT-220', gtin: null, kind: 'activator' });
const RETIRED = material({ id: '00000000-0000-4000-8000-000000000003', code: 'ADH-OLD', gtin: '09521234543213', active: false });

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

describe('catalogue store: materials', () => {
  it('loads the catalogue once for concurrent callers and keys it by id', async () => {
    vi.mocked(materialsApi.listMaterials).mockResolvedValueOnce([A, RETIRED, B]);
    const store = useCatalogueStore();
    await Promise.all([store.loadMaterials(), store.loadMaterials(), store.loadMaterials()]);
    expect(materialsApi.listMaterials).toHaveBeenCalledTimes(1);
    expect(Object.keys(store.materials).sort()).toEqual([A.id, B.id, RETIRED.id].sort());
    expect(store.materialList.map((m) => m.code)).toEqual(['ACT-220', 'ADH-AN-220', 'ADH-OLD']);
    expect(store.activeMaterials.map((m) => m.code)).toEqual(['ACT-220', 'ADH-AN-220']);
    await store.loadMaterials(); // loaded: no second request
    expect(materialsApi.listMaterials).toHaveBeenCalledTimes(1);
  });

  it('loads again when forced, and after a failed load', async () => {
    const store = useCatalogueStore();
    vi.mocked(materialsApi.listMaterials).mockRejectedValueOnce(new Error('server down'));
    await expect(store.loadMaterials()).rejects.toThrow('server down');
    expect(store.materialsLoaded).toBe(false);
    vi.mocked(materialsApi.listMaterials).mockResolvedValueOnce([A]).mockResolvedValueOnce([A, B]);
    await store.loadMaterials();
    await store.loadMaterials(true);
    expect(store.materialList).toHaveLength(2);
    expect(materialsApi.listMaterials).toHaveBeenCalledTimes(3);
  });

  it('keeps created, edited and retired materials by id', async () => {
    const store = useCatalogueStore();
    vi.mocked(materialsApi.createMaterial).mockResolvedValueOnce(A);
    await store.createMaterial({ code: A.code, name: A.name, kind: 'adhesive', unit: 'g' }, 'key-1');
    expect(materialsApi.createMaterial).toHaveBeenCalledWith({ code: A.code, name: A.name, kind: 'adhesive', unit: 'g' }, 'key-1');
    vi.mocked(materialsApi.retireMaterial).mockResolvedValueOnce({ ...A, active: false });
    await store.setMaterialActive(A.id, false);
    expect(materialsApi.retireMaterial).toHaveBeenCalledWith(A.id);
    expect(store.materials[A.id].active).toBe(false);
    expect(store.activeMaterials).toHaveLength(0);
    vi.mocked(materialsApi.updateMaterial).mockResolvedValueOnce({ ...A, active: true });
    await store.setMaterialActive(A.id, true);
    expect(materialsApi.updateMaterial).toHaveBeenCalledWith(A.id, { active: true });
    expect(store.activeMaterials).toHaveLength(1);
  });

  it('finds the active material of a scanned GTIN, padded to 14 digits (GS1 GTIN-13 in GTIN-14 form)', async () => {
    vi.mocked(materialsApi.listMaterials).mockResolvedValueOnce([A, B, RETIRED]);
    const store = useCatalogueStore();
    await store.loadMaterials();
    // GS1 General Specifications: a GTIN-13 is carried in AI (01) with a leading zero.
    expect(store.materialByGtin('9501101530003')?.id).toBe(A.id);
    expect(store.materialByGtin('09501101530003')?.id).toBe(A.id);
    expect(store.materialByGtin('09521234543213')).toBeUndefined(); // only a retired material has it
  });

  it('answers a known material from the store without a request', async () => {
    vi.mocked(materialsApi.listMaterials).mockResolvedValueOnce([A]);
    const store = useCatalogueStore();
    await store.loadMaterials();
    expect((await store.fetchMaterial(A.id)).code).toBe('ADH-AN-220');
    vi.mocked(materialsApi.getMaterial).mockResolvedValueOnce(B);
    expect((await store.fetchMaterial(B.id)).code).toBe('ACT-220');
    expect(materialsApi.getMaterial).toHaveBeenCalledTimes(1);
  });

  it('does not let callers change its state', async () => {
    vi.mocked(materialsApi.listMaterials).mockResolvedValueOnce([A]);
    const store = useCatalogueStore();
    await store.loadMaterials();
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    (store.materials[A.id] as { name: string }).name = 'changed';
    expect(store.materials[A.id].name).toBe('Anaerobic acrylic');
    warn.mockRestore();
  });
});

describe('catalogue store: suppliers', () => {
  it('loads suppliers once and sorts them by name', async () => {
    const s1 = supplier({});
    const s2 = supplier({ id: '00000000-0000-4000-8000-0000000000a2', code: 'SUP-B', name: 'Birch Test Wire', active: false });
    vi.mocked(suppliersApi.listSuppliers).mockResolvedValueOnce([s2, s1]);
    const store = useCatalogueStore();
    await Promise.all([store.loadSuppliers(), store.loadSuppliers()]);
    expect(suppliersApi.listSuppliers).toHaveBeenCalledTimes(1);
    expect(store.supplierList.map((s) => s.name)).toEqual(['Alder Test Supplies', 'Birch Test Wire']);
    expect(store.activeSuppliers.map((s) => s.code)).toEqual(['SUP-A']);
  });

  it('keeps a created and an edited supplier', async () => {
    const store = useCatalogueStore();
    const s1 = supplier({});
    vi.mocked(suppliersApi.createSupplier).mockResolvedValueOnce(s1);
    await store.createSupplier({ name: s1.name });
    vi.mocked(suppliersApi.updateSupplier).mockResolvedValueOnce({ ...s1, phone: '+00 1' });
    await store.updateSupplier(s1.id, { phone: '+00 1' });
    expect(store.suppliers[s1.id].phone).toBe('+00 1');
    vi.mocked(suppliersApi.retireSupplier).mockResolvedValueOnce({ ...s1, active: false });
    await store.setSupplierActive(s1.id, false);
    expect(suppliersApi.retireSupplier).toHaveBeenCalledWith(s1.id);
    expect(store.activeSuppliers).toHaveLength(0);
  });
});
