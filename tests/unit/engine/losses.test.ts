import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import { evaluateProbe } from '@shared/engine/probes';
import { makePlan } from './plans';

/**
 * Paths the engine cannot carry to t1 are "lost", by cause: a coefficient evaluated outside its
 * domain (not a number), an infinite value, or a value beyond the blow-up bound. Beyond 1 % lost,
 * every estimate is conditional on the surviving paths and says so.
 */

// Cox–Ingersoll–Ross dX = κ(θ − X) dt + σ√X dW with 2κθ = 0.096 < σ² = 0.49: the Feller
// condition fails, X reaches 0, and Euler–Maruyama steps it below 0, where √X is not a number
// (Feller 1951; Lord, Koekkoek & van Dijk 2010, Quant. Finance 10(2), §2). Values our own.
const cir = (diffusion: string) =>
  makePlan({
    drift: ['0.8 * (0.06 - s0)'],
    diffusion: [[diffusion]],
    initial: [0.05],
    t1: 3,
    steps: 300,
    paths: 2000,
    saveCount: 7,
  });

describe('lost paths by cause', () => {
  it('counts a square root of a negative state as a domain error, not a blow-up, and advises truncation', () => {
    const result = simulate(cir('0.7 * f_sqrt(s0)'));
    const { losses } = result;
    expect(losses.byCause.domain).toBeGreaterThan(0.2 * result.paths);
    expect(losses.byCause.infinite).toBe(0);
    expect(losses.byCause.bound).toBe(0);
    expect(losses.count).toBe(losses.byCause.domain);
    expect(losses.conditional).toBe(true);
    expect(losses.allLost).toBe(false);
    expect(losses.message).toMatch(/not a number/);
    expect(losses.message).toMatch(/conditional on the \d[\d,]* surviving paths/);
    expect(losses.advice.join(' ')).toMatch(/square root in the diffusion of x0/);
    expect(losses.advice.join(' ')).toMatch(/sqrt\(max\(x0, 0\)\)/);
    expect(losses.advice.join(' ')).toMatch(/boundary rule/);
  });

  it('marks every probe estimate of a run that lost more than 1 % as conditional', () => {
    const result = simulate(cir('0.7 * f_sqrt(s0)'));
    for (const quantity of ['mean', 'variance', 'exceedance'] as const) {
      const estimate = evaluateProbe(result, { quantity, state: 0, level: 0.06 });
      expect(estimate.warnings?.join(' ')).toMatch(/conditional on the \d[\d,]* surviving paths/);
    }
  });

  it('loses nothing once the square root is fully truncated', () => {
    const result = simulate(cir('0.7 * f_sqrt(Math.max(s0, 0))'));
    expect(result.losses.count).toBe(0);
    expect(result.losses.conditional).toBe(false);
    expect(result.losses.message).toBeNull();
    expect(evaluateProbe(result, { quantity: 'mean', state: 0 }).warnings ?? []).toEqual([]);
  });

  it('tells an infinite value from one beyond the blow-up bound', () => {
    // dX = X² dt from X0 = 1 explodes at t = 1 (X = 1/(1 − t)); Euler follows it past 1e308.
    const explosive = makePlan({
      drift: ['s0 * s0'],
      diffusion: [['0']],
      initial: [1],
      t1: 2,
      steps: 2000,
      paths: 4,
    });
    const infinite = simulate(explosive).losses;
    expect(infinite.byCause).toEqual({ domain: 0, infinite: 4, bound: 0 });
    expect(infinite.advice.join(' ')).toMatch(/smaller step/);
    const bounded = simulate({ ...explosive, blowupBound: 1e6 }).losses;
    expect(bounded.byCause).toEqual({ domain: 0, infinite: 0, bound: 4 });
  });

  it('has no estimates when every path is lost', () => {
    const result = simulate(
      makePlan({ drift: ['f_log(s0 - 2)'], diffusion: [['0.1']], initial: [1], t1: 1, steps: 10, paths: 50 }),
    );
    expect(result.losses.allLost).toBe(true);
    expect(result.losses.byCause.domain).toBe(50);
    expect(result.losses.advice.join(' ')).toMatch(/logarithm in the drift of x0/);
    expect(() => evaluateProbe(result, { quantity: 'mean', state: 0 })).toThrow(/every path was lost/);
  });

  it('keeps a small loss (at most 1 %) as a note without conditioning the estimates', () => {
    // Standard Brownian paths with a bound that only the widest of them cross.
    const plan = makePlan({ drift: ['0'], diffusion: [['1']], initial: [0], t1: 1, steps: 50, paths: 2000 });
    const result = simulate({ ...plan, blowupBound: 3.2 });
    // P(max_{t≤1} |W_t| ≥ 3.2) ≈ 4·P(W_1 ≥ 3.2) ≈ 0.0027 (reflection principle; Feller 1971, §X.5).
    expect(result.losses.count).toBeGreaterThan(0);
    expect(result.losses.share).toBeLessThanOrEqual(0.01);
    expect(result.losses.conditional).toBe(false);
    const estimate = evaluateProbe(result, { quantity: 'mean', state: 0 });
    expect(estimate.note).toMatch(/lost/);
    expect(estimate.warnings ?? []).toEqual([]);
  });
});
