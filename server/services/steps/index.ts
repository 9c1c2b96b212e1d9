export { startStep } from './start';
export { finishStep } from './finish';
export type { StepActionRequest } from './context';
export { describeRuns, describeRun } from './describe';
