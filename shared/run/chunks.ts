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
/** Aim for about this many chunks: the smallest chunk is 1/(2 · TARGET_CHUNKS) of the paths. */
export const TARGET_CHUNKS = 32;
/** Path-steps per chunk at most (about a tenth of a second of work on one core). */
export const MAX_CHUNK_PATH_STEPS = 4_000_000;
/**
 * Chunks shrink toward the end of a run: each takes about 1/TAPER of the paths still left (between
 * the smallest and the largest size), so workers finish within a small chunk of each other while
 * the run as a whole has few chunks (each costs ~0.1 ms of set-up in the engine).
 */
const TAPER = 8;

function checkSize(paths: number, steps: number): void {
  if (!Number.isInteger(paths) || paths < 1)
    throw new RangeError(`paths must be a positive integer, got ${paths}`);
  if (!Number.isFinite(steps) || steps < 1) throw new RangeError(`steps must be at least 1, got ${steps}`);
}

/** The largest chunk of a run (the first ones): at most MAX_CHUNK_PATHS and MAX_CHUNK_PATH_STEPS. */
export function chunkPathCount(paths: number, steps: number): number {
  checkSize(paths, steps);
  const byWork = Math.floor(MAX_CHUNK_PATH_STEPS / steps);
  return Math.max(1, Math.min(MAX_CHUNK_PATHS, byWork, Math.ceil(paths / TAPER)));
}

/** The smallest chunk of a run (the last ones, but for the remainder): about paths / (2 · TARGET_CHUNKS). */
function smallestChunk(paths: number, largest: number): number {
  return Math.max(1, Math.min(largest, Math.ceil(paths / (2 * TARGET_CHUNKS))));
}

/** Contiguous ranges covering 0..paths−1 in order, largest first (10 000 paths: 24 chunks, 1 250 … 157). */
export function splitPaths(paths: number, steps: number): ChunkRange[] {
  checkSize(paths, steps);
  const ranges: ChunkRange[] = [];
  const largest = chunkPathCount(paths, steps);
  const smallest = smallestChunk(paths, largest);
  for (let firstPath = 0; firstPath < paths;) {
    const left = paths - firstPath;
    const size = Math.min(left, Math.max(smallest, Math.min(largest, Math.ceil(left / TAPER))));
    ranges.push({ firstPath, pathCount: size });
    firstPath += size;
  }
  return ranges;
}
