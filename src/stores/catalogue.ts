import { computed, readonly, ref } from 'vue';
import { defineStore } from 'pinia';
import type { Material, MaterialInput, MaterialPatch } from '@shared/schemas/materials';
import type { Supplier, SupplierInput, SupplierPatch } from '@shared/schemas/suppliers';
import * as materialsApi from '@/api/materials';
import * as suppliersApi from '@/api/suppliers';

/**
 * The material catalogue and the suppliers, keyed by id. The catalogue is small, so each list
 * is loaded whole (in use and retired) once; concurrent callers share one request. Pages
 * filter and show notifications; the store only calls src/api.
 */
export const useCatalogueStore = defineStore('catalogue', () => {
  const materials = ref<Record<string, Material>>({});
  const suppliers = ref<Record<string, Supplier>>({});
  const materialsLoaded = ref(false);
  const suppliersLoaded = ref(false);
  let materialsInFlight: Promise<void> | null = null;
  let suppliersInFlight: Promise<void> | null = null;

  const byCode = <T extends { code: string }>(a: T, b: T) => a.code.localeCompare(b.code);
  const materialList = computed(() => Object.values(materials.value).sort(byCode));
  const activeMaterials = computed(() => materialList.value.filter((m) => m.active));
  const supplierList = computed(() => Object.values(suppliers.value).sort((a, b) => a.name.localeCompare(b.name)));
  const activeSuppliers = computed(() => supplierList.value.filter((s) => s.active));

  function putMaterial(material: Material): Material {
    materials.value = { ...materials.value, [material.id]: material };
    return material;
  }

  function putSupplier(supplier: Supplier): Supplier {
    suppliers.value = { ...suppliers.value, [supplier.id]: supplier };
    return supplier;
  }

  /** Loads every material once (again with `force`). */
  function loadMaterials(force = false): Promise<void> {
    if (materialsLoaded.value && !force) return Promise.resolve();
    if (!materialsInFlight) {
      materialsInFlight = materialsApi
        .listMaterials()
        .then((items) => {
          materials.value = Object.fromEntries(items.map((m) => [m.id, m]));
          materialsLoaded.value = true;
        })
        .finally(() => {
          materialsInFlight = null;
        });
    }
    return materialsInFlight;
  }

  /** Loads every supplier once (again with `force`). */
  function loadSuppliers(force = false): Promise<void> {
    if (suppliersLoaded.value && !force) return Promise.resolve();
    if (!suppliersInFlight) {
      suppliersInFlight = suppliersApi
        .listSuppliers()
        .then((items) => {
          suppliers.value = Object.fromEntries(items.map((s) => [s.id, s]));
          suppliersLoaded.value = true;
        })
        .finally(() => {
          suppliersInFlight = null;
        });
    }
    return suppliersInFlight;
  }

  async function createMaterial(input: MaterialInput, idempotencyKey?: string): Promise<Material> {
    return putMaterial(await materialsApi.createMaterial(input, idempotencyKey));
  }

  async function updateMaterial(id: string, patch: MaterialPatch): Promise<Material> {
    return putMaterial(await materialsApi.updateMaterial(id, patch));
  }

  /** Retires a material (or reinstates it: `active: true`). */
  async function setMaterialActive(id: string, active: boolean): Promise<Material> {
    if (active) return updateMaterial(id, { active: true });
    return putMaterial(await materialsApi.retireMaterial(id));
  }

  async function uploadSds(id: string, file: File): Promise<Material> {
    return putMaterial(await materialsApi.uploadSds(id, file));
  }

  /** One material, from the store when known, else from the server. */
  async function fetchMaterial(id: string): Promise<Material> {
    const known = materials.value[id];
    if (known) return known;
    return putMaterial(await materialsApi.getMaterial(id));
  }

  async function createSupplier(input: SupplierInput, idempotencyKey?: string): Promise<Supplier> {
    return putSupplier(await suppliersApi.createSupplier(input, idempotencyKey));
  }

  async function updateSupplier(id: string, patch: SupplierPatch): Promise<Supplier> {
    return putSupplier(await suppliersApi.updateSupplier(id, patch));
  }

  /** Retires a supplier (or reinstates it: `active: true`). */
  async function setSupplierActive(id: string, active: boolean): Promise<Supplier> {
    if (active) return updateSupplier(id, { active: true });
    return putSupplier(await suppliersApi.retireSupplier(id));
  }

  /** The active material whose GTIN matches (a supplier's GS1 barcode), if any. */
  function materialByGtin(gtin: string): Material | undefined {
    const padded = gtin.padStart(14, '0');
    return activeMaterials.value.find((m) => m.gtin === padded);
  }

  return {
    materials: readonly(materials),
    suppliers: readonly(suppliers),
    materialsLoaded: readonly(materialsLoaded),
    suppliersLoaded: readonly(suppliersLoaded),
    materialList,
    activeMaterials,
    supplierList,
    activeSuppliers,
    loadMaterials,
    loadSuppliers,
    fetchMaterial,
    createMaterial,
    updateMaterial,
    setMaterialActive,
    uploadSds,
    createSupplier,
    updateSupplier,
    setSupplierActive,
    materialByGtin,
  };
});
