/** Running a whole sheet: cell order, chunked simulation on a pool of workers, plain outputs. */
export { splitPaths, chunkPathCount, MAX_CHUNK_PATHS, type ChunkRange } from './chunks';
export {
  ChunkPool,
  RunCancelledError,
  sharedMemoryAvailable,
  type ChunkJob,
  type ClaimJob,
  type ChunkWorker,
  type ChunkWorkerFactory,
  type ChunkPoolOptions,
  type RunProgress,
} from './chunk-pool';
export {
  runChunkTask,
  runClaimedChunks,
  chunkTransferables,
  type ChunkCancel,
  type ClaimTask,
  type ClaimedChunks,
} from './chunk-task';
export {
  runSheet,
  isNumericalCell,
  isCancellation,
  type SheetRunEnvironment,
  type RunSheetHooks,
  type NumericalCell,
} from './run-sheet';
export { inProcessEnvironment, poolEnvironment } from './environments';
export { scaleSheetPaths } from './scale';
export { collectTransferables } from './transferables';
export * from './outputs';
