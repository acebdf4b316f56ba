/// <reference lib="webworker" />
import * as Comlink from 'comlink';
import type { SimulationPlan } from '@shared/engine/plan';
import type { ChunkResult, StudyOptions, StudyResult } from '@shared/engine/result';
import { runStudy as engineRunStudy } from '@shared/engine/study';
import { chunkTransferables, runChunkTask, type ChunkCancel } from '@shared/run/chunk-task';

/**
 * The simulation worker: the only place in the browser where the engine (and its generated code)
 * runs. The main thread talks to it through comlink; chunk buffers are transferred, not copied.
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

  runStudy(plan: SimulationPlan, options: StudyOptions): StudyResult {
    return engineRunStudy(plan, options);
  },
};

export type SimulationWorkerApi = typeof api;

Comlink.expose(api);
