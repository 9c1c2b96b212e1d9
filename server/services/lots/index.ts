export { listLots, sqlLotExpiries } from './list';
export { getLotDetail } from './detail';
export { changeLotStatus } from './status';
export { getLotHistory, getLotStatusChanges } from './history';
export { PLANT_ZONE, toLot, toContainer, toAttachment } from './present';
export { exportLotsCsv } from './export';
