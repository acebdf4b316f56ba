import { simulateChunk } from '../engine/simulate';
import type { SimulationPlan } from '../engine/plan';
import type { ChunkResult } from '../engine/result';
import { collectTransferables } from './transferables';

/**
 * The worker side of one chunk, shared by the browser worker and the command-line runner's
 * threads: runs the engine on a range of paths, stops when the pool's shared epoch moves on,
 * and passes progress on (the engine already calls back at most every ~20 ms of work).
 */
export interface ChunkCancel {
  /** The pool's shared epoch counter (SharedArrayBuffer), or null without shared memory. */
  flag: Int32Array | null;
  /** The epoch this chunk belongs to. */
  epoch: number;
}

export function runChunkTask(
  plan: SimulationPlan,
  firstPath: number,
  pathCount: number,
  cancel: ChunkCancel | null,
  onProgress?: (pathsDone: number) => void,
): ChunkResult {
  const flag = cancel?.flag ?? null;
  const epoch = cancel?.epoch ?? 0;
  return simulateChunk(plan, firstPath, pathCount, {
    onProgress,
    shouldStop: flag ? () => Atomics.load(flag, 0) !== epoch : undefined,
  });
}

/** The buffers of a chunk, to hand over without copying (postMessage transfer list). */
export function chunkTransferables(chunk: ChunkResult): ArrayBuffer[] {
  return collectTransferables(chunk);
}
