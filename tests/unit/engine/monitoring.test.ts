import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { simulate } from '@shared/engine/simulate';
import { evaluateProbe } from '@shared/engine/probes';
import { makePlan } from './plans';

/**
 * X_t = μt + σW_t, level a > 0 above the start. The first-passage law of drifted Brownian motion
 * (Karatzas & Shreve 1991, §3.5.C; Borodin & Salminen 2002, 1.1.4):
 *   P(τ_a ≤ T) = Φ((μT − a)/(σ√T)) + exp(2μa/σ²) Φ((−a − μT)/(σ√T)).
 * Euler–Maruyama is exact at the steps here, so the only error of a discretely monitored crossing
 * is the monitoring: it misses crossings between steps. Broadie, Glasserman & Kou (1997, Math.
 * Finance 7(4)) shift the level toward the start by β σ √h, β = −ζ(1/2)/√(2π) ≈ 0.5826, with an
 * error o(√h). Values our own.
 */
const mu = 0.3;
const sigma = 0.8;
const level = 1;
const horizon = 2;
const steps = 40; // h = 0.05: a coarse monitoring grid, so the bias is large
const paths = 20_000;

function crossingProbability(t: number): number {
  const phi = (x: number) => jStat.normal.cdf(x, 0, 1);
  const s = sigma * Math.sqrt(t);
  return (
    phi((mu * t - level) / s) + Math.exp((2 * mu * level) / (sigma * sigma)) * phi((-level - mu * t) / s)
  );
}

const plan = (correction: 'none' | 'bgk') =>
  makePlan({
    drift: [`${mu}`],
    diffusion: [[`${sigma}`]],
    initial: [0],
    t1: horizon,
    steps,
    paths,
    watches: [{ state: 0, level, direction: 'above', correction }],
  });

describe('discrete monitoring and the continuity correction', () => {
  it('is biased low when monitored at the steps only, and says so', () => {
    const result = simulate(plan('none'));
    const estimate = evaluateProbe(result, { quantity: 'hit-before', state: 0, level });
    const exact = crossingProbability(horizon);
    expect(exact - estimate.estimate).toBeGreaterThan(5 * estimate.standardError);
    expect(estimate.monitoring).toMatch(/discrete/);
  });

  it('matches the continuous first-passage law within Monte Carlo error once corrected', () => {
    const result = simulate(plan('bgk'));
    for (const t of [horizon / 2, horizon]) {
      const estimate = evaluateProbe(result, {
        quantity: 'hit-before',
        state: 0,
        level,
        time: t,
        monitoring: 'bgk',
      });
      // Tolerance: 5 standard errors (the correction's remaining o(√h) error is well below one here).
      expect(Math.abs(estimate.estimate - crossingProbability(t))).toBeLessThan(5 * estimate.standardError);
      expect(estimate.monitoring).toMatch(/Broadie–Glasserman–Kou/);
    }
  });

  it('refuses the correction where σ at the level is not known', () => {
    const stateDependent = makePlan({
      drift: ['0'],
      diffusion: [['0.5 * s0 * Math.sin(t)']],
      initial: [1],
      t1: 1,
      steps: 10,
      paths: 10,
      watches: [{ state: 0, level: 2, direction: 'above', correction: 'bgk' }],
    });
    expect(() => simulate(stateDependent)).toThrow(/σ at the level/);
  });
});
