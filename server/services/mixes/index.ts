export { createMix } from './create';
export { getMix, toMix } from './read';
