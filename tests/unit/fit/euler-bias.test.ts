import { describe, expect, it } from 'vitest';
import { fitModel } from '@shared/fit/fit-model';
import { evenTimes, generator, ouProblem, ouSeries } from './fixtures';

/**
 * On coarsely sampled OU data the Euler pseudo-likelihood is a regression of X_{k+1} − X_k on X_k
 * whose slope estimates e^{−κΔ} − 1, so it reports (1 − e^{−κΔ})/Δ in place of κ: smaller than κ
 * (the discretisation bias of Lo 1988, Econometric Theory 4, 231–247; the algebra is elementary). Pedersen's simulated likelihood with
 * sub-steps (Pedersen 1995; Durham & Gallant 2002, who show the same bias shrinking with M)
 * brings the estimate back towards the exact MLE on the same data.
 */
describe('the Euler pseudo-likelihood over long intervals', () => {
  const dt = 0.5;
  const n = 300;
  const values = ouSeries(generator(303), { kappa: 1.2, mu: 0, sigma: 0.5 }, n, dt, 0.5);
  const data = [{ times: evenTimes(n, dt), values }];
  const kappaOf = (fit: ReturnType<typeof fitModel>) => fit.estimates[0]!.estimate;
  const exact = fitModel(ouProblem(data, 'exact'));
  const euler = fitModel(ouProblem(data, 'euler'));

  it('underestimates the rate κ against the exact MLE, by about the known amount, and warns', () => {
    expect(kappaOf(euler)).toBeLessThan(kappaOf(exact));
    // (1 − e^{−κ̂Δ})/Δ at the exact κ̂: Euler's estimate is this map of it (Lo 1988), up to the
    // optimiser's tolerance.
    expect(kappaOf(euler)).toBeCloseTo(-Math.expm1(-kappaOf(exact) * dt) / dt, 4);
    expect(euler.warnings.join(' ')).toMatch(/long against the model's time scale/);
  });

  it('is corrected towards the exact MLE by the simulated likelihood with sub-steps', () => {
    const simulated = fitModel(ouProblem(data, 'simulated', undefined, { subSteps: 8, draws: 24, seed: 5 }));
    const eulerGap = Math.abs(kappaOf(euler) - kappaOf(exact));
    const simulatedGap = Math.abs(kappaOf(simulated) - kappaOf(exact));
    // With M = 8 sub-steps the Euler bias falls roughly eightfold (O(Δ/M)); ask for a third of it.
    expect(simulatedGap).toBeLessThan(eulerGap / 3);
  });

  it('equals the Euler pseudo-likelihood with a single sub-step', () => {
    const one = fitModel(ouProblem(data, 'simulated', undefined, { subSteps: 1, draws: 2 }));
    expect(kappaOf(one)).toBeCloseTo(kappaOf(euler), 8);
  });
});
