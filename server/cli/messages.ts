import type { SimulationPlan } from '../../shared/engine/plan';
import type { ChunkResult, StudyOptions, StudyResult } from '../../shared/engine/result';
import type { ChunkCancel, ClaimTask } from '../../shared/run/chunk-task';
import type { FitProblem, FitResult } from '../../shared/fit/problem';

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
  | { type: 'claim'; id: number; plan: SimulationPlan; task: ClaimTask }
  | { type: 'study'; id: number; plan: SimulationPlan; options: StudyOptions }
  | { type: 'fit'; id: number; problem: FitProblem };

export type FromWorker =
  | { type: 'progress'; id: number; pathsDone: number }
  | { type: 'chunk-done'; id: number; chunk: ChunkResult }
  | { type: 'claim-done'; id: number; indices: number[]; chunks: ChunkResult[] }
  | { type: 'study-done'; id: number; result: StudyResult }
  | { type: 'fit-done'; id: number; result: FitResult }
  | { type: 'failed'; id: number; message: string };

/** A request before the thread wrapper numbers it (Omit distributed over the union). */
export type WorkerRequest = ToWorker extends infer M ? (M extends ToWorker ? Omit<M, 'id'> : never) : never;
