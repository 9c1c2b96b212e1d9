export { loadAtStation, stepAtStation } from './load';
export { unloadAtStation } from './unload';
export { listLoaded, describeLoads, materialSummary } from './describe';
export { containerByCode, containersByIds, mixByCode, mixesByIds } from './context';
export type { ContainerContext, MixContext } from './context';
export { checkContainerUsable, checkMixUsable, checkLotStatus, expiryOfContainer, expiryOfMix, PLANT_ZONE } from './usability';
