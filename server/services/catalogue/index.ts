export { listMaterials, getMaterial, findMaterial, toMaterial, type MaterialRow } from './materials-read';
export { createMaterial, updateMaterial, retireMaterial } from './materials-write';
export {
  listSuppliers,
  getSupplier,
  findSupplier,
  toSupplier,
  createSupplier,
  updateSupplier,
  retireSupplier,
  type SupplierRow,
} from './suppliers';
export { attachSds } from './sds';
