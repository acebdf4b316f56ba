import * as Comlink from 'comlink';
import type { SimulationPlan } from '@shared/engine/plan';
import type { ChunkResult, SimulationResult, StudyOptions, StudyResult } from '@shared/engine/result';
import { mergeChunks } from '@shared/engine/merge';
import { ChunkPool, RunCancelledError, type ChunkWorker, type RunProgress } from '@shared/run/chunk-pool';
import type { SheetRunEnvironment } from '@shared/run/run-sheet';
import type { SimulationWorkerApi } from './simulation.worker';

/**
 * The browser's simulation pool: hardwareConcurrency − 1 Web Workers (at least one), chunks
 * handed out as workers free up, merged in path order on return. The scheduling itself lives in
 * the framework-free ChunkPool (shared/run), tested in Node with fake workers.
 */
export function defaultWorkerCount(): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : undefined;
  return Math.max(1, (cores ?? 2) - 1);
}

function createBrowserWorker(): { worker: Worker; api: Comlink.Remote<SimulationWorkerApi> } {
  const worker = new Worker(new URL('./simulation.worker.ts', import.meta.url), { type: 'module', name: 'meander-simulation' });
  return { worker, api: Comlink.wrap<SimulationWorkerApi>(worker) };
}

function chunkWorker(cancelFlag: Int32Array | null): ChunkWorker<SimulationPlan, ChunkResult> {
  const { worker, api } = createBrowserWorker();
  return {
    async simulate(job) {
      const cancel = cancelFlag ? { flag: cancelFlag, epoch: job.epoch } : null;
      // The worker releases this callback's channel when the chunk is done.
      const onProgress = Comlink.proxy((pathsDone: number) => job.onPathsDone(pathsDone));
      return await api.simulateChunk(job.plan, job.range.firstPath, job.range.pathCount, cancel, onProgress);
    },
    terminate() {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
}

export class SimulationPool {
  private readonly chunks: ChunkPool<SimulationPlan, ChunkResult>;
  /** Studies run on their own short-lived workers, so cancelling one is simply terminating it. */
  private readonly studyWorkers = new Set<{ worker: Worker; reject: (error: unknown) => void }>();

  constructor(size = defaultWorkerCount()) {
    this.chunks = new ChunkPool({ size, createWorker: chunkWorker });
  }

  get size(): number {
    return this.chunks.size;
  }

  async simulate(plan: SimulationPlan, onProgress?: (progress: RunProgress) => void): Promise<SimulationResult> {
    return mergeChunks(plan, await this.chunks.run(plan, onProgress));
  }

  runStudy(plan: SimulationPlan, options: StudyOptions): Promise<StudyResult> {
    const { worker, api } = createBrowserWorker();
    return new Promise<StudyResult>((resolve, reject) => {
      const entry = { worker, reject };
      this.studyWorkers.add(entry);
      api.runStudy(plan, options).then(resolve, reject).finally(() => {
        this.studyWorkers.delete(entry);
        worker.terminate();
      });
    });
  }

  /** Stops every simulation and study in flight; their promises reject with RunCancelledError. */
  cancel(): void {
    this.chunks.cancel();
    for (const entry of this.studyWorkers) {
      entry.worker.terminate();
      entry.reject(new RunCancelledError());
    }
    this.studyWorkers.clear();
  }

  dispose(): void {
    this.cancel();
    this.chunks.dispose();
  }

  /** The pool as a runSheet environment. */
  environment(): SheetRunEnvironment {
    return {
      runSimulation: (plan, onProgress) => this.simulate(plan, onProgress),
      runStudy: (plan, options) => this.runStudy(plan, options),
    };
  }
}
