import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { evaluateProbe, quantileEstimate, wilsonInterval, Z95 } from '@shared/engine/probes';
import { simulate } from '@shared/engine/simulate';
import { makePlan } from './plans';

describe('Wilson interval (Wilson 1927, JASA 22)', () => {
  it('matches a hand calculation from the formula', () => {
    // 37 successes in 120: p̂ = 0.308333, z²/n = 0.0320122, centre = 0.314278, half-width 0.081551,
    // worked by hand from (p̂ + z²/2n)/(1 + z²/n) ± z/(1 + z²/n)·√(p̂(1−p̂)/n + z²/4n²).
    const [lo, hi] = wilsonInterval(37, 120);
    expect(lo).toBeCloseTo(0.232727, 5);
    expect(hi).toBeCloseTo(0.39583, 5);
  });

  it('stays inside [0, 1] and is not degenerate at 0 successes', () => {
    const [lo, hi] = wilsonInterval(0, 50);
    expect(lo).toBe(0);
    // Upper end at p̂ = 0: z²/n / (1 + z²/n) = 3.8415/53.8415 = 0.07135 (same formula).
    expect(hi).toBeCloseTo(0.07135, 4);
    // Exactly 0 and 1 at the ends, not a rounding residue (centre − half-width is 4e-19 at 0 of 800).
    expect(wilsonInterval(0, 800)[0]).toBe(0);
    expect(wilsonInterval(800, 800)[1]).toBe(1);
  });
});

describe('probes on a run', () => {
  // A soil-moisture-like anomaly: OU around 0 with a watched dry level (our values).
  const plan = makePlan({
    drift: ['-1.2 * s0'],
    diffusion: [['0.5']],
    initial: [0.3],
    t1: 2,
    steps: 400,
    paths: 8000,
    saveCount: 21,
    probeTimes: [0.75],
    watches: [{ state: 0, level: -0.4, direction: 'below' }],
  });
  const result = simulate(plan);
  const final = Array.from(result.finalValues[0]!);
  const n = final.length;

  it('gives the mean with SE = s/√n and a normal 95 % interval', () => {
    const estimate = evaluateProbe(result, { quantity: 'mean', state: 0 });
    // Independent check with jstat's sample standard deviation.
    const se = jStat.stdev(final, true) / Math.sqrt(n);
    expect(estimate.estimate).toBeCloseTo(jStat.mean(final), 12);
    expect(estimate.standardError).toBeCloseTo(se, 12);
    expect(estimate.ci[0]).toBeCloseTo(estimate.estimate - Z95 * se, 12);
    expect(estimate.paths).toBe(n);
  });

  it('gives the variance with the fourth-moment standard error', () => {
    const estimate = evaluateProbe(result, { quantity: 'variance', state: 0 });
    // For normal data Var(s²) ≈ 2σ⁴/(n − 1): the two must agree within a few per cent.
    const s2 = jStat.variance(final, true);
    expect(estimate.estimate).toBeCloseTo(s2, 12);
    expect(estimate.standardError / (s2 * Math.sqrt(2 / (n - 1)))).toBeGreaterThan(0.9);
    expect(estimate.standardError / (s2 * Math.sqrt(2 / (n - 1)))).toBeLessThan(1.1);
  });

  it('gives exceedance and subceedance proportions with Wilson intervals', () => {
    const above = evaluateProbe(result, { quantity: 'exceedance', state: 0, level: 0.2 });
    const below = evaluateProbe(result, { quantity: 'subceedance', state: 0, level: 0.2 });
    const count = final.filter((x) => x >= 0.2).length;
    expect(above.estimate).toBe(count / n);
    expect(above.standardError).toBeCloseTo(Math.sqrt((above.estimate * (1 - above.estimate)) / n), 14);
    expect(above.ci).toEqual(wilsonInterval(count, n));
    expect(below.estimate).toBe(final.filter((x) => x <= 0.2).length / n);
    // Euler–Maruyama on this OU model is a Gaussian AR(1) recursion, so X_N is exactly normal with
    // mean 0.3(1 − 1.2h)^N and variance 0.25h(1 − a^N)/(1 − a), a = (1 − 1.2h)² (the discrete
    // counterpart of the closed form in Kloeden & Platen 1992, §4.4). Tolerance: 5 binomial SE.
    const h = 2 / 400;
    const a = (1 - 1.2 * h) ** 2;
    const mean = 0.3 * (1 - 1.2 * h) ** 400;
    const sd = Math.sqrt((0.25 * h * (1 - a ** 400)) / (1 - a));
    const p = 1 - jStat.normal.cdf(0.2, mean, sd);
    expect(Math.abs(above.estimate - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
  });

  it('reads values at a probe time and at a saved time, and refuses other times', () => {
    expect(evaluateProbe(result, { quantity: 'mean', state: 0, time: 0.75 }).paths).toBe(n);
    expect(evaluateProbe(result, { quantity: 'mean', state: 0, time: 1 }).estimate).toBeCloseTo(
      result.stats[0]!.mean[10]!,
      12,
    );
    expect(() => evaluateProbe(result, { quantity: 'mean', state: 0, time: 0.33 })).toThrow(
      /no path values were kept/,
    );
  });

  it('gives a quantile with an order-statistic interval that covers it', () => {
    const estimate = evaluateProbe(result, { quantity: 'quantile', state: 0, probability: 0.9 });
    // jstat's percentile interpolates linearly between order statistics (type 7) as we do.
    expect(estimate.estimate).toBeCloseTo(jStat.percentile(final, 0.9), 12);
    expect(evaluateProbe(result, { quantity: 'quantile', state: 0, probability: 0.95 }).estimate).toBe(
      result.stats[0]!.q95[20],
    );
    expect(estimate.ci[0]).toBeLessThanOrEqual(estimate.estimate);
    expect(estimate.ci[1]).toBeGreaterThanOrEqual(estimate.estimate);
    // Type 7 on 1..5: p = 0.3 → 1 + 0.3·4 = 2.2 (Hyndman & Fan 1996).
    expect(quantileEstimate(Float64Array.from([5, 1, 4, 2, 3]), 0.3).estimate).toBeCloseTo(2.2, 12);
  });

  it('gives P(hit before t) from the watch and from the running minimum, consistently', () => {
    const fromWatch = evaluateProbe(result, {
      quantity: 'hit-before',
      state: 0,
      level: -0.4,
      direction: 'below',
    });
    const fromExtremes = evaluateProbe(result, {
      quantity: 'hit-before',
      state: 0,
      level: -0.4000001,
      direction: 'below',
    });
    expect(Math.abs(fromWatch.estimate - fromExtremes.estimate)).toBeLessThan(2 / n);
    const early = evaluateProbe(result, {
      quantity: 'hit-before',
      state: 0,
      level: -0.4,
      direction: 'below',
      time: 0.5,
    });
    expect(early.estimate).toBeLessThan(fromWatch.estimate);
    expect(() =>
      evaluateProbe(result, { quantity: 'hit-before', state: 0, level: -0.9, direction: 'below', time: 0.5 }),
    ).toThrow(/watched/);
  });

  it('summarises first-passage times among the paths that reach the level', () => {
    const hit = evaluateProbe(result, { quantity: 'hit-before', state: 0, level: -0.4, direction: 'below' });
    const passage = evaluateProbe(result, {
      quantity: 'first-passage',
      state: 0,
      level: -0.4,
      direction: 'below',
    });
    expect(passage.paths).toBe(Math.round(hit.estimate * n));
    expect(passage.estimate).toBeGreaterThan(0);
    expect(passage.estimate).toBeLessThan(2);
    expect(passage.note).toMatch(/reached -0.4/);
    const median = evaluateProbe(result, {
      quantity: 'first-passage',
      state: 0,
      level: -0.4,
      direction: 'below',
      probability: 0.5,
    });
    expect(median.ci[0]).toBeLessThanOrEqual(median.estimate);
  });

  it('needs an absorbing boundary or a level for extinction', () => {
    expect(() => evaluateProbe(result, { quantity: 'extinction', state: 0 })).toThrow(/absorbing boundary/);
    const byLevel = evaluateProbe(result, { quantity: 'extinction', state: 0, level: -0.4 });
    expect(byLevel.estimate).toBe(
      evaluateProbe(result, { quantity: 'hit-before', state: 0, level: -0.4, direction: 'below' }).estimate,
    );
  });
});

describe('extinction and blow-ups in probes', () => {
  it('estimates the extinction probability from absorption records with a Wilson interval', () => {
    // A harvested stock on the log scale hitting a quasi-extinction floor (our values).
    const plan = makePlan({
      drift: ['-0.3'],
      diffusion: [['0.6']],
      initial: [1],
      t1: 3,
      steps: 300,
      paths: 4000,
      boundaries: [{ rule: 'absorb', level: 0, side: 'below' }],
    });
    const result = simulate(plan);
    const estimate = evaluateProbe(result, { quantity: 'extinction', state: 0 });
    expect(estimate.estimate).toBe(result.extinctions[0]!.count / result.paths);
    expect(estimate.ci).toEqual(wilsonInterval(result.extinctions[0]!.count, result.paths));
  });

  it('leaves lost paths out and, beyond 1 % lost, says the estimate is conditional on the survivors', () => {
    const plan = makePlan({
      drift: ['s0 * s0'],
      diffusion: [['0.5']],
      initial: [0.4],
      t1: 2,
      steps: 100,
      paths: 400,
      blowupBound: 100,
    });
    const result = simulate(plan);
    expect(result.blowups.count).toBeGreaterThan(0);
    expect(result.blowups.count).toBeLessThan(400);
    const estimate = evaluateProbe(result, { quantity: 'mean', state: 0 });
    expect(estimate.paths).toBe(400 - result.blowups.count);
    expect(result.blowups.count / 400).toBeGreaterThan(0.01);
    expect(estimate.warnings?.join(' ')).toMatch(/conditional on the \d+ surviving paths/);
  });
});
