export { getModel, listModels, loadSteps, findModelRow } from './read';
export { createModel, createRevision, makeRevisionCurrent, updateModel } from './write';
