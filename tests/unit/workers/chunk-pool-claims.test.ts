import { describe, expect, it } from 'vitest';
import { ChunkPool, type ChunkWorker, type ClaimJob, type RunProgress } from '@shared/run/chunk-pool';
import type { ClaimedChunks } from '@shared/run/chunk-task';
import { splitPaths } from '@shared/run/chunks';

interface FakePlan {
  paths: number;
  steps: number;
}
interface FakeChunk {
  firstPath: number;
  pathCount: number;
  workerId: number;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Fake workers in claim mode: each takes chunks from the shared counter as a real worker does
 * (Atomics.add), "simulates" each for a few milliseconds while writing progress into the shared
 * array, and answers once with everything it took.
 */
function claimingWorkers(options: { chunkMs: (workerId: number) => number; failOnChunk?: number }) {
  let nextId = 0;
  const claimedBy: number[][] = [];
  const factory = (): ChunkWorker<FakePlan, FakeChunk> => {
    const id = nextId++;
    claimedBy[id] = [];
    return {
      simulate: () => Promise.reject(new Error('claim-mode workers are not handed single chunks')),
      async simulateClaimed(job: ClaimJob<FakePlan>): Promise<ClaimedChunks<FakeChunk>> {
        const result: ClaimedChunks<FakeChunk> = { indices: [], chunks: [] };
        while (Atomics.load(job.cancelEpoch, 0) === job.epoch) {
          const index = Atomics.add(job.claim, 0, 1);
          const range = job.ranges[index];
          if (range === undefined) break;
          if (index === options.failOnChunk) throw new Error(`worker ${id} failed on chunk ${index}`);
          claimedBy[id]!.push(index);
          Atomics.store(job.progress, index, Math.floor(range.pathCount / 2));
          await sleep(options.chunkMs(id));
          Atomics.store(job.progress, index, range.pathCount);
          result.indices.push(index);
          result.chunks.push({ firstPath: range.firstPath, pathCount: range.pathCount, workerId: id });
        }
        return result;
      },
      terminate: () => undefined,
    };
  };
  return { factory, claimedBy };
}

describe('ChunkPool in claim mode (shared counter)', () => {
  it('returns every chunk once, in path order, whichever worker took it', async () => {
    const workers = claimingWorkers({ chunkMs: (id) => (id === 0 ? 1 : 4) });
    const pool = new ChunkPool<FakePlan, FakeChunk>({
      size: 3,
      createWorker: workers.factory,
      sharedMemory: true,
    });
    const plan = { paths: 10_000, steps: 1_000 };
    const chunks = await pool.run(plan);
    expect(chunks.map(({ firstPath, pathCount }) => ({ firstPath, pathCount }))).toEqual(
      splitPaths(10_000, 1_000),
    );
    const taken = workers.claimedBy.flat().sort((a, b) => a - b);
    expect(taken).toEqual(chunks.map((_, index) => index));
    // The faster worker took more chunks: work is shared by speed, not by a fixed split.
    expect(workers.claimedBy[0]!.length).toBeGreaterThan(workers.claimedBy[1]!.length);
    pool.dispose();
  });

  it('reports monotone progress that ends at all paths', async () => {
    const workers = claimingWorkers({ chunkMs: () => 6 });
    const pool = new ChunkPool<FakePlan, FakeChunk>({
      size: 2,
      createWorker: workers.factory,
      sharedMemory: true,
      progressIntervalMs: 5,
    });
    const seen: RunProgress[] = [];
    await pool.run({ paths: 4_000, steps: 100 }, (progress) => seen.push(progress));
    const done = seen.map((progress) => progress.pathsDone);
    for (let i = 1; i < done.length; i++) expect(done[i]).toBeGreaterThanOrEqual(done[i - 1]!);
    expect(done.at(-1)).toBe(4_000);
    expect(done.some((value) => value > 0 && value < 4_000)).toBe(true);
    pool.dispose();
  });

  it('fails the run when a worker fails and the others stop taking its chunks', async () => {
    const workers = claimingWorkers({ chunkMs: () => 3, failOnChunk: 2 });
    const pool = new ChunkPool<FakePlan, FakeChunk>({
      size: 2,
      createWorker: workers.factory,
      sharedMemory: true,
    });
    const plan = { paths: 10_000, steps: 1_000 };
    await expect(pool.run(plan)).rejects.toThrow(/failed on chunk 2/);
    await sleep(30);
    const taken = workers.claimedBy.flat().length;
    expect(taken).toBeLessThan(splitPaths(10_000, 1_000).length - 1);
    pool.dispose();
  });
});
