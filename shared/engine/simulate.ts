import type { SimulationPlan } from './plan';
import type { ChunkResult, SimulationHooks, SimulationResult } from './result';

/** Simulates paths firstPath .. firstPath + pathCount − 1 of the plan. */
export function simulateChunk(plan: SimulationPlan, firstPath: number, pathCount: number, hooks?: SimulationHooks): ChunkResult {
  void plan; void firstPath; void pathCount; void hooks;
  throw new Error('simulateChunk: not implemented yet');
}

/** The whole run in one chunk. */
export function simulate(plan: SimulationPlan, hooks?: SimulationHooks): SimulationResult {
  void plan; void hooks;
  throw new Error('simulate: not implemented yet');
}
