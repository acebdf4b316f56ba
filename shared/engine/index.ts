/** The simulation engine: pure TypeScript, no DOM, no Node APIs. */
export type { ModelSpec, SimulationPlan, WatchSpec } from './plan';
export type * from './result';
export { simulateChunk, simulate, allocateChunk, chunkBytes } from './simulate';
export { mergeChunks } from './merge';
export { evaluateProbe, wilsonInterval, quantileEstimate, valuesAt, Z95 } from './probes';
export { runStudy } from './study';
export { planLayout, type PlanLayout } from './layout';
export { meanSquareStability, amplification, stabilityReport } from './stability';
export { linearDriftStability } from './linear-stability';
export { eigenvalues } from './eigenvalues';
export { choleskyOfCorrelation } from './cholesky';
export { Fnv1a64 } from './digest';
export { ENGINE_VERSION } from './version';
export { fitSlope, type SlopeFit } from './regression';
export { streamSeed, Xoshiro128, normalFrom } from './random';
export { MAX_PATHS, MAX_STEPS } from './limits';
export { estimateWork, type WorkEstimate } from './work';
