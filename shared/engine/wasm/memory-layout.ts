/**
 * Where a wasm kernel instance keeps things in its memory. Fixed at the front: the ziggurat's
 * fast table as (wn, kn²) pairs, then a header of base offsets the kernel reads once per call,
 * the alive mask, where the hot loop left off, the finisher's draw, the fn tables, a group's state between calls and
 * the constant pool. Then, sized by the chunk: step lists and the outputs, with
 * the path count padded to a multiple of four (one SIMD group) and each output laid out as in
 * result.ts with that padded count.
 */
export const TABLE_OFFSET = 0;
export const HEADER_OFFSET = 2064;
export const HEADER_FIELDS = [
  'paddedPaths',
  'seed',
  'firstPath',
  'saveSteps',
  'probeSteps',
  'probeOrder',
  'saved',
  'probeValues',
  'runningMax',
  'runningMin',
  'firstPassage',
  'absorptionTime',
  'lossTime',
  'lossCause',
] as const;
export type HeaderField = (typeof HEADER_FIELDS)[number];
/** The header's words that are offsets of the chunk's own memory (the others are the run's values). */
export type ChunkField = Exclude<HeaderField, 'seed' | 'firstPath'>;
/** The mask of lanes still alive in the current group (two v128), kept in memory: it is read only off the hot loop. */
export const ALIVE_OFFSET = HEADER_OFFSET + 4 * 16;
/** Constants of the hot loop as f64x2 pairs, loaded from memory rather than rebuilt each step. */
export const POOL_OFFSET = 8192;
/** The ziggurat's layer mask (127 in every i32 lane). */
export const MASK_OFFSET = ALIVE_OFFSET + 32;
/** Where a call of the hot loop left off: the step n, the save and probe indices, the group's first path (four i32). */
export const STEP_OFFSET = MASK_OFFSET + 16;
/**
 * A draw left to the finisher (three i32): the draw j the hot loop resumes after (−1 when none),
 * the lanes in the base layer's tail (bits) and the byte address of the draw's two f64x2.
 */
export const FINISH_OFFSET = STEP_OFFSET + 16;
/** The first generator outputs of the draw left to the finisher (one i32x4). */
export const FIRST_OUTPUT_OFFSET = FINISH_OFFSET + 16;
/** A group's four seeds as they are made (four i32x4: word w of lane l at 16·w + 4·l). */
export const SEED_OFFSET = FIRST_OUTPUT_OFFSET + 16;
/** The ziggurat's fn table (128 f64). */
export const FN_OFFSET = FIRST_OUTPUT_OFFSET + 96;
/** A group's vectors between calls of the hot loop (generator state, states, records). */
export const STATE_OFFSET = FN_OFFSET + 1024;
export const STATE_VECTORS = Math.floor((POOL_OFFSET - STATE_OFFSET) / 16);
export const POOL_SIZE = 256;
/** The ziggurat's (fn[i], fn[i − 1]) pairs for the wedge test on four lanes (i ≥ 1). */
export const FN_PAIRS_OFFSET = POOL_OFFSET + 16 * POOL_SIZE;
/** The wedge test's cubics (wedge-table.ts), 64 bytes per layer. */
export const WEDGE_OFFSET = FN_PAIRS_OFFSET + 16 * 128;
const DATA_OFFSET = WEDGE_OFFSET + 64 * 128;

export interface MemoryLayout {
  bytes: number;
  offsets: Record<ChunkField, number>;
}

export interface LayoutCounts {
  paddedPaths: number;
  stateCount: number;
  saveCount: number;
  probeCount: number;
  watchCount: number;
}

export function memoryLayout(counts: LayoutCounts): MemoryLayout {
  const { paddedPaths: n, stateCount: d } = counts;
  let at = DATA_OFFSET;
  const take = (bytes: number): number => {
    const start = at;
    at = Math.ceil((at + bytes) / 16) * 16;
    return start;
  };
  const offsets: Record<ChunkField, number> = {
    paddedPaths: n,
    saveSteps: take(4 * (counts.saveCount + 1)),
    probeSteps: take(4 * (counts.probeCount + 1)),
    probeOrder: take(4 * (counts.probeCount + 1)),
    saved: take(8 * counts.saveCount * d * n),
    probeValues: take(8 * counts.probeCount * d * n),
    runningMax: take(8 * d * n),
    runningMin: take(8 * d * n),
    firstPassage: take(8 * counts.watchCount * n),
    absorptionTime: take(8 * d * n),
    lossTime: take(8 * n),
    lossCause: take(n),
  };
  return { bytes: at, offsets };
}
