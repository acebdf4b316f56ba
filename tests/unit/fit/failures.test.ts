import { describe, expect, it } from 'vitest';
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
