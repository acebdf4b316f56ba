/**
 * How a run's paths are cut into chunks. The split depends only on the run's size (paths and
 * steps), never on how many workers there are: the engine draws each path from its own random
 * stream and chunks are merged in path order, so any number of workers gives the same result,
 * and using the same split everywhere (browser pool, command-line runner, tests) keeps even the
 * order of floating-point sums identical.
 */
export interface ChunkRange {
  firstPath: number;
  pathCount: number;
}

/** At most this many paths per chunk, so progress moves smoothly and a cancel lands quickly. */
export const MAX_CHUNK_PATHS = 2000;
/** Aim for at least this many chunks, so the work spreads across workers and progress ticks. */
export const TARGET_CHUNKS = 32;
/** Path-steps per chunk at most (about a tenth of a second of work on one core). */
export const MAX_CHUNK_PATH_STEPS = 4_000_000;

export function chunkPathCount(paths: number, steps: number): number {
  if (!Number.isInteger(paths) || paths < 1)
    throw new RangeError(`paths must be a positive integer, got ${paths}`);
  if (!Number.isFinite(steps) || steps < 1) throw new RangeError(`steps must be at least 1, got ${steps}`);
  const bySpread = Math.ceil(paths / TARGET_CHUNKS);
  const byWork = Math.floor(MAX_CHUNK_PATH_STEPS / steps);
  return Math.max(1, Math.min(MAX_CHUNK_PATHS, bySpread, byWork));
}

/** Contiguous ranges covering 0..paths−1 in order. */
export function splitPaths(paths: number, steps: number): ChunkRange[] {
  const size = chunkPathCount(paths, steps);
  const ranges: ChunkRange[] = [];
  for (let firstPath = 0; firstPath < paths; firstPath += size) {
    ranges.push({ firstPath, pathCount: Math.min(size, paths - firstPath) });
  }
  return ranges;
}
