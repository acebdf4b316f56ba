import { describe, expect, it } from 'vitest';
import { buildFitProblem } from '@shared/fit/build-problem';
import { fitModel } from '@shared/fit/fit-model';
import { evenTimes, fitSheet, gbmSeries, generator, observedOf, ouProblem, ouSeries } from './fixtures';

/**
 * Closed-form maximum-likelihood estimates the numerical fit must reproduce. For OU sampled at an
 * even interval Δ, X_{k+1} = c + φ X_k + ε_k is a Gaussian AR(1), whose conditional MLE is the
 * least-squares regression (Brockwell & Davis 1991, Time Series: Theory and Methods, §8.7); by
 * invariance κ̂ = −log φ̂ / Δ, μ̂ = ĉ / (1 − φ̂), σ̂² = 2κ̂ s² / (1 − φ̂²) with s² = RSS / n
 * (Tang & Chen 2009, J. Econometrics 149, 65–81, their OU estimators).
 */
function ouClosedForm(values: number[], dt: number) {
  const x = values.slice(0, -1);
  const y = values.slice(1);
  const n = x.length;
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const mx = mean(x);
  const my = mean(y);
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i]! - mx) * (y[i]! - my);
    sxx += (x[i]! - mx) ** 2;
  }
  const phi = sxy / sxx;
  const c = my - phi * mx;
  const rss = x.reduce((s, xi, i) => s + (y[i]! - c - phi * xi) ** 2, 0);
  const s2 = rss / n;
  const kappa = -Math.log(phi) / dt;
  return { kappa, mu: c / (1 - phi), sigma: Math.sqrt((2 * kappa * s2) / (1 - phi * phi)) };
}

describe('the exact likelihood', () => {
  it('reproduces the closed-form AR(1) estimates of an Ornstein–Uhlenbeck series to 1e-6', () => {
    const dt = 0.25;
    const values = ouSeries(generator(101), { kappa: 1.3, mu: 2, sigma: 0.6 }, 800, dt, 3);
    const problem = ouProblem([{ times: evenTimes(800, dt), values }], 'exact');
    const fit = fitModel(problem);
    const expected = ouClosedForm(values, dt);
    expect(fit.converged).toBe(true);
    const [kappa, mu, sigma] = fit.estimates.map((e) => e.estimate);
    // Closed form (Brockwell & Davis §8.7; Tang & Chen 2009), relative 1e-6.
    expect(Math.abs(kappa! / expected.kappa - 1)).toBeLessThan(1e-6);
    expect(Math.abs(mu! / expected.mu - 1)).toBeLessThan(1e-6);
    expect(Math.abs(sigma! / expected.sigma - 1)).toBeLessThan(1e-6);
  });

  it('reproduces the closed-form log-return estimates of geometric Brownian motion', () => {
    const dt = 1 / 52;
    const values = gbmSeries(generator(202), 0.08, 0.25, 600, dt, 100);
    const { doc, cell } = fitSheet({
      params: [
        { name: 'a', value: 0.02 },
        { name: 's', value: 0.4, min: 0 },
      ],
      drift: 'a * S',
      diffusion: 's * S',
      state: 'S',
      estimate: ['a', 's'],
      method: 'exact',
    });
    const problem = buildFitProblem(doc, cell, observedOf('S', [{ times: evenTimes(600, dt), values }]));
    expect(problem.exactForm).toBe('gbm');
    const fit = fitModel(problem);
    // Log-returns r_k are iid N((a − s²/2)Δ, s²Δ): MLE mean and variance (divisor n) of r,
    // then s² = v/Δ and a = m/Δ + s²/2 (e.g. Campbell, Lo & MacKinlay 1997, §9.3.2).
    const r = values.slice(1).map((v, i) => Math.log(v / values[i]!));
    const m = r.reduce((s, v) => s + v, 0) / r.length;
    const v = r.reduce((s, x) => s + (x - m) ** 2, 0) / r.length;
    const s2 = v / dt;
    expect(fit.estimates[1]!.estimate).toBeCloseTo(Math.sqrt(s2), 6);
    expect(fit.estimates[0]!.estimate).toBeCloseTo(m / dt + s2 / 2, 5);
  });

  it('recognises a linear model and refuses the exact likelihood for a nonlinear drift, saying why', () => {
    const { doc, cell } = fitSheet({
      params: [
        { name: 'r', value: 1, min: 0 },
        { name: 'sigma', value: 0.2, min: 0 },
      ],
      drift: 'r * X * (1 - X)',
      diffusion: 'sigma',
      estimate: ['r', 'sigma'],
      method: 'exact',
    });
    expect(() =>
      buildFitProblem(doc, cell, observedOf('X', [{ times: [0, 1, 2], values: [1, 1, 1] }])),
    ).toThrow(/exact likelihood is not available.*not linear in the states/);
  });
});
