import { describe, expect, it } from 'vitest';
import { fitModel } from '@shared/fit/fit-model';
import { evenTimes, generator, ouProblem, ouSeries } from './fixtures';

/**
 * Coverage of the 95 % Wald intervals from the observed information (asymptotic normality of the
 * MLE, e.g. Pawitan 2001, In All Likelihood, §9.4): over 200 synthetic OU data sets each true value
 * should fall inside its interval in a share within 3 binomial standard errors of 0.95, i.e.
 * 0.95 ± 3·√(0.95·0.05/200) = 0.95 ± 0.046 (common practice, no source).
 */
describe('the intervals of an exact OU fit', () => {
  it('cover each true value in about 95 % of 200 synthetic data sets', () => {
    const truth = { kappa: 0.8, mu: 1.5, sigma: 0.4 };
    const sets = 200;
    const n = 300;
    const dt = 0.5;
    const covered = { kappa: 0, mu: 0, sigma: 0 };
    for (let s = 0; s < sets; s++) {
      const values = ouSeries(generator(7000 + s), truth, n, dt, truth.mu);
      const fit = fitModel(
        ouProblem([{ times: evenTimes(n, dt), values }], 'exact', { kappa: 1, mu: 1, sigma: 0.5 }),
      );
      for (const estimate of fit.estimates) {
        const [low, high] = estimate.ci;
        const name = estimate.name as keyof typeof truth;
        if (low !== null && high !== null && low <= truth[name] && truth[name] <= high) covered[name]++;
      }
    }
    const se = Math.sqrt((0.95 * 0.05) / sets);
    for (const name of ['kappa', 'mu', 'sigma'] as const)
      expect(
        Math.abs(covered[name] / sets - 0.95),
        `${name} covered ${covered[name]} of ${sets}`,
      ).toBeLessThan(3 * se);
  });
});
