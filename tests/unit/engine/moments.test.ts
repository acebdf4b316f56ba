import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { simulate } from '@shared/engine/simulate';
import { ksCritical5, ksStatistic, makePlan } from './plans';

describe('Ornstein–Uhlenbeck with Euler–Maruyama', () => {
  // dX = θ(μ − X) dt + σ dW; our own values.
  const theta = 0.7;
  const level = 1.5;
  const sigma = 0.4;
  const x0 = -0.5;
  const horizon = 2;
  const steps = 400;
  const paths = 20_000;
  const plan = makePlan({
    drift: [`${theta} * (${level} - s0)`],
    diffusion: [[`${sigma}`]],
    initial: [x0],
    t1: horizon,
    steps,
    paths,
    saveCount: 5,
  });
  const result = simulate(plan);
  const last = plan.saveCount - 1;
  const h = horizon / steps;

  it('has the closed-form mean within 5 standard errors plus the Euler bias', () => {
    // Closed form (Kloeden & Platen 1992, §4.4): E X_T = μ + (X0 − μ) e^{−θT}.
    const exact = level + (x0 - level) * Math.exp(-theta * horizon);
    // Euler–Maruyama's own mean is μ + (X0 − μ)(1 − θh)^N exactly (the recursion is linear);
    // its distance from the closed form is the discretisation bias.
    const schemeMean = level + (x0 - level) * (1 - theta * h) ** steps;
    const bias = Math.abs(schemeMean - exact);
    const standardError = Math.sqrt(result.stats[0]!.variance[last]! / paths);
    expect(Math.abs(result.stats[0]!.mean[last]! - exact)).toBeLessThan(5 * standardError + bias);
  });

  it('has the closed-form variance within 5 standard errors plus the Euler bias', () => {
    // Closed form (Kloeden & Platen 1992, §4.4): Var X_T = σ²/(2θ) (1 − e^{−2θT}).
    const exact = ((sigma * sigma) / (2 * theta)) * (1 - Math.exp(-2 * theta * horizon));
    // Euler–Maruyama: Var = σ²h Σ_{k<N} (1 − θh)^{2k}.
    const a = (1 - theta * h) ** 2;
    const schemeVariance = (sigma * sigma * h * (1 - a ** steps)) / (1 - a);
    const bias = Math.abs(schemeVariance - exact);
    // SE of a normal sample's variance: σ²√(2/(n − 1)).
    const standardError = exact * Math.sqrt(2 / (paths - 1));
    expect(Math.abs(result.stats[0]!.variance[last]! - exact)).toBeLessThan(5 * standardError + bias);
  });

  it('saves the even grid and counts every path as live', () => {
    expect(Array.from(result.savedTimes)).toEqual([0, 0.5, 1, 1.5, 2]);
    expect(result.stats[0]!.live[last]).toBe(paths);
    expect(result.stats[0]!.mean[0]).toBe(x0);
    expect(result.blowups).toEqual({ count: 0, firstTime: null, suggestion: null });
  });
});

describe('geometric Brownian motion', () => {
  // dX = aX dt + bX dW, X0 = 1.2, T = 1; our own values (a commodity index drifting up).
  const a = 0.3;
  const b = 0.25;
  const x0 = 1.2;
  const steps = 500;
  const paths = 20_000;
  const h = 1 / steps;
  const plan = makePlan({
    drift: [`${a} * s0`],
    diffusion: [[`${b} * s0`]],
    initial: [x0],
    t1: 1,
    steps,
    paths,
    saveCount: 2,
  });
  const result = simulate(plan);
  const values = result.finalValues[0]!;

  it('has the closed-form mean and variance within 5 standard errors plus the Euler bias', () => {
    // Closed form: E X_T = X0 e^{aT}, Var X_T = X0² e^{2aT}(e^{b²T} − 1) (Kloeden & Platen 1992, §4.4).
    const mean = x0 * Math.exp(a);
    const variance = x0 * x0 * Math.exp(2 * a) * (Math.exp(b * b) - 1);
    // Euler–Maruyama exactly: E = X0(1 + ah)^N, E[X²] = X0²((1 + ah)² + b²h)^N.
    const schemeMean = x0 * (1 + a * h) ** steps;
    const schemeVariance = x0 * x0 * ((1 + a * h) ** 2 + b * b * h) ** steps - schemeMean ** 2;
    const meanSE = Math.sqrt(variance / paths);
    // SE of the sample variance: √((μ₄ − σ⁴(n−3)/(n−1))/n) with the lognormal's μ₄.
    const s2 = Math.exp(b * b);
    const mu4 = x0 ** 4 * Math.exp(4 * a) * (s2 ** 6 - 4 * s2 ** 3 + 6 * s2 - 3);
    const varianceSE = Math.sqrt((mu4 - variance ** 2 * ((paths - 3) / (paths - 1))) / paths);
    expect(Math.abs(result.stats[0]!.mean[1]! - mean)).toBeLessThan(5 * meanSE + Math.abs(schemeMean - mean));
    expect(Math.abs(result.stats[0]!.variance[1]! - variance)).toBeLessThan(
      5 * varianceSE + Math.abs(schemeVariance - variance),
    );
  });

  it('follows the lognormal law (Kolmogorov–Smirnov at 5 %)', () => {
    // ln X_T ~ N(ln X0 + (a − b²/2)T, b²T); jstat's lognormal CDF; critical value 1.36/√n.
    const mu = Math.log(x0) + (a - (b * b) / 2);
    expect(ksStatistic(values, (x) => jStat.lognormal.cdf(x, mu, b))).toBeLessThan(ksCritical5(paths));
  });

  it('has quantiles close to the lognormal ones', () => {
    // Type-7 sample median vs the lognormal median X0·e^{(a − b²/2)T}; SE of a median ≈ 1/(2f(m)√n) (asymptotic law of sample quantiles, Serfling 1980, §2.3).
    const median = x0 * Math.exp(a - (b * b) / 2);
    const density = jStat.lognormal.pdf(median, Math.log(median), b);
    expect(Math.abs(result.stats[0]!.q50[1]! - median)).toBeLessThan(5 / (2 * density * Math.sqrt(paths)));
    expect(result.stats[0]!.q05[1]).toBeLessThan(result.stats[0]!.q25[1]!);
    expect(result.stats[0]!.q75[1]).toBeLessThan(result.stats[0]!.q95[1]!);
  });
});
