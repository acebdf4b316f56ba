/// <reference lib="webworker" />
import * as Comlink from 'comlink';
import type { SimulationPlan } from '@shared/engine/plan';
import type {
  ChunkResult,
  SimulationResult,
  StabilityReport,
  StudyOptions,
  StudyResult,
} from '@shared/engine/result';
import { stabilityReport } from '@shared/engine/stability';
import { mergeChunks as engineMergeChunks } from '@shared/engine/merge';
import { runStudy as engineRunStudy } from '@shared/engine/study';
import { fitModel } from '@shared/fit/fit-model';
import type { FitProblem, FitResult } from '@shared/fit/problem';
import type { RunProgress } from '@shared/run/progress';
import {
  chunkTransferables,
  runChunkTask,
  runClaimedChunks,
  type ChunkCancel,
  type ClaimedChunks,
  type ClaimTask,
} from '@shared/run/chunk-task';
import { collectTransferables } from '@shared/run/transferables';

/**
 * The simulation worker: the only place in the browser where the engine (and its generated code)
 * runs. The main thread talks to it through comlink; buffers are transferred, not copied. Merging
 * happens here too (quantiles at every saved time mean sorting all paths), so the page stays
 * responsive.
 */

/** A callback that arrived through Comlink.proxy holds a message channel open until released. */
function releaseCallback(callback: unknown): void {
  const remote = callback as Partial<Record<typeof Comlink.releaseProxy, () => void>> | undefined;
  remote?.[Comlink.releaseProxy]?.();
}

const api = {
  simulateChunk(
    plan: SimulationPlan,
    firstPath: number,
    pathCount: number,
    cancel: ChunkCancel | null,
    onProgress?: (pathsDone: number) => void,
  ): ChunkResult {
    try {
      const chunk = runChunkTask(plan, firstPath, pathCount, cancel, onProgress);
      return Comlink.transfer(chunk, chunkTransferables(chunk));
    } finally {
      releaseCallback(onProgress);
    }
  },

  /** Takes chunks from the run's shared counter until none is left (a cross-origin isolated page only). */
  simulateClaimed(plan: SimulationPlan, task: ClaimTask): ClaimedChunks<ChunkResult> {
    const claimed = runClaimedChunks(plan, task);
    return Comlink.transfer(claimed, collectTransferables(claimed.chunks));
  },

  mergeChunks(plan: SimulationPlan, chunks: ChunkResult[]): SimulationResult {
    const result = engineMergeChunks(plan, chunks);
    return Comlink.transfer(result, collectTransferables(result));
  },

  runStudy(plan: SimulationPlan, options: StudyOptions): StudyResult {
    return engineRunStudy(plan, options);
  },

  /** A parameter fit; the pool cancels it by terminating this worker, as it does a study. */
  runFit(problem: FitProblem, onProgress?: (progress: RunProgress) => void): FitResult {
    try {
      return fitModel(problem, { onProgress });
    } finally {
      releaseCallback(onProgress);
    }
  },

  /** The step's stability at the initial state, before any path is simulated. */
  stabilityBeforeRun(plan: SimulationPlan): StabilityReport | null {
    return stabilityReport(plan);
  },
};

export type SimulationWorkerApi = typeof api;

Comlink.expose(api);
