import { streamSeed } from '../engine/random/stream-seed';
import { Xoshiro128 } from '../engine/random/xoshiro128';
import { normalFrom } from '../engine/random/ziggurat';
import {
  HALF_LOG_2PI,
  choleskyLogDet,
  halfMahalanobis,
  noiseCovariance,
  type CompiledFitModel,
} from './compile';
import { eulerLikelihood } from './euler-likelihood';
import type { Likelihood } from './likelihood';
import type { Transitions } from './transitions';

/** The largest number of stored normal draws (8 bytes each): 32 MB. */
const MAX_SIMULATED_DRAWS = 4_000_000;

/**
 * Simulated likelihood (Pedersen 1995, Scand. J. Statistics 22, 55–71): each observation
 * interval is cut into M sub-steps; the transition density is the average over K simulated paths
 * of the Euler density of the last sub-step, weighted by importance sampling. The paths are drawn
 * from the modified Brownian bridge of Durham & Gallant (2002, J. Business & Economic Statistics
 * 20, 297–316), which aims each sub-step at the next observation:
 *
 *   u_{m+1} = u_m + (x₁ − u_m)/(M − m) + √((M − m − 1)/(M − m) · δ) · L(u_m) Z,   δ = Δ/M,
 *
 * and the weight of a path is Π_m φ(u_{m+1}; u_m + f δ, Σ δ) / Π_{m<M−1} q(u_{m+1} | u_m).
 * The normal draws are fixed for the whole fit (common random numbers), so the estimate is a
 * smooth function of the parameters and the optimiser sees no noise. M = 1 is the Euler
 * pseudo-likelihood. The bias of Euler over long intervals shrinks as M grows (O(1/M)); the
 * log of the average adds a small downward bias that shrinks as K grows.
 */
export function simulatedLikelihood(
  model: CompiledFitModel,
  correlation: number[][] | null,
  transitions: Transitions,
  options: { subSteps: number; draws: number; seed: number },
): Likelihood {
  const { subSteps: steps, draws } = options;
  const euler = eulerLikelihood(model, correlation, transitions);
  if (steps === 1) return euler;
  const { d, m } = model;
  const { count, t0, dt, x0, x1 } = transitions;
  const perTransition = draws * (steps - 1) * d;
  if (count * perTransition > MAX_SIMULATED_DRAWS)
    throw new RangeError(
      `the simulated likelihood would hold ${count * perTransition} normal draws (at most ${MAX_SIMULATED_DRAWS}): use fewer draws or sub-steps, or the Euler pseudo-likelihood`,
    );
  const z = new Float64Array(count * perTransition);
  const seedState = new Uint32Array(4);
  streamSeed(options.seed, 0, seedState);
  const random = new Xoshiro128(seedState);
  for (let i = 0; i < z.length; i++) z[i] = normalFrom(random);

  const pv = new Float64Array(model.parameterCount);
  const u = new Float64Array(d);
  const f = new Float64Array(d);
  const g = new Float64Array(d * m);
  const cov = new Float64Array(d * d);
  const l = new Float64Array(d * d);
  const r = new Float64Array(d);
  const work = new Float64Array(d);
  const logWeights = new Float64Array(draws);

  /** Log of the Euler density of `target` one sub-step δ from u at time t; NaN when Σ is singular. */
  const eulerStep = (t: number, delta: number, target: Float64Array | null, k: number): number => {
    model.coefficients(pv, t, u, f, g);
    noiseCovariance(g, d, m, correlation, cov);
    const logDet = choleskyLogDet(cov, d, l);
    if (Number.isNaN(logDet)) return Number.NaN;
    for (let i = 0; i < d; i++)
      r[i] = (target === null ? x1[k * d + i]! : target[i]!) - u[i]! - f[i]! * delta;
    for (let i = 0; i < d; i++) r[i] = r[i]! / Math.sqrt(delta);
    return -d * HALF_LOG_2PI - 0.5 * (logDet + d * Math.log(delta)) - halfMahalanobis(l, d, r, work);
  };

  const next = new Float64Array(d);
  const transitionLogDensity = (k: number): number => {
    const delta = dt[k]! / steps;
    for (let j = 0; j < draws; j++) {
      for (let i = 0; i < d; i++) u[i] = x0[k * d + i]!;
      let logWeight = 0;
      for (let s = 0; s < steps - 1; s++) {
        const t = t0[k]! + s * delta;
        // The Euler density and the bridge share Σ(u): eulerStep leaves its Cholesky factor in l.
        const remaining = steps - s;
        const shrink = (remaining - 1) / remaining;
        const base = ((k * draws + j) * (steps - 1) + s) * d;
        model.coefficients(pv, t, u, f, g);
        noiseCovariance(g, d, m, correlation, cov);
        const logDet = choleskyLogDet(cov, d, l);
        if (Number.isNaN(logDet)) return Number.NaN;
        const scale = Math.sqrt(shrink * delta);
        let halfZ2 = 0;
        for (let i = 0; i < d; i++) {
          let noise = 0;
          for (let c = 0; c <= i; c++) noise += l[i * d + c]! * z[base + c]!;
          next[i] = u[i]! + (x1[k * d + i]! - u[i]!) / remaining + scale * noise;
          halfZ2 += 0.5 * z[base + i]! * z[base + i]!;
        }
        const logProposal = -d * HALF_LOG_2PI - 0.5 * (logDet + d * Math.log(shrink * delta)) - halfZ2;
        for (let i = 0; i < d; i++) r[i] = (next[i]! - u[i]! - f[i]! * delta) / Math.sqrt(delta);
        const logTarget =
          -d * HALF_LOG_2PI - 0.5 * (logDet + d * Math.log(delta)) - halfMahalanobis(l, d, r, work);
        logWeight += logTarget - logProposal;
        u.set(next);
      }
      const last = eulerStep(t0[k]! + (steps - 1) * delta, delta, null, k);
      if (Number.isNaN(last)) return Number.NaN;
      logWeights[j] = logWeight + last;
    }
    let top = -Infinity;
    for (let j = 0; j < draws; j++) if (logWeights[j]! > top) top = logWeights[j]!;
    if (!Number.isFinite(top)) return top;
    let sum = 0;
    for (let j = 0; j < draws; j++) sum += Math.exp(logWeights[j]! - top);
    return top + Math.log(sum / draws);
  };

  // One state, one noise source: the same numbers as transitionLogDensity without the matrix
  // helpers (the hot loop of this method).
  const halfLogShrink = Array.from(
    { length: steps },
    (_, s) => 0.5 * Math.log((steps - s - 1) / (steps - s)),
  );
  const scalarLogDensity = (k: number): number => {
    const delta = dt[k]! / steps;
    const target = x1[k]!;
    for (let j = 0; j < draws; j++) {
      let position = x0[k]!;
      let logWeight = 0;
      let base = (k * draws + j) * (steps - 1);
      for (let s = 0; s < steps - 1; s++, base++) {
        u[0] = position;
        model.coefficients(pv, t0[k]! + s * delta, u, f, g);
        const variance = g[0]! * g[0]!;
        if (!(variance > 0)) return Number.NaN;
        const remaining = steps - s;
        const draw = z[base]!;
        const next =
          position +
          (target - position) / remaining +
          Math.sqrt(((remaining - 1) / remaining) * delta * variance) * draw;
        const e = next - position - f[0]! * delta;
        logWeight += halfLogShrink[s]! - (0.5 * e * e) / (variance * delta) + 0.5 * draw * draw;
        position = next;
      }
      u[0] = position;
      model.coefficients(pv, t0[k]! + (steps - 1) * delta, u, f, g);
      const variance = g[0]! * g[0]! * delta;
      if (!(variance > 0)) return Number.NaN;
      const e = target - position - f[0]! * delta;
      logWeights[j] = logWeight - HALF_LOG_2PI - 0.5 * Math.log(variance) - (0.5 * e * e) / variance;
    }
    let top = -Infinity;
    for (let j = 0; j < draws; j++) if (logWeights[j]! > top) top = logWeights[j]!;
    if (!Number.isFinite(top)) return top;
    let sum = 0;
    for (let j = 0; j < draws; j++) sum += Math.exp(logWeights[j]! - top);
    return top + Math.log(sum / draws);
  };
  const scalar = d === 1 && m === 1 && correlation === null;

  return {
    residualBasis: 'one Euler step over each observation interval (an approximation for this method)',
    logLikelihood(theta) {
      model.parameters(theta, pv);
      let sum = 0;
      for (let k = 0; k < count; k++) {
        const value = scalar ? scalarLogDensity(k) : transitionLogDensity(k);
        if (Number.isNaN(value)) return -Infinity;
        sum += value;
      }
      return Number.isNaN(sum) ? -Infinity : sum;
    },
    residuals: euler.residuals,
  };
}
