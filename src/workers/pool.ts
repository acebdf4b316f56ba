import * as Comlink from 'comlink';
import type { SimulationPlan } from '@shared/engine/plan';
import type {
  ChunkResult,
  SimulationResult,
  StabilityReport,
  StudyOptions,
  StudyResult,
} from '@shared/engine/result';
import { ChunkPool, RunCancelledError, type ChunkWorker, type RunProgress } from '@shared/run/chunk-pool';
import { collectTransferables } from '@shared/run/transferables';
import type { FitProblem, FitResult } from '@shared/fit/problem';
import type { SimulationWorkerApi } from './simulation.worker';
import { runStarted } from './activity';

export const SIMULATION_FINISHED_MARK = 'meander:simulation-finished';

/**
 * The browser's simulation pool: hardwareConcurrency − 1 Web Workers (at least one), chunks
 * taken from a shared counter (cross-origin isolated page) or else handed out as workers free up, merged in path order by a helper worker (the main thread only
 * schedules). The scheduling itself lives in the framework-free ChunkPool (shared/run), tested in
 * Node with fake workers and with worker_threads.
 */
export function defaultWorkerCount(): number {
  const cores = typeof navigator !== 'undefined' ? navigator.hardwareConcurrency : undefined;
  return Math.max(1, (cores ?? 2) - 1);
}

function createBrowserWorker(): { worker: Worker; api: Comlink.Remote<SimulationWorkerApi> } {
  const worker = new Worker(new URL('./simulation.worker.ts', import.meta.url), {
    type: 'module',
    name: 'meander-simulation',
  });
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
    // With shared memory (the page is cross-origin isolated), a worker takes its chunks from the
    // run's shared counter, as the command-line pool does: one message per worker and run.
    simulateClaimed: cancelFlag
      ? (job) =>
          api.simulateClaimed(job.plan, {
            ranges: job.ranges,
            claim: job.claim,
            progress: job.progress,
            cancel: { flag: job.cancelEpoch, epoch: job.epoch },
          })
      : undefined,
    terminate() {
      api[Comlink.releaseProxy]();
      worker.terminate();
    },
  };
}

export class SimulationPool {
  private readonly chunks: ChunkPool<SimulationPlan, ChunkResult>;
  /**
   * One more worker for merging and studies, created on first use. A cancel terminates it when
   * busy (a study has no cheaper way to stop) and the next request starts a fresh one.
   */
  private helper: { worker: Worker; api: Comlink.Remote<SimulationWorkerApi> } | null = null;
  private readonly helperJobs = new Set<(error: unknown) => void>();

  /** `sharedMemory: false` forces cancel by terminating workers (default: detect cross-origin isolation). */
  constructor(size = defaultWorkerCount(), options: { sharedMemory?: boolean } = {}) {
    this.chunks = new ChunkPool({ size, createWorker: chunkWorker, sharedMemory: options.sharedMemory });
  }

  /** Whether cancel works through shared memory (true) or by replacing workers (false). */
  get usesSharedMemory(): boolean {
    return this.chunks.usesSharedMemory;
  }

  get size(): number {
    return this.chunks.size;
  }

  async simulate(
    plan: SimulationPlan,
    onProgress?: (progress: RunProgress) => void,
  ): Promise<SimulationResult> {
    const ended = runStarted();
    let result: SimulationResult;
    try {
      const chunks = await this.chunks.run(plan, onProgress);
      result = await this.onHelper((api) =>
        api.mergeChunks(plan, Comlink.transfer(chunks, collectTransferables(chunks))),
      );
    } finally {
      ended();
    }
    // A User Timing mark, so performance tools (and the end-to-end test of responsiveness) can
    // tell the run itself from drawing its results.
    performance.mark(SIMULATION_FINISHED_MARK);
    return result;
  }

  async runStudy(plan: SimulationPlan, options: StudyOptions): Promise<StudyResult> {
    const ended = runStarted();
    try {
      return await this.onHelper((api) => api.runStudy(plan, options));
    } finally {
      ended();
    }
  }

  /** A parameter fit on the helper worker, with progress; cancel terminates the worker. */
  async runFit(problem: FitProblem, onProgress?: (progress: RunProgress) => void): Promise<FitResult> {
    const ended = runStarted();
    const callback = onProgress ? Comlink.proxy(onProgress) : undefined;
    try {
      return await this.onHelper((api) => api.runFit(problem, callback));
    } finally {
      ended();
    }
  }

  /** The step's stability at the plan's initial state (the drift is compiled, so in a worker). */
  async stabilityBeforeRun(plan: SimulationPlan): Promise<StabilityReport | null> {
    return this.onHelper((api) => api.stabilityBeforeRun(plan));
  }

  /** Stops every simulation and study in flight; their promises reject with RunCancelledError. */
  cancel(): void {
    this.chunks.cancel();
    if (this.helperJobs.size > 0 && this.helper) {
      this.helper.worker.terminate();
      this.helper = null;
      for (const reject of this.helperJobs) reject(new RunCancelledError());
      this.helperJobs.clear();
    }
  }

  dispose(): void {
    this.cancel();
    this.chunks.dispose();
    this.helper?.worker.terminate();
    this.helper = null;
  }

  private onHelper<T>(job: (api: Comlink.Remote<SimulationWorkerApi>) => Promise<T>): Promise<T> {
    this.helper ??= createBrowserWorker();
    const { api } = this.helper;
    return new Promise<T>((resolve, reject) => {
      this.helperJobs.add(reject);
      job(api)
        .then(resolve, reject)
        .finally(() => this.helperJobs.delete(reject));
    });
  }
}
