import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SimulationPool } from '@/workers/pool';
import { simulate } from '@shared/engine/simulate';
import { runStudy } from '@shared/engine/study';
import { RunCancelledError, type RunProgress } from '@shared/run/chunk-pool';
import { splitPaths } from '@shared/run/chunks';
import { buildSimulationPlan, sheetDocumentSchema } from '@shared/sheet/index';
import { ShimWorker } from './web-worker-shim';
import { fitModel } from '@shared/fit/fit-model';
import { evenTimes, generator, ouProblem, ouSeries } from '../fit/fixtures';

/**
 * The browser pool and its comlink worker, run in Node through a Worker shim on worker_threads:
 * chunk transfer, the progress callback proxy, shared-memory cancel and the helper worker.
 */
const doc = sheetDocumentSchema.parse(
  JSON.parse(readFileSync(new URL('../runner/fixtures/small-relaxation.json', import.meta.url), 'utf8')),
);
const plan = buildSimulationPlan(doc, 'gauge-run');
const originalWorker = globalThis.Worker;
let pool: SimulationPool;

beforeAll(() => {
  (globalThis as { Worker: unknown }).Worker = ShimWorker;
  pool = new SimulationPool(2);
});

afterAll(() => {
  pool.dispose();
  (globalThis as { Worker: unknown }).Worker = originalWorker;
});

describe('SimulationPool (browser pool over comlink)', () => {
  it('gives the same result as the engine in one piece, with progress reaching every path', async () => {
    const progress: RunProgress[] = [];
    const result = await pool.simulate(plan, (p) => progress.push(p));
    expect(result.digest).toBe(simulate(plan).digest);
    expect(result.finalValues[0]).toBeInstanceOf(Float64Array);
    expect(progress[progress.length - 1]).toMatchObject({ pathsDone: 3000, paths: 3000 });
  });

  it('cancels a long run at once through shared memory and keeps working afterwards', async () => {
    expect(pool.usesSharedMemory).toBe(true);
    const running = pool.simulate({ ...plan, paths: 100_000, steps: 20_000 });
    await new Promise((resolve) => setTimeout(resolve, 200));
    pool.cancel();
    await expect(running).rejects.toBeInstanceOf(RunCancelledError);
    const again = await pool.simulate(plan);
    expect(again.digest).toBe(simulate(plan).digest);
  });

  it('with shared memory, workers take chunks from a shared counter: one message each per run', async () => {
    const calls: string[] = [];
    const post = ShimWorker.prototype.postMessage;
    ShimWorker.prototype.postMessage = function (this: ShimWorker, message: unknown, transfer) {
      const path = (message as { path?: unknown[] } | null)?.path;
      if (Array.isArray(path) && typeof path[0] === 'string') calls.push(path[0]);
      post.call(this, message, transfer);
    };
    try {
      const result = await pool.simulate({ ...plan, paths: 20_000 });
      expect(result.digest).toBe(simulate({ ...plan, paths: 20_000 }).digest);
    } finally {
      ShimWorker.prototype.postMessage = post;
    }
    expect(calls.filter((name) => name === 'simulateChunk')).toEqual([]);
    // At most one message per worker (two), although the run has more chunks than that. A busy
    // machine may let the first worker claim every chunk before the second is asked, so one
    // message is also right.
    expect(splitPaths(20_000, plan.steps).length).toBeGreaterThan(2);
    const claimed = calls.filter((name) => name === 'simulateClaimed').length;
    expect(claimed).toBeGreaterThanOrEqual(1);
    expect(claimed).toBeLessThanOrEqual(2);
  });

  it('without shared memory, cancels by replacing the busy workers', async () => {
    const isolated = new SimulationPool(2, { sharedMemory: false });
    try {
      expect(isolated.usesSharedMemory).toBe(false);
      const before = ShimWorker.created;
      const running = isolated.simulate({ ...plan, paths: 100_000, steps: 20_000 });
      await new Promise((resolve) => setTimeout(resolve, 200));
      isolated.cancel();
      await expect(running).rejects.toBeInstanceOf(RunCancelledError);
      expect(ShimWorker.created - before).toBe(2); // both busy workers replaced
      expect((await isolated.simulate(plan)).digest).toBe(simulate(plan).digest);
    } finally {
      isolated.dispose();
    }
  });

  it('runs a study on the helper worker with the same numbers as in-process', async () => {
    const options = { levels: 3, coarsestSteps: 4, paths: 40, state: 0, reference: 'finest' } as const;
    expect(await pool.runStudy(plan, options)).toEqual(runStudy(plan, options));
  });

  it('runs a fit on the helper worker with progress, the same estimates as in-process, and cancels it', async () => {
    const values = ouSeries(generator(31), { kappa: 1, mu: 0.5, sigma: 0.4 }, 200, 0.5, 0.5);
    const problem = ouProblem([{ times: evenTimes(200, 0.5), values }], 'exact');
    const progress: RunProgress[] = [];
    const result = await pool.runFit(problem, (p) => progress.push(p));
    expect(result.estimates).toEqual(fitModel(problem).estimates);

    const slow = ouProblem(
      [
        {
          times: evenTimes(400, 0.5),
          values: ouSeries(generator(32), { kappa: 1, mu: 0, sigma: 0.4 }, 400, 0.5, 0),
        },
      ],
      'simulated',
      undefined,
      { subSteps: 32, draws: 128 },
    );
    const running = pool.runFit(slow, (p) => progress.push(p));
    await new Promise((resolve) => setTimeout(resolve, 1500));
    pool.cancel();
    await expect(running).rejects.toBeInstanceOf(RunCancelledError);
    expect(progress.at(-1)?.unit).toBe('likelihood evaluations');
  });
});
