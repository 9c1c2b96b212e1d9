export { recordTest, missingSteps } from './record-test';
export { testHistory } from './records';
