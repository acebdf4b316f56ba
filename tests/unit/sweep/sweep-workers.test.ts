import { afterAll, describe, expect, it } from 'vitest';
import { createThreadPool, type ThreadPool } from '../../../server/cli/thread-pool';
import type { RunProgress } from '@shared/run/progress';
import { runSheet } from '@shared/run/run-sheet';
import { sheet } from './sheets';

/** Sweeps on real worker_threads: the runner's configuration. */
const pools: ThreadPool[] = [];
afterAll(async () => {
  for (const pool of pools) await pool.close();
});
function threads(size: number): ThreadPool {
  const pool = createThreadPool(size);
  pools.push(pool);
  return pool;
}

function sweepSheet(paths: number, steps: number, count: number) {
  return sheet({
    params: { r: 0.6, K: 50, h: 0.1, s: 0.35 },
    drift: 'r * X * (1 - X / K) - h * X',
    diffusion: 's * X',
    initial: '20',
    t1: 10,
    steps,
    paths,
    boundaries: { X: { rule: 'absorb', level: 1, side: 'below' } },
    probes: [{ id: 'gone', quantity: 'extinction' }],
    cells: [
      {
        id: 'sw',
        kind: 'sweep',
        probe: 'gone',
        axes: [{ parameter: 'h', spacing: 'linear', from: 0.05, to: 0.45, count, values: [] }],
      },
    ],
  });
}

async function digests(pool: ThreadPool): Promise<string[]> {
  const run = await runSheet(sweepSheet(3000, 400, 5), { executor: pool.executor, target: 'sw' });
  const output = run.outputs.get('sw')!.output;
  if (output.kind !== 'sweep') throw new Error(JSON.stringify(output));
  return output.result.points.map((point) => point.digest);
}

describe('sweeps on worker threads', () => {
  it('gives the same digest per point with 1, 2 and 3 workers', async () => {
    const one = await digests(threads(1));
    expect(new Set(one).size).toBe(5);
    expect(await digests(threads(2))).toEqual(one);
    expect(await digests(threads(3))).toEqual(one);
  });

  it('reports progress point by point and stops at a cancel without running the later points', async () => {
    const pool = threads(2);
    const seen: RunProgress[] = [];
    let cancelled = false;
    let calls = 0;
    const executor = {
      ...pool.executor,
      runSimulation: (...args: Parameters<typeof pool.executor.runSimulation>) => {
        calls++;
        return pool.executor.runSimulation(...args);
      },
    };
    const running = runSheet(sweepSheet(100_000, 4000, 20), {
      executor,
      target: 'sw',
      isCancelled: () => cancelled,
      onProgress: (_, progress) => {
        seen.push(progress);
        if (progress.point!.index === 2 && !cancelled) {
          cancelled = true;
          pool.pool.cancel();
        }
      },
    });
    const run = await running;
    expect(run.cancelled).toBe(true);
    expect(run.outputs.has('sw')).toBe(false);
    expect(calls).toBe(2);
    expect(seen[0]!.point).toMatchObject({ index: 1, count: 20 });
    expect(seen.every((p) => p.point!.share >= 0 && p.point!.share <= 1)).toBe(true);
    expect(seen.every((p) => p.paths === 20 * 100_000)).toBe(true);
  });
});
