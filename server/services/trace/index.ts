export { traceDriver } from './driver-trace';
export { traceLot } from './lot-trace';
export { lotContainmentCsv, toCsv, csvField } from './csv';
export { lotStats } from './lot-stats';
