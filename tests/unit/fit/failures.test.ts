import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { residualCheck } from '@shared/fit/residual-check';
import { buildFitProblem } from '@shared/fit/build-problem';
import { fitModel } from '@shared/fit/fit-model';
import { evenTimes, fitSheet, generator, observedOf, ouSeries } from './fixtures';

/** A fit that cannot stand says why in plain words and what to change (no published source). */
describe('a fit that fails', () => {
  const values = ouSeries(generator(44), { kappa: 1, mu: 0, sigma: 0.5 }, 80, 0.5, 0);
  const data = observedOf('X', [{ times: evenTimes(80, 0.5), values }]);

  it('says the likelihood cannot be computed when no observed state feels any noise', () => {
    const { doc, cell } = fitSheet({
      params: [
        { name: 'kappa', value: 1, min: 0 },
        { name: 'sigma', value: 0 },
      ],
      drift: '-kappa * X',
      diffusion: 'sigma',
      estimate: ['kappa'],
      method: 'euler',
    });
    const fit = fitModel(buildFitProblem(doc, cell, data));
    expect(fit.ok).toBe(false);
    expect(fit.convergence).toBe('failed: the likelihood cannot be computed at the starting values');
    expect(fit.advice.join(' ')).toMatch(/feels some noise/);
  });

  it('gives no standard errors and suggests fewer parameters when two parameters trade off exactly', () => {
    // Only the product a·b enters the drift, so the likelihood is flat along a·b = constant.
    const { doc, cell } = fitSheet({
      params: [
        { name: 'a', value: 1, min: 0 },
        { name: 'b', value: 1, min: 0 },
        { name: 'sigma', value: 0.5, min: 0 },
      ],
      drift: '-a * b * X',
      diffusion: 'sigma',
      estimate: ['a', 'b', 'sigma'],
      method: 'exact',
    });
    const fit = fitModel(buildFitProblem(doc, cell, data));
    expect(fit.converged).toBe(false);
    expect(fit.warnings.join(' ')).toMatch(/standard errors are not available/);
    expect(fit.advice.join(' ')).toMatch(/estimate fewer parameters/);
    // The product itself is still well determined (exact MLE of κ on these data, about 1).
    const [a, b] = fit.estimates.map((e) => e.estimate);
    expect(a! * b!).toBeGreaterThan(0.5);
    expect(a! * b!).toBeLessThan(2);
  });

  it('refuses too few observations for the parameters, before any search', () => {
    const { doc, cell } = fitSheet({
      params: [
        { name: 'kappa', value: 1, min: 0 },
        { name: 'sigma', value: 0.5, min: 0 },
      ],
      drift: '-kappa * X',
      diffusion: 'sigma',
      estimate: ['kappa', 'sigma'],
      method: 'exact',
    });
    const short = observedOf('X', [{ times: [0, 1, 2], values: [1, 0.5, 0.4] }]);
    expect(() => fitModel(buildFitProblem(doc, cell, short))).toThrow(
      /2 observed transitions are too few to estimate 2 parameters/,
    );
  });
});

describe('the residual check', () => {
  // Kolmogorov–Smirnov against N(0, 1) (Stephens 1970): a sample at the normal's own quantiles
  // fits perfectly; the same sample shifted by half a standard deviation is far off for n = 400.
  const quantiles = Array.from({ length: 400 }, (_, i) => jStat.normal.inv((i + 0.5) / 400, 0, 1));

  it('finds nothing wrong with residuals at the normal quantiles', () => {
    const check = residualCheck(quantiles);
    expect(check.ksStatistic).toBeLessThan(0.002);
    expect(check.ksPValue).toBeGreaterThan(0.99);
    expect(check.qq).toHaveLength(200);
  });

  it('flags residuals shifted by half a standard deviation', () => {
    // D ≈ Φ(0.25) − Φ(−0.25) ≈ 0.197, λ ≈ 3.9: p far below 1e-6.
    const check = residualCheck(quantiles.map((q) => q + 0.5));
    expect(check.ksStatistic).toBeCloseTo(0.197, 2);
    expect(check.ksPValue).toBeLessThan(1e-6);
  });
});
