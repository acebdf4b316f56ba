import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import type { SweepResult } from '@shared/run/sweep-result';
import type { SheetDocument } from '@shared/sheet/index';
import { sheet } from './sheets';

async function sweepOf(doc: SheetDocument): Promise<SweepResult> {
  const run = await runSheet(doc, { executor: inProcessExecutor(), target: 'sw' });
  const output = run.outputs.get('sw')!.output;
  if (output.kind !== 'sweep') throw new Error(JSON.stringify(output));
  return output.result;
}

const axis = (parameter: string, from: number, to: number, count: number) => ({
  parameter,
  spacing: 'linear' as const,
  from,
  to,
  count,
  values: [],
});

describe('sweeps against closed forms', () => {
  it('OU: the variance at T against θ follows σ²(1 − e^{−2θT})/(2θ) within 4 standard errors', async () => {
    const sigma = 0.8,
      T = 1,
      steps = 100,
      h = T / steps;
    const doc = sheet({
      params: { theta: 1, sigma },
      drift: '-theta * X',
      diffusion: 'sigma',
      initial: '0',
      t1: T,
      steps,
      paths: 4000,
      probes: [{ id: 'var', quantity: 'variance' }],
      cells: [{ id: 'sw', kind: 'sweep', probe: 'var', axes: [axis('theta', 0.5, 3, 6)] }],
    });
    const result = await sweepOf(doc);
    expect(result.points).toHaveLength(6);
    for (const point of result.points) {
      const theta = point.values[0]!;
      // OU variance, closed form (Kloeden & Platen 1992, §4.4).
      const exact = (sigma * sigma * (1 - Math.exp(-2 * theta * T))) / (2 * theta);
      // Euler–Maruyama's own recursion X ← ρX + σ√h Z, ρ = 1 − θh, has variance σ²h(1 − ρ^{2n})/(1 − ρ²)
      // (geometric sum; common practice, no source): the known discretisation bias is allowed for.
      const rho = 1 - theta * h;
      const scheme = (sigma * sigma * h * (1 - rho ** (2 * steps))) / (1 - rho * rho);
      expect(Math.abs(point.estimate - exact)).toBeLessThan(
        4 * point.standardError + Math.abs(scheme - exact),
      );
    }
  });

  it('GBM: P(X_T ≥ a) against σ follows the lognormal law within 4 standard errors', async () => {
    const mu = 0.05,
      T = 1,
      a = 1.3;
    // log X is Brownian motion with drift μ − σ²/2: Euler–Maruyama is exact for it, so no bias.
    const doc = sheet({
      params: { mu, sigma: 0.3 },
      drift: 'mu - sigma ** 2 / 2',
      diffusion: 'sigma',
      initial: '0',
      t1: T,
      steps: 4,
      paths: 4000,
      probes: [{ id: 'up', quantity: 'exceedance', level: Math.log(a) }],
      cells: [{ id: 'sw', kind: 'sweep', probe: 'up', axes: [axis('sigma', 0.1, 0.6, 6)] }],
    });
    const result = await sweepOf(doc);
    for (const point of result.points) {
      const sigma = point.values[0]!;
      // Lognormal law of geometric Brownian motion, normal CDF from jstat.
      const exact =
        1 - jStat.normal.cdf((Math.log(a) - (mu - sigma ** 2 / 2) * T) / (sigma * Math.sqrt(T)), 0, 1);
      const se = Math.sqrt((exact * (1 - exact)) / 4000);
      expect(Math.abs(point.estimate - exact)).toBeLessThan(4 * Math.max(se, 1e-4));
    }
    // Common random numbers: neighbouring values differ with a paired error below the independent one.
    const steps = result.points.slice(1).map((point) => point.step!);
    expect(steps.every((step) => step.pairedSE! < step.independentSE)).toBe(true);
  });
});
