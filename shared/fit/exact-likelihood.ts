import { Matrix } from 'ml-matrix';
import {
  HALF_LOG_2PI,
  choleskyLogDet,
  halfMahalanobis,
  noiseCovariance,
  type CompiledFitModel,
} from './compile';
import type { Likelihood } from './likelihood';
import { matrixExponential } from './matrix-exponential';
import type { ExactForm } from './problem';
import type { Transitions } from './transitions';

/**
 * Exact log-likelihood where the transition density is known in closed form.
 *
 * Linear system with constant coefficients, dX = (b + A X) dt + G dW with noise correlation R:
 * X(t+Δ) | X(t) = x ~ N(e^{AΔ} x + ∫₀^Δ e^{As} ds b, V(Δ)), V(Δ) = ∫₀^Δ e^{As} Q e^{Aᵀs} ds,
 * Q = G R Gᵀ. One state (Ornstein–Uhlenbeck): e^{aΔ} x + b (e^{aΔ} − 1)/a and
 * q (e^{2aΔ} − 1)/(2a). Several states: both integrals from block matrix exponentials
 * (Van Loan 1978, IEEE Trans. Automatic Control 23, 395–404), once per distinct interval.
 *
 * Geometric Brownian motion, dX = a X dt + X Σ_j g_j dW_j with σ² = g R gᵀ:
 * log X(t+Δ) | X(t) = x ~ N(log x + (a − σ²/2) Δ, σ² Δ), and the density of X carries the
 * Jacobian 1/X(t+Δ) (lognormal).
 *
 * The coefficients are read off the compiled model at the origin and the unit vectors, which is
 * exact because recognise.ts has checked the form from the expression trees.
 */
export function exactLikelihood(
  form: ExactForm,
  model: CompiledFitModel,
  correlation: number[][] | null,
  transitions: Transitions,
): Likelihood {
  return form === 'gbm'
    ? gbmLikelihood(model, correlation, transitions)
    : linearLikelihood(model, correlation, transitions);
}

interface LinearCoefficients {
  b: Float64Array;
  /** d × d, row-major: A[i][j] = ∂f_i/∂x_j. */
  a: Float64Array;
  /** Q = G R Gᵀ. */
  q: Float64Array;
}

function linearCoefficients(
  model: CompiledFitModel,
  correlation: number[][] | null,
  pv: Float64Array,
): LinearCoefficients {
  const { d, m } = model;
  const s = new Float64Array(d);
  const b = new Float64Array(d);
  const f = new Float64Array(d);
  const g = new Float64Array(d * m);
  const a = new Float64Array(d * d);
  const q = new Float64Array(d * d);
  model.coefficients(pv, 0, s, b, g);
  noiseCovariance(g, d, m, correlation, q);
  for (let j = 0; j < d; j++) {
    s.fill(0);
    s[j] = 1;
    model.coefficients(pv, 0, s, f, g);
    for (let i = 0; i < d; i++) a[i * d + j] = f[i]! - b[i]!;
  }
  return { b, a, q };
}

interface IntervalTransition {
  /** e^{AΔ}, row-major. */
  f: Float64Array;
  c: Float64Array;
  l: Float64Array;
  logDet: number;
}

function intervalTransition(co: LinearCoefficients, d: number, h: number): IntervalTransition {
  const rows = (flat: Float64Array) =>
    Array.from({ length: d }, (_, i) => Array.from(flat.subarray(i * d, (i + 1) * d)));
  const a = new Matrix(rows(co.a));
  const q = new Matrix(rows(co.q));
  // Mean: exp([[A, b], [0, 0]] Δ) = [[e^{AΔ}, ∫e^{As}ds b], [0, 1]].
  const meanBlock = Matrix.zeros(d + 1, d + 1);
  meanBlock.setSubMatrix(a.clone().mul(h), 0, 0);
  for (let i = 0; i < d; i++) meanBlock.set(i, d, co.b[i]! * h);
  const meanExp = matrixExponential(meanBlock);
  // Covariance: exp([[−A, Q], [0, Aᵀ]] Δ) = [[·, E12], [0, E22]], V = E22ᵀ E12 (Van Loan 1978).
  const covBlock = Matrix.zeros(2 * d, 2 * d);
  covBlock.setSubMatrix(a.clone().mul(-h), 0, 0);
  covBlock.setSubMatrix(q.clone().mul(h), 0, d);
  covBlock.setSubMatrix(a.transpose().mul(h), d, d);
  const covExp = matrixExponential(covBlock);
  const e12 = covExp.subMatrix(0, d - 1, d, 2 * d - 1);
  const e22 = covExp.subMatrix(d, 2 * d - 1, d, 2 * d - 1);
  const v = e22.transpose().mmul(e12);
  const f = new Float64Array(d * d);
  const c = new Float64Array(d);
  const cov = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    c[i] = meanExp.get(i, d);
    for (let j = 0; j < d; j++) {
      f[i * d + j] = meanExp.get(i, j);
      cov[i * d + j] = 0.5 * (v.get(i, j) + v.get(j, i));
    }
  }
  const l = new Float64Array(d * d);
  return { f, c, l, logDet: choleskyLogDet(cov, d, l) };
}

/** Mean factor e^{aΔ}, intercept b(e^{aΔ} − 1)/a and variance q(e^{2aΔ} − 1)/(2a), with their a → 0 limits. */
function scalarTransition(a: number, b: number, q: number, h: number): [number, number, number] {
  if (a === 0) return [1, b * h, q * h];
  return [Math.exp(a * h), (b * Math.expm1(a * h)) / a, (q * Math.expm1(2 * a * h)) / (2 * a)];
}

function linearLikelihood(
  model: CompiledFitModel,
  correlation: number[][] | null,
  transitions: Transitions,
): Likelihood {
  const { d } = model;
  const pv = new Float64Array(model.parameterCount);
  const r = new Float64Array(d);
  const work = new Float64Array(d);
  const { count, dt, x0, x1 } = transitions;

  /** Calls `visit(k, logDet, l)` with the innovation of transition k in r. */
  const eachInnovation = (
    theta: Float64Array,
    visit: (k: number, logDet: number, l: Float64Array) => boolean,
  ): void => {
    model.parameters(theta, pv);
    const co = linearCoefficients(model, correlation, pv);
    const l1 = new Float64Array(1);
    const cache = new Map<number, IntervalTransition>();
    // One state: the transition of the previous interval is kept, since intervals usually repeat.
    let lastH = Number.NaN;
    let f = 0;
    let c = 0;
    let v = 0;
    for (let k = 0; k < count; k++) {
      const h = dt[k]!;
      if (d === 1) {
        if (h !== lastH) {
          [f, c, v] = scalarTransition(co.a[0]!, co.b[0]!, co.q[0]!, h);
          lastH = h;
        }
        r[0] = x1[k]! - f * x0[k]! - c;
        l1[0] = Math.sqrt(v);
        if (!visit(k, v > 0 ? Math.log(v) : Number.NaN, l1)) return;
        continue;
      }
      let tr = cache.get(h);
      if (!tr) {
        tr = intervalTransition(co, d, h);
        cache.set(h, tr);
      }
      for (let i = 0; i < d; i++) {
        let mean = tr.c[i]!;
        for (let j = 0; j < d; j++) mean += tr.f[i * d + j]! * x0[k * d + j]!;
        r[i] = x1[k * d + i]! - mean;
      }
      if (!visit(k, tr.logDet, tr.l)) return;
    }
  };

  /** The one-state case as a plain loop (the numbers of eachInnovation, without its calls). */
  const scalarLogLikelihood = (theta: Float64Array): number => {
    model.parameters(theta, pv);
    const co = linearCoefficients(model, correlation, pv);
    let lastH = Number.NaN;
    let f = 0;
    let c = 0;
    let v = 0;
    let constant = 0;
    let sum = 0;
    for (let k = 0; k < count; k++) {
      const h = dt[k]!;
      if (h !== lastH) {
        [f, c, v] = scalarTransition(co.a[0]!, co.b[0]!, co.q[0]!, h);
        if (!(v > 0)) return -Infinity;
        constant = HALF_LOG_2PI + 0.5 * Math.log(v);
        lastH = h;
      }
      const e = x1[k]! - f * x0[k]! - c;
      sum -= constant + (0.5 * e * e) / v;
    }
    return Number.isNaN(sum) ? -Infinity : sum;
  };

  return {
    residualBasis: 'the exact Gaussian transition',
    logLikelihood(theta) {
      if (d === 1) return scalarLogLikelihood(theta);
      let sum = 0;
      eachInnovation(theta, (_k, logDet, l) => {
        if (Number.isNaN(logDet)) {
          sum = -Infinity;
          return false;
        }
        sum -= d * HALF_LOG_2PI + 0.5 * logDet + halfMahalanobis(l, d, r, work);
        return true;
      });
      return Number.isNaN(sum) ? -Infinity : sum;
    },
    residuals(theta) {
      const out = new Float64Array(count * d).fill(Number.NaN);
      eachInnovation(theta, (k, logDet, l) => {
        if (!Number.isNaN(logDet)) {
          halfMahalanobis(l, d, r, work);
          out.set(work, k * d);
        }
        return true;
      });
      return out;
    },
  };
}

function gbmLikelihood(
  model: CompiledFitModel,
  correlation: number[][] | null,
  transitions: Transitions,
): Likelihood {
  const { count, dt, x0, x1 } = transitions;
  for (let k = 0; k < count; k++)
    if (!(x0[k]! > 0 && x1[k]! > 0))
      throw new RangeError(
        'geometric Brownian motion needs positive observations; a value is zero or negative, so pick the Euler pseudo-likelihood',
      );
  const pv = new Float64Array(model.parameterCount);
  const { m } = model;
  const one = Float64Array.of(1);
  const f = new Float64Array(1);
  const g = new Float64Array(m);
  const cov = new Float64Array(1);
  const rateAndVariance = (theta: Float64Array): [number, number] => {
    model.parameters(theta, pv);
    model.coefficients(pv, 0, one, f, g);
    noiseCovariance(g, 1, m, correlation, cov);
    return [f[0]!, cov[0]!];
  };
  const innovation = (k: number, a: number, v: number) =>
    Math.log(x1[k]!) - Math.log(x0[k]!) - (a - v / 2) * dt[k]!;
  return {
    residualBasis: 'the exact lognormal transition',
    logLikelihood(theta) {
      const [a, v] = rateAndVariance(theta);
      if (!(v > 0)) return -Infinity;
      let sum = 0;
      for (let k = 0; k < count; k++) {
        const variance = v * dt[k]!;
        const e = innovation(k, a, v);
        sum -= HALF_LOG_2PI + 0.5 * Math.log(variance) + (0.5 * e * e) / variance + Math.log(x1[k]!);
      }
      return Number.isNaN(sum) ? -Infinity : sum;
    },
    residuals(theta) {
      const [a, v] = rateAndVariance(theta);
      return Float64Array.from({ length: count }, (_, k) => innovation(k, a, v) / Math.sqrt(v * dt[k]!));
    },
  };
}
