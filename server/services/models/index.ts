export { getModel, listModels, loadSteps, findModelRow } from './read';
export { createModel, updateModel } from './write';
