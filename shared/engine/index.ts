/** The simulation engine: pure TypeScript, no DOM, no Node APIs. */
export type { ModelSpec, SimulationPlan, WatchSpec } from './plan';
export type * from './result';
export { simulate } from './simulate';
export { mergeChunks } from './merge';
