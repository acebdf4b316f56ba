// Over 300 lines on purpose: the pool's scheduling, progress and cancel share one state machine,
// which is easier to check whole than split.
import { splitPaths, type ChunkRange } from './chunks';
import type { ClaimedChunks } from './chunk-task';
import type { RunProgress } from './progress';

export type { RunProgress };

/**
 * A pool of simulation workers that hands out chunks of paths as workers free up. Framework-free
 * and environment-free: the browser gives it Web Workers (src/workers/pool.ts), the command-line
 * runner gives it worker_threads (server/cli/thread-pool.ts), tests give it fakes.
 *
 * Cancel: the pool keeps a run epoch in a shared Int32Array when SharedArrayBuffer is available;
 * a worker compares it with the epoch its chunk started under and stops between paths. Without
 * shared memory (a page that is not cross-origin isolated) busy workers are terminated and
 * replaced. Either way the run's promise rejects with RunCancelledError at once.
 *
 * Claim mode: with shared memory and workers that offer `simulateClaimed`, a run is not handed
 * out chunk by chunk. Each free worker gets the whole list of ranges once and takes chunks from a
 * shared counter until none is left, then answers with all of its chunks; progress goes through a
 * shared array. A worker never idles between chunks waiting for a message, and this thread is not
 * woken per chunk (on two cores that thread competes with the workers). The split is the same, so
 * the chunks and the merged numbers are too.
 */

export interface PlanSize {
  paths: number;
  steps: number;
}

export interface ChunkJob<TPlan> {
  plan: TPlan;
  range: ChunkRange;
  /** The epoch the chunk belongs to; the chunk stops when the shared epoch moves on. */
  epoch: number;
  /** Paths of this chunk finished so far (called by the worker side, throttled there). */
  onPathsDone: (pathsDone: number) => void;
}

export interface ClaimJob<TPlan> {
  plan: TPlan;
  ranges: ChunkRange[];
  /** Shared [index of the next unclaimed chunk]: take one with Atomics.add(claim, 0, 1). */
  claim: Int32Array;
  /** Shared paths done per chunk; the worker stores into it as a chunk goes. */
  progress: Int32Array;
  /** The pool's shared epoch counter; stop when it differs from `epoch`. */
  cancelEpoch: Int32Array;
  epoch: number;
}

export interface ChunkWorker<TPlan, TChunk> {
  simulate(job: ChunkJob<TPlan>): Promise<TChunk>;
  /** Optional claim mode (see above): simulates chunks taken from `job.claim` until none is left. */
  simulateClaimed?(job: ClaimJob<TPlan>): Promise<ClaimedChunks<TChunk>>;
  terminate(): void;
}

/** `cancelEpoch` is null when shared memory is not available. */
export type ChunkWorkerFactory<TPlan, TChunk> = (
  cancelEpoch: Int32Array | null,
) => ChunkWorker<TPlan, TChunk>;

export class RunCancelledError extends Error {
  constructor() {
    super('the run was cancelled');
    this.name = 'RunCancelledError';
  }
}

export interface ChunkPoolOptions<TPlan, TChunk> {
  size: number;
  createWorker: ChunkWorkerFactory<TPlan, TChunk>;
  /** Use a SharedArrayBuffer flag for cancel when the environment has one (default: detect). */
  sharedMemory?: boolean;
  progressIntervalMs?: number;
  now?: () => number;
}

interface ActiveRun<TPlan, TChunk> {
  plan: TPlan & PlanSize;
  epoch: number;
  ranges: ChunkRange[];
  results: (TChunk | undefined)[];
  done: number[];
  remaining: number;
  /** Claim mode only: the shared next-chunk counter and per-chunk progress. */
  claim: Int32Array | null;
  progress: Int32Array | null;
  startedAt: number;
  onProgress: ((progress: RunProgress) => void) | undefined;
  timer: ReturnType<typeof setInterval> | undefined;
  resolve: (chunks: TChunk[]) => void;
  reject: (error: unknown) => void;
}

/** `index` −1: a claim job (the worker takes chunks of the run itself). */
interface QueuedChunk<TPlan, TChunk> {
  run: ActiveRun<TPlan, TChunk>;
  index: number;
}

const CLAIM = -1;

interface Slot<TPlan, TChunk> {
  worker: ChunkWorker<TPlan, TChunk>;
  busyWith: QueuedChunk<TPlan, TChunk> | null;
}

export function sharedMemoryAvailable(): boolean {
  if (typeof SharedArrayBuffer === 'undefined') return false;
  // In a browser, SharedArrayBuffer can only be posted to a worker from a cross-origin isolated page.
  const isolated = (globalThis as { crossOriginIsolated?: boolean }).crossOriginIsolated;
  return isolated !== false;
}

export class ChunkPool<TPlan extends PlanSize, TChunk> {
  private readonly slots: Slot<TPlan, TChunk>[] = [];
  private readonly queue: QueuedChunk<TPlan, TChunk>[] = [];
  private readonly runs = new Set<ActiveRun<TPlan, TChunk>>();
  private readonly cancelEpoch: Int32Array | null;
  private readonly createWorker: ChunkWorkerFactory<TPlan, TChunk>;
  private readonly progressIntervalMs: number;
  private readonly now: () => number;
  private epoch = 0;
  private disposed = false;

  constructor(options: ChunkPoolOptions<TPlan, TChunk>) {
    if (!Number.isInteger(options.size) || options.size < 1) {
      throw new RangeError(`a pool needs at least one worker, got ${options.size}`);
    }
    const shared = options.sharedMemory ?? sharedMemoryAvailable();
    this.cancelEpoch = shared ? new Int32Array(new SharedArrayBuffer(4)) : null;
    this.createWorker = options.createWorker;
    this.progressIntervalMs = options.progressIntervalMs ?? 200;
    this.now = options.now ?? (() => performance.now());
    for (let i = 0; i < options.size; i++)
      this.slots.push({ worker: this.createWorker(this.cancelEpoch), busyWith: null });
  }

  get size(): number {
    return this.slots.length;
  }

  /** Whether cancel works through shared memory (true) or by replacing workers (false). */
  get usesSharedMemory(): boolean {
    return this.cancelEpoch !== null;
  }

  /** Simulates all paths of the plan; resolves with the chunks in path order. */
  run(plan: TPlan, onProgress?: (progress: RunProgress) => void): Promise<TChunk[]> {
    if (this.disposed) return Promise.reject(new Error('the worker pool has been shut down'));
    const ranges = splitPaths(plan.paths, plan.steps);
    const claims = this.cancelEpoch !== null && this.slots.every((slot) => slot.worker.simulateClaimed);
    return new Promise<TChunk[]>((resolve, reject) => {
      const run: ActiveRun<TPlan, TChunk> = {
        plan,
        epoch: this.epoch,
        ranges,
        results: new Array<TChunk | undefined>(ranges.length),
        done: new Array<number>(ranges.length).fill(0),
        remaining: ranges.length,
        claim: claims ? new Int32Array(new SharedArrayBuffer(4)) : null,
        progress: claims ? new Int32Array(new SharedArrayBuffer(4 * ranges.length)) : null,
        startedAt: this.now(),
        onProgress,
        timer: undefined,
        resolve,
        reject,
      };
      this.runs.add(run);
      if (onProgress) {
        onProgress(this.progressOf(run));
        run.timer = setInterval(() => onProgress(this.progressOf(run)), this.progressIntervalMs);
      }
      if (claims) this.queue.push({ run, index: CLAIM });
      else for (let index = 0; index < ranges.length; index++) this.queue.push({ run, index });
      this.dispatch();
    });
  }

  /** Stops every run in flight; their promises reject with RunCancelledError. */
  cancel(): void {
    this.epoch++;
    if (this.cancelEpoch) Atomics.store(this.cancelEpoch, 0, this.epoch);
    this.queue.length = 0;
    for (const run of [...this.runs]) this.finish(run, { error: new RunCancelledError() });
    if (!this.cancelEpoch) {
      for (const slot of this.slots) {
        if (!slot.busyWith) continue;
        slot.worker.terminate();
        slot.worker = this.createWorker(null);
        slot.busyWith = null;
      }
    }
  }

  /** Cancels what runs and terminates the workers; the pool cannot be used afterwards. */
  dispose(): void {
    this.cancel();
    this.disposed = true;
    for (const slot of this.slots) slot.worker.terminate();
  }

  private progressOf(run: ActiveRun<TPlan, TChunk>): RunProgress {
    let pathsDone = 0;
    for (let i = 0; i < run.done.length; i++)
      pathsDone += run.progress ? Math.max(run.done[i]!, Atomics.load(run.progress, i)) : run.done[i]!;
    const elapsedMs = this.now() - run.startedAt;
    const etaMs = pathsDone > 0 ? (elapsedMs * (run.plan.paths - pathsDone)) / pathsDone : null;
    return { pathsDone, paths: run.plan.paths, elapsedMs, etaMs };
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (slot.busyWith) continue;
      const next = this.nextItem();
      if (!next) return;
      if (next.index === CLAIM) this.startClaims(slot, next);
      else this.start(slot, next);
    }
  }

  /** The next chunk, or a claim job for the oldest claim-mode run that still has unclaimed chunks. */
  private nextItem(): QueuedChunk<TPlan, TChunk> | undefined {
    for (;;) {
      const head = this.queue[0];
      if (!head || head.index !== CLAIM) return this.queue.shift();
      if (Atomics.load(head.run.claim!, 0) < head.run.ranges.length) return head;
      this.queue.shift();
    }
  }

  private startClaims(slot: Slot<TPlan, TChunk>, item: QueuedChunk<TPlan, TChunk>): void {
    const { run } = item;
    slot.busyWith = item;
    const worker = slot.worker;
    const settle = (outcome: { claimed: ClaimedChunks<TChunk> } | { error: unknown }) => {
      if (slot.worker === worker && slot.busyWith === item) slot.busyWith = null;
      if (this.runs.has(run)) {
        if ('error' in outcome) {
          this.finish(run, outcome);
        } else {
          const { indices, chunks } = outcome.claimed;
          for (let i = 0; i < indices.length; i++) {
            const index = indices[i]!;
            run.results[index] = chunks[i];
            run.done[index] = run.ranges[index]!.pathCount;
          }
          run.remaining -= indices.length;
          if (run.remaining === 0) this.finish(run, { chunks: run.results as TChunk[] });
        }
      }
      this.dispatch();
    };
    worker.simulateClaimed!({
      plan: run.plan,
      ranges: run.ranges,
      claim: run.claim!,
      progress: run.progress!,
      cancelEpoch: this.cancelEpoch!,
      epoch: run.epoch,
    }).then(
      (claimed) => settle({ claimed }),
      (error: unknown) => settle({ error }),
    );
  }

  private start(slot: Slot<TPlan, TChunk>, item: QueuedChunk<TPlan, TChunk>): void {
    const { run, index } = item;
    const range = run.ranges[index]!;
    slot.busyWith = item;
    const worker = slot.worker;
    const job: ChunkJob<TPlan> = {
      plan: run.plan,
      range,
      epoch: run.epoch,
      onPathsDone: (pathsDone) => {
        if (this.runs.has(run)) run.done[index] = Math.min(pathsDone, range.pathCount);
      },
    };
    const settle = (outcome: { chunk: TChunk } | { error: unknown }) => {
      // A replaced (terminated) worker's late answer must not free the slot of its successor.
      if (slot.worker === worker && slot.busyWith === item) slot.busyWith = null;
      if (this.runs.has(run)) {
        if ('error' in outcome) {
          this.finish(run, outcome);
        } else {
          run.results[index] = outcome.chunk;
          run.done[index] = range.pathCount;
          run.remaining--;
          if (run.remaining === 0) this.finish(run, { chunks: run.results as TChunk[] });
        }
      }
      this.dispatch();
    };
    worker.simulate(job).then(
      (chunk) => settle({ chunk }),
      (error: unknown) => settle({ error }),
    );
  }

  private finish(run: ActiveRun<TPlan, TChunk>, outcome: { chunks: TChunk[] } | { error: unknown }): void {
    if (!this.runs.delete(run)) return;
    if (run.timer !== undefined) clearInterval(run.timer);
    // Claim mode: workers still busy with this run take no further chunk of it.
    if (run.claim) Atomics.store(run.claim, 0, run.ranges.length);
    for (let i = this.queue.length - 1; i >= 0; i--) if (this.queue[i]!.run === run) this.queue.splice(i, 1);
    if ('chunks' in outcome) {
      run.onProgress?.(this.progressOf(run));
      run.resolve(outcome.chunks);
    } else {
      run.reject(outcome.error);
    }
  }
}
