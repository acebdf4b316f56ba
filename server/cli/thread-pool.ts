import type { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import type { SimulationPlan } from '../../shared/engine/plan';
import type { ChunkResult, StudyOptions, StudyResult } from '../../shared/engine/result';
import { ChunkPool, type ChunkWorker } from '../../shared/run/chunk-pool';
import type { FitProblem, FitResult } from '../../shared/fit/problem';
import type { RunExecutor } from '../../shared/cells/kind';
import { poolExecutor } from '../../shared/run/environments';
import type { ClaimedChunks, ClaimTask } from '../../shared/run/chunk-task';
import type { FromWorker, ToWorker, WorkerRequest } from './messages';
import { startTypeScriptWorker } from './ts-worker';
import type { KernelChoice } from '../../shared/engine/wasm/kernel-choice';

/**
 * worker_threads for the headless runner and the benchmark, behind the same ChunkPool as the
 * browser's Web Workers. The worker file is TypeScript, so each thread registers tsx first.
 */
const workerUrl = new URL('./worker.ts', import.meta.url);

export function defaultThreadCount(): number {
  return Math.max(1, availableParallelism());
}

interface Pending {
  resolve: (message: FromWorker) => void;
  reject: (error: Error) => void;
  onProgress?: (pathsDone: number) => void;
}

/** What every thread of a pool is started with. */
export interface ThreadOptions {
  /** The simulation kernel (kernel-choice.ts); default auto. */
  kernel?: KernelChoice;
}

/** What a thread receives as its workerData (worker.ts reads it). */
export interface ThreadData {
  kernel: KernelChoice;
}

/** One thread with a tiny request/answer protocol on top of postMessage. */
export class SimulationThread {
  private readonly worker: Worker;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;

  constructor(options: ThreadOptions = {}) {
    this.worker = startTypeScriptWorker(workerUrl, { workerData: { kernel: options.kernel ?? 'auto' } });
    this.worker.unref();
    this.worker.on('message', (message: FromWorker) => {
      const entry = this.pending.get(message.id);
      if (!entry) return;
      if (message.type === 'progress') {
        entry.onProgress?.(message.pathsDone);
        return;
      }
      this.pending.delete(message.id);
      if (message.type === 'failed') entry.reject(new Error(message.message));
      else entry.resolve(message);
    });
    this.worker.on('error', (error) => this.failAll(error));
    this.worker.on('exit', (code) =>
      this.failAll(new Error(`a simulation thread stopped (exit code ${code})`)),
    );
  }

  private failAll(error: Error): void {
    for (const entry of this.pending.values()) entry.reject(error);
    this.pending.clear();
  }

  private request(message: WorkerRequest, onProgress?: (pathsDone: number) => void): Promise<FromWorker> {
    const id = this.nextId++;
    return new Promise<FromWorker>((resolve, reject) => {
      this.pending.set(id, { resolve, reject, onProgress });
      this.worker.ref();
      this.worker.postMessage({ ...message, id } as ToWorker);
    }).finally(() => {
      if (this.pending.size === 0) this.worker.unref();
    });
  }

  async simulateChunk(
    plan: SimulationPlan,
    firstPath: number,
    pathCount: number,
    cancel: { flag: Int32Array; epoch: number } | null,
    onProgress?: (pathsDone: number) => void,
  ): Promise<ChunkResult> {
    const answer = await this.request({ type: 'chunk', plan, firstPath, pathCount, cancel }, onProgress);
    if (answer.type !== 'chunk-done') throw new Error(`unexpected answer "${answer.type}" to a chunk`);
    return answer.chunk;
  }

  /** Simulates chunks taken from the shared counter until none is left (ChunkPool's claim mode). */
  async simulateClaimed(plan: SimulationPlan, task: ClaimTask): Promise<ClaimedChunks<ChunkResult>> {
    const answer = await this.request({ type: 'claim', plan, task });
    if (answer.type !== 'claim-done') throw new Error(`unexpected answer "${answer.type}" to a claim`);
    return { indices: answer.indices, chunks: answer.chunks };
  }

  async runStudy(plan: SimulationPlan, options: StudyOptions): Promise<StudyResult> {
    const answer = await this.request({ type: 'study', plan, options });
    if (answer.type !== 'study-done') throw new Error(`unexpected answer "${answer.type}" to a study`);
    return answer.result;
  }

  async runFit(problem: FitProblem): Promise<FitResult> {
    const answer = await this.request({ type: 'fit', problem });
    if (answer.type !== 'fit-done') throw new Error(`unexpected answer "${answer.type}" to a fit`);
    return answer.result;
  }

  terminate(): Promise<number> {
    this.failAll(new Error('the simulation thread was shut down'));
    return this.worker.terminate();
  }
}

function threadChunkWorker(
  cancelFlag: Int32Array | null,
  options: ThreadOptions,
): ChunkWorker<SimulationPlan, ChunkResult> {
  const thread = new SimulationThread(options);
  return {
    simulate: (job) =>
      thread.simulateChunk(
        job.plan,
        job.range.firstPath,
        job.range.pathCount,
        cancelFlag ? { flag: cancelFlag, epoch: job.epoch } : null,
        job.onPathsDone,
      ),
    simulateClaimed: cancelFlag
      ? (job) =>
          thread.simulateClaimed(job.plan, {
            ranges: job.ranges,
            claim: job.claim,
            progress: job.progress,
            cancel: { flag: job.cancelEpoch, epoch: job.epoch },
          })
      : undefined,
    terminate: () => void thread.terminate(),
  };
}

export interface ThreadPool {
  pool: ChunkPool<SimulationPlan, ChunkResult>;
  executor: RunExecutor;
  /** Terminates every thread. */
  close(): Promise<void>;
}

/** A pool of `size` threads; studies run one at a time on an extra thread of their own. */
export function createThreadPool(size = defaultThreadCount(), threadOptions: ThreadOptions = {}): ThreadPool {
  const pool = new ChunkPool<SimulationPlan, ChunkResult>({
    size,
    createWorker: (cancelFlag) => threadChunkWorker(cancelFlag, threadOptions),
    sharedMemory: true,
  });
  let studyThread: SimulationThread | null = null;
  const study = (plan: SimulationPlan, options: StudyOptions) => {
    studyThread ??= new SimulationThread(threadOptions);
    return studyThread.runStudy(plan, options);
  };
  return {
    pool,
    executor: {
      ...poolExecutor(pool, study),
      runFit: (problem) => {
        studyThread ??= new SimulationThread();
        return studyThread.runFit(problem);
      },
    },
    async close() {
      pool.dispose();
      await studyThread?.terminate();
    },
  };
}
