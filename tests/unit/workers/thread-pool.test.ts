import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createThreadPool, type ThreadPool } from '../../../server/cli/thread-pool';
import { mergeChunks } from '@shared/engine/merge';
import { simulate } from '@shared/engine/simulate';
import { runStudy } from '@shared/engine/study';
import { RunCancelledError } from '@shared/run/chunk-pool';
import { buildSimulationPlan, sheetDocumentSchema } from '@shared/sheet/index';

/** The chunk pool on real worker_threads (the runner's and the benchmark's configuration). */
const doc = sheetDocumentSchema.parse(
  JSON.parse(readFileSync(new URL('../runner/fixtures/small-relaxation.json', import.meta.url), 'utf8')),
);
const plan = buildSimulationPlan(doc, 'gauge-run');
const pools: ThreadPool[] = [];

afterAll(async () => {
  for (const pool of pools) await pool.close();
});

function pool(size: number): ThreadPool {
  const created = createThreadPool(size);
  pools.push(created);
  return created;
}

describe('thread pool', () => {
  it('merges to the same digest on one thread, on three threads and in one piece in-process', async () => {
    const whole = simulate(plan);
    const one = mergeChunks(plan, await pool(1).pool.run(plan));
    const three = mergeChunks(plan, await pool(3).pool.run(plan));
    expect(one.digest).toBe(whole.digest);
    expect(three.digest).toBe(whole.digest);
    expect(Array.from(three.finalValues[0]!)).toEqual(Array.from(whole.finalValues[0]!));
  });

  it('cancels a long run within 200 ms and is ready for the next one', async () => {
    const threads = pool(2);
    await threads.pool.run(plan); // threads started and warm
    const long = { ...plan, paths: 200_000, steps: 20_000 };
    const running = threads.pool.run(long);
    await new Promise((resolve) => setTimeout(resolve, 300));
    const cancelledAt = performance.now();
    threads.pool.cancel();
    await expect(running).rejects.toBeInstanceOf(RunCancelledError);
    expect(performance.now() - cancelledAt).toBeLessThan(200);
    // The threads noticed the shared epoch and stopped their chunks: a small run gets through quickly.
    const again = mergeChunks(plan, await threads.pool.run(plan));
    // Finishing the 4·10⁹ path-steps instead would take minutes; a busy shared machine may need seconds.
    expect(performance.now() - cancelledAt).toBeLessThan(15_000);
    expect(again.digest).toBe(simulate(plan).digest);
  });

  it('runs a study on its own thread, with the same numbers as in-process', async () => {
    const options = { levels: 4, coarsestSteps: 4, paths: 50, state: 0, reference: 'finest' } as const;
    const threaded = await pool(1).executor.runStudy(plan, options);
    expect(threaded.levels[0]!.steps).toBe(4);
    expect(threaded).toEqual(runStudy(plan, options));
  });
});
