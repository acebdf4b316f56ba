import { simulateChunk } from '../engine/simulate';
import type { SimulationPlan } from '../engine/plan';
import type { ChunkResult } from '../engine/result';
import type { ChunkRange } from './chunks';
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

/** What a worker is handed once per run when it takes chunks itself (see ChunkPool, claim mode). */
export interface ClaimTask {
  ranges: ChunkRange[];
  /** Shared [index of the next unclaimed chunk]; every worker of the run takes chunks from it. */
  claim: Int32Array;
  /** Shared paths done per chunk, written as a chunk goes, read by the pool's progress timer. */
  progress: Int32Array;
  cancel: { flag: Int32Array; epoch: number };
}

/** The chunks one worker simulated in a claim task: `chunks[i]` is chunk number `indices[i]`. */
export interface ClaimedChunks<TChunk> {
  indices: number[];
  chunks: TChunk[];
}

/**
 * Takes chunks from the shared counter until none is left or the run is cancelled, and returns
 * them all at once: no message per chunk, so the worker never waits for the next chunk and the
 * pool's thread stays asleep while the run goes. The split and the engine are the same as chunk
 * by chunk, so the numbers are too.
 */
export function runClaimedChunks(plan: SimulationPlan, task: ClaimTask): ClaimedChunks<ChunkResult> {
  const { ranges, claim, progress, cancel } = task;
  const claimed: ClaimedChunks<ChunkResult> = { indices: [], chunks: [] };
  while (Atomics.load(cancel.flag, 0) === cancel.epoch) {
    const index = Atomics.add(claim, 0, 1);
    const range = ranges[index];
    if (range === undefined) break;
    const chunk = runChunkTask(plan, range.firstPath, range.pathCount, cancel, (pathsDone) =>
      Atomics.store(progress, index, pathsDone),
    );
    claimed.indices.push(index);
    claimed.chunks.push(chunk);
    if (chunk.cancelled) break;
  }
  return claimed;
}
