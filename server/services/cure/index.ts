export { estimateCure } from './estimate';
export { batchCure, cureBoard } from './board';
export { cureOfRun, profilesForRuns, type RunCure } from './compute';
export { temperatureAt, historiesFor, AREA_READING_MAX_AGE_HOURS } from './readings';
