/** The simulation engine: pure TypeScript, no DOM, no Node APIs. */
export type { ModelSpec, SimulationPlan, WatchSpec } from './plan';
export type * from './result';
export { simulateChunk, simulate } from './simulate';
export { mergeChunks } from './merge';
export { evaluateProbe } from './probes';
export { runStudy } from './study';
export { streamSeed, Xoshiro128, normalFrom } from './random';
