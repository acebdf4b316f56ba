import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { bandInterval, searchTarget } from '@shared/engine/target-search';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { sheet } from './sheets';

const mu = 0.05,
  T = 1,
  a = 1.3,
  goal = 0.15;

/**
 * The volatility at which P(X_T ≥ a) = goal for geometric Brownian motion from 1: with
 * z = Φ⁻¹(1 − goal), (log a − (μ − σ²/2)T)/(σ√T) = z is the quadratic σ²T/2 − zσ√T + log a − μT = 0
 * (lognormal law of GBM); the smaller root.
 */
function exactRoot(): number {
  const z = jStat.normal.inv(1 - goal, 0, 1);
  const c = Math.log(a) - mu * T;
  return (z * Math.sqrt(T) - Math.sqrt(z * z * T - 2 * T * c)) / T;
}

function searchSheet(seed: number) {
  return sheet({
    params: { mu, sigma: 0.3 },
    drift: 'mu - sigma ** 2 / 2',
    diffusion: 'sigma',
    initial: '0',
    t1: T,
    steps: 4,
    paths: 2000,
    seed,
    probes: [{ id: 'up', quantity: 'exceedance', level: Math.log(a) }],
    cells: [
      {
        id: 'sw',
        kind: 'sweep',
        probe: 'up',
        axes: [{ parameter: 'sigma', spacing: 'linear', from: 0.1, to: 0.6, count: 6, values: [] }],
        target: { value: goal, refineRuns: 4 },
      },
    ],
  });
}

describe('target search', () => {
  it('brackets the GBM root from the sweep; the interval contains it in at least 90 % of 50 seeds', async () => {
    const root = exactRoot();
    let covered = 0;
    for (let k = 0; k < 50; k++) {
      const run = await runSheet(searchSheet(500 + 31 * k), { executor: inProcessExecutor(), target: 'sw' });
      const output = run.outputs.get('sw')!.output;
      if (output.kind !== 'sweep') throw new Error(JSON.stringify(output));
      const target = output.result.target!;
      expect(target.bracketed).toBe(true);
      // Four refined runs, fewer when one lands exactly on the target.
      expect(target.refined.length).toBeGreaterThan(0);
      expect(target.refined.length).toBeLessThanOrEqual(4);
      const [lo, hi] = target.interval!;
      expect(lo).toBeLessThanOrEqual(target.root!);
      expect(hi).toBeGreaterThanOrEqual(target.root!);
      if (lo <= root && root <= hi) covered++;
    }
    expect(covered).toBeGreaterThanOrEqual(45);
  });

  it('says plainly when the target is not bracketed, without refined runs', async () => {
    const points = [0, 1, 2].map((x) => ({
      x,
      estimate: 0.5 + 0.1 * x,
      ci: [0.45 + 0.1 * x, 0.55 + 0.1 * x] as [number, number],
    }));
    let runs = 0;
    const result = await searchTarget(points, 0.05, {
      iterations: 5,
      evaluate: async (x) => {
        runs++;
        return { x, estimate: 0, ci: [0, 0] };
      },
    });
    expect(result.bracketed).toBe(false);
    expect(result.root).toBeNull();
    expect(result.message).toMatch(/not bracketed.*above it/);
    expect(runs).toBe(0);
  });

  it('inverts the band: the interval runs between the crossings of the upper and lower bounds', () => {
    // A straight line 0.1·x with bounds ± 0.05: the target 0.5 is inside the band for x in [4.5, 5.5].
    const points = [0, 2, 4, 6, 8, 10].map((x) => ({
      x,
      estimate: 0.1 * x,
      ci: [0.1 * x - 0.05, 0.1 * x + 0.05] as [number, number],
    }));
    const band = bandInterval(points, 0.5, 5);
    expect(band.interval[0]).toBeCloseTo(4.5, 10);
    expect(band.interval[1]).toBeCloseTo(5.5, 10);
    expect(band.openBelow || band.openAbove).toBe(false);
  });
});
