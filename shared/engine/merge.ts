import type { SimulationPlan } from './plan';
import type { ChunkResult, SimulationResult } from './result';

/** Merges chunks given in path order into the run's result (deterministic). */
export function mergeChunks(plan: SimulationPlan, chunks: ChunkResult[]): SimulationResult {
  void plan; void chunks;
  throw new Error('mergeChunks: not implemented yet');
}
