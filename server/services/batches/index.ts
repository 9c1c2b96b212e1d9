export { createBatch, serialFor } from './create';
export { listBatches, findBatch, toBatch } from './read';
export { getBatchDetail } from './detail';
export { batchProgress, checkBatchOpen } from './progress';
export { exportBatchesCsv } from './export';
