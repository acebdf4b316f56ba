import type { SimulationPlan } from '../../shared/engine/plan';
import type { ChunkResult, StudyOptions, StudyResult } from '../../shared/engine/result';
import type { ChunkCancel } from '../../shared/run/chunk-task';

/** Messages between the runner and its worker threads (structured clone; buffers transferred). */
export type ToWorker =
  | {
      type: 'chunk';
      id: number;
      plan: SimulationPlan;
      firstPath: number;
      pathCount: number;
      cancel: ChunkCancel | null;
    }
  | { type: 'study'; id: number; plan: SimulationPlan; options: StudyOptions };

export type FromWorker =
  | { type: 'progress'; id: number; pathsDone: number }
  | { type: 'chunk-done'; id: number; chunk: ChunkResult }
  | { type: 'study-done'; id: number; result: StudyResult }
  | { type: 'failed'; id: number; message: string };

/** A request before the thread wrapper numbers it (Omit distributed over the union). */
export type WorkerRequest = ToWorker extends infer M ? (M extends ToWorker ? Omit<M, 'id'> : never) : never;
