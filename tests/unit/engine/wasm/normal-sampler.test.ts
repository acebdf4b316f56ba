import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import { ksCritical5, ksStatistic, makePlan } from '../plans';
import { withKernel } from './parity';

/**
 * The normal sampler as the wasm kernel runs it (four lanes, the rare branch in wasm): dX = dW
 * over one step of length 1 gives X_1 = z, the first draw of each path's stream, so the final
 * values are a sample of the sampler. Seed 12, as the JavaScript kernel's KS test uses.
 */
const plan = makePlan({
  drift: ['0'],
  diffusion: [['1']],
  initial: [0],
  t1: 1,
  steps: 1,
  paths: 200_000,
  saveCount: 2,
  seed: 12,
});
const result = withKernel('wasm', () => simulate(plan));
const draws = result.finalValues[0]!;
const n = draws.length;

describe('normal draws through the wasm kernel', () => {
  it('ran on the wasm kernel', () => {
    expect(result.kernel).toBe('wasm');
  });

  it('passes Kolmogorov–Smirnov against the normal CDF at 5 %', () => {
    // Critical value 1.36/√n (Kolmogorov–Smirnov table, Massey 1951); jstat's normal CDF.
    expect(ksStatistic(draws, (x) => jStat.normal.cdf(x, 0, 1))).toBeLessThan(ksCritical5(n));
  });

  it('has the normal moments within 5 standard errors', () => {
    let m1 = 0;
    let m2 = 0;
    let m3 = 0;
    let m4 = 0;
    for (const x of draws) {
      m1 += x;
      m2 += x * x;
      m3 += x * x * x;
      m4 += x * x * x * x;
    }
    m1 /= n;
    m2 /= n;
    m3 /= n;
    m4 /= n;
    // Raw moments of N(0, 1): 0, 1, 0, 3; SEs √(Var(Z^k)/n) with Var Z = 1, Var Z² = 2,
    // Var Z³ = 15, Var Z⁴ = 96 (E Z^(2k) = (2k − 1)!!, common practice, no source).
    expect(Math.abs(m1)).toBeLessThan(5 * Math.sqrt(1 / n));
    expect(Math.abs(m2 - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(m3)).toBeLessThan(5 * Math.sqrt(15 / n));
    expect(Math.abs(m4 - 3)).toBeLessThan(5 * Math.sqrt(96 / n));
  });

  it('reaches the tails beyond the ziggurat’s base layer at the normal rate', () => {
    // P(|Z| > r) with r = 3.442619855899 (Marsaglia & Tsang 2000): the tail branch; jstat's CDF;
    // binomial SE √(p(1 − p)/n).
    const r = 3.442619855899;
    const p = 2 * (1 - jStat.normal.cdf(r, 0, 1));
    const count = Array.from(draws).filter((x) => Math.abs(x) > r).length;
    expect(Math.abs(count / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
  });
});
