import {
  HALF_LOG_2PI,
  choleskyLogDet,
  halfMahalanobis,
  noiseCovariance,
  type CompiledFitModel,
} from './compile';
import type { Likelihood } from './likelihood';
import type { Transitions } from './transitions';

/**
 * Euler pseudo-likelihood: each observed transition is taken as one Euler–Maruyama step,
 * X(t+Δ) | X(t) = x ~ N(x + f(t, x) Δ, Σ(t, x) Δ) with Σ = G R Gᵀ. Exact as Δ → 0; over long
 * intervals it biases the estimates (for Ornstein–Uhlenbeck it estimates (1 − e^{−κΔ})/Δ
 * instead of κ, so κ comes out too small). Works for any model.
 */
export function eulerLikelihood(
  model: CompiledFitModel,
  correlation: number[][] | null,
  transitions: Transitions,
): Likelihood {
  const { d, m } = model;
  const pv = new Float64Array(model.parameterCount);
  const s = new Float64Array(d);
  const f = new Float64Array(d);
  const g = new Float64Array(d * m);
  const cov = new Float64Array(d * d);
  const l = new Float64Array(d * d);
  const r = new Float64Array(d);
  const work = new Float64Array(d);
  const { count, t0, dt, x0, x1 } = transitions;

  /** Mean and covariance of transition k into r (innovation) and l (Cholesky); log det or NaN. */
  const innovation = (k: number): number => {
    const h = dt[k]!;
    for (let i = 0; i < d; i++) s[i] = x0[k * d + i]!;
    model.coefficients(pv, t0[k]!, s, f, g);
    noiseCovariance(g, d, m, correlation, cov);
    for (let i = 0; i < d * d; i++) cov[i] = cov[i]! * h;
    for (let i = 0; i < d; i++) r[i] = x1[k * d + i]! - s[i]! - f[i]! * h;
    return choleskyLogDet(cov, d, l);
  };

  return {
    residualBasis: 'one Euler step over each observation interval',
    logLikelihood(theta) {
      model.parameters(theta, pv);
      if (d === 1 && m === 1 && correlation === null) {
        // The common scalar case without the general machinery (same numbers).
        let sum = 0;
        for (let k = 0; k < count; k++) {
          const h = dt[k]!;
          s[0] = x0[k]!;
          model.coefficients(pv, t0[k]!, s, f, g);
          const variance = g[0]! * g[0]! * h;
          const e = x1[k]! - s[0] - f[0]! * h;
          sum -= HALF_LOG_2PI + 0.5 * Math.log(variance) + (0.5 * e * e) / variance;
        }
        return Number.isNaN(sum) ? -Infinity : sum;
      }
      let sum = 0;
      for (let k = 0; k < count; k++) {
        const logDet = innovation(k);
        if (Number.isNaN(logDet)) return -Infinity;
        sum -= d * HALF_LOG_2PI + 0.5 * logDet + halfMahalanobis(l, d, r, work);
      }
      return Number.isNaN(sum) ? -Infinity : sum;
    },
    residuals(theta) {
      model.parameters(theta, pv);
      const out = new Float64Array(count * d);
      for (let k = 0; k < count; k++) {
        if (Number.isNaN(innovation(k))) out.fill(Number.NaN, k * d, (k + 1) * d);
        else {
          halfMahalanobis(l, d, r, work);
          out.set(work, k * d);
        }
      }
      return out;
    },
  };
}
