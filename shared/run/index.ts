/** Running a whole sheet: one orchestrator, its steps, chunked simulation on a pool of workers, outputs. */
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
} from './chunk-pool';
export type { RunProgress } from './progress';
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
  runSheetToJson,
  currentDigests,
  isCancellation,
  describeRunError,
  type KeptOutput,
  type RunSheetOptions,
  type SheetRun,
} from './run-sheet';
export { planRunSteps, type RunStep } from './steps';
export { inProcessExecutor, poolExecutor } from './environments';
export { scaleSheetPaths } from './scale';
export { collectTransferables } from './transferables';
export * from './outputs';
