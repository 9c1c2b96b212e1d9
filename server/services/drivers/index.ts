export { getDriver, driverRuns } from './get-driver';
export { scrapDriver } from './scrap';
export { findDriverWithBatch, toDriver } from './lookup';
export { startRework, finishRework } from './rework';
