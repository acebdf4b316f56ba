import type { ProbeEstimate, ProbeRequest, SimulationResult } from './result';
import { hits, valuesAt } from './probes';

/**
 * Differences of a probe between two runs that share their random streams (common random
 * numbers: same seed, path p drawn from the same stream in both), with the standard error of the
 * difference from the pairs, and the one independent runs would have had, both from the same paths.
 *
 * Each estimate is written as a mean over paths of an influence value ψ_p (its first-order
 * expansion, e.g. Serfling 1980, "Approximation Theorems of Mathematical Statistics", §6.5):
 * the difference of two estimates is then ≈ the mean of ψᵃ_p − ψᵇ_p, whose standard error is
 * sd(ψᵃ − ψᵇ)/√n; for independent runs it would be √(var ψᵃ/n + var ψᵇ/n).
 */

/**
 * Per path, the influence value of the probe's estimate (NaN for a path the estimate leaves
 * out), or null for a quantity without one here (a quantile of first-passage times).
 */
export function influenceValues(
  result: SimulationResult,
  request: ProbeRequest,
  estimate: ProbeEstimate,
): Float64Array | null {
  const n = result.paths;
  const out = new Float64Array(n).fill(NaN);
  switch (request.quantity) {
    case 'mean':
      out.set(valuesAt(result, request.state, request.time).values);
      return out;
    case 'variance': {
      const { values } = valuesAt(result, request.state, request.time);
      const { mean, count } = finiteMean(values);
      // (x − x̄)² · n/(n − 1): its mean is the unbiased variance.
      for (let p = 0; p < n; p++) out[p] = ((values[p]! - mean) ** 2 * count) / (count - 1);
      return out;
    }
    case 'quantile': {
      // ψ = q + (p − 1{x ≤ q})/f(q), with 1/f(q) read off the probe's own standard error
      // (SE = √(p(1 − p)/n)/f(q) for a sample quantile; Serfling 1980, §2.3.3).
      const probability = request.probability ?? 0.5;
      const { values } = valuesAt(result, request.state, request.time);
      const scale =
        (estimate.standardError * Math.sqrt(estimate.paths)) / Math.sqrt(probability * (1 - probability));
      for (let p = 0; p < n; p++) {
        const x = values[p]!;
        if (x - x === 0)
          out[p] = estimate.estimate + (probability - (x <= estimate.estimate ? 1 : 0)) * scale;
      }
      return out;
    }
    case 'exceedance':
    case 'subceedance': {
      const level = request.level ?? NaN;
      const { values } = valuesAt(result, request.state, request.time);
      for (let p = 0; p < n; p++) {
        const x = values[p]!;
        if (x - x === 0) out[p] = (request.quantity === 'exceedance' ? x >= level : x <= level) ? 1 : 0;
      }
      return out;
    }
    case 'hit-before': {
      const { hit, live } = hits(result, request, request.level ?? NaN, request.direction ?? 'above');
      for (let p = 0; p < n; p++) if (live[p] === 1) out[p] = hit[p]!;
      return out;
    }
    case 'extinction':
      return extinctionIndicators(result, request, out);
    case 'covariance':
    case 'correlation':
      return pairInfluence(result, request, estimate, out);
    case 'first-passage':
      return request.probability === undefined ? passageMeanInfluence(result, request, out) : null;
  }
}

function finiteMean(values: ArrayLike<number>): { mean: number; count: number } {
  let sum = 0;
  let count = 0;
  for (let p = 0; p < values.length; p++) {
    const x = values[p]!;
    if (x - x !== 0) continue;
    sum += x;
    count++;
  }
  return { mean: sum / count, count };
}

/** The same rule as the extinction probe (probes.ts): absorbed, or at or below the level, by the time. */
function extinctionIndicators(
  result: SimulationResult,
  request: ProbeRequest,
  out: Float64Array,
): Float64Array {
  const time = request.time ?? result.t1;
  const fromLevel = request.level === undefined ? null : hits(result, request, request.level, 'below');
  const absorbed = result.absorptionTime[request.state]!;
  for (let p = 0; p < result.paths; p++) {
    if (result.blowupTime[p] === result.blowupTime[p]) continue;
    const extinct = absorbed[p]! <= time + result.h / 2 || (fromLevel !== null && fromLevel.hit[p] === 1);
    out[p] = extinct ? 1 : 0;
  }
  return out;
}

/**
 * Covariance: (x − x̄)(y − ȳ) · n/(n − 1). Correlation: r + z_x z_y − r(z_x² + z_y²)/2, the
 * influence function of Pearson's r (Devlin, Gnanadesikan & Kettenring 1975, Biometrika 62).
 */
function pairInfluence(
  result: SimulationResult,
  request: ProbeRequest,
  estimate: ProbeEstimate,
  out: Float64Array,
): Float64Array {
  const xs = valuesAt(result, request.state, request.time).values;
  const ys = valuesAt(result, request.stateY ?? request.state, request.time).values;
  let sx = 0;
  let sy = 0;
  let count = 0;
  for (let p = 0; p < xs.length; p++) {
    const x = xs[p]!;
    const y = ys[p]!;
    if (x - x !== 0 || y - y !== 0) continue;
    sx += x;
    sy += y;
    count++;
  }
  const mx = sx / count;
  const my = sy / count;
  let vx = 0;
  let vy = 0;
  for (let p = 0; p < xs.length; p++) {
    const x = xs[p]!;
    const y = ys[p]!;
    if (x - x !== 0 || y - y !== 0) continue;
    vx += (x - mx) ** 2;
    vy += (y - my) ** 2;
  }
  const sdx = Math.sqrt(vx / count);
  const sdy = Math.sqrt(vy / count);
  const r = estimate.estimate;
  for (let p = 0; p < xs.length; p++) {
    const x = xs[p]!;
    const y = ys[p]!;
    if (x - x !== 0 || y - y !== 0) continue;
    if (request.quantity === 'covariance') {
      out[p] = ((x - mx) * (y - my) * count) / (count - 1);
    } else {
      const zx = (x - mx) / sdx;
      const zy = (y - my) / sdy;
      out[p] = r + zx * zy - (r * (zx * zx + zy * zy)) / 2;
    }
  }
  return out;
}

/** Mean first-passage time among paths that reach the level: τ̄ + 1{hit}(τ − τ̄)/P̂(hit), a ratio estimator. */
function passageMeanInfluence(
  result: SimulationResult,
  request: ProbeRequest,
  out: Float64Array,
): Float64Array {
  const direction = request.direction ?? 'above';
  const correction = request.monitoring === 'bgk' ? 'bgk' : 'none';
  const watch = result.watches.findIndex(
    (w) =>
      w.state === request.state &&
      w.level === request.level &&
      w.direction === direction &&
      (w.correction ?? 'none') === correction,
  );
  if (watch < 0) return out;
  const time = request.time ?? result.t1;
  const passages = result.firstPassage[watch]!;
  let live = 0;
  let reached = 0;
  let sum = 0;
  for (let p = 0; p < result.paths; p++) {
    if (result.blowupTime[p] === result.blowupTime[p]) continue;
    live++;
    const tau = passages[p]!;
    if (tau <= time + result.h / 2) {
      reached++;
      sum += tau;
    }
  }
  const mean = sum / reached;
  const share = reached / live;
  for (let p = 0; p < result.paths; p++) {
    if (result.blowupTime[p] === result.blowupTime[p]) continue;
    const tau = passages[p]!;
    out[p] = tau <= time + result.h / 2 ? mean + (tau - mean) / share : mean;
  }
  return out;
}

export interface PairedDifference {
  /** Estimate of a minus estimate of b. */
  estimate: number;
  /** Standard error of the difference from the pairs (common random numbers). */
  pairedSE: number;
  /** What the standard error would be with independent runs, from the same paths. */
  independentSE: number;
  /** Paths counted in both. */
  paths: number;
}

/**
 * Difference a − b of two estimates from influence values of the same paths (NaN: left out of
 * that estimate; only paths counted in both are paired).
 */
export function pairedDifference(
  estimateA: number,
  estimateB: number,
  a: Float64Array,
  b: Float64Array,
): PairedDifference {
  let n = 0;
  let meanA = 0;
  let meanB = 0;
  for (let p = 0; p < a.length; p++) {
    const x = a[p]!;
    const y = b[p]!;
    if (x - x !== 0 || y - y !== 0) continue;
    n++;
    meanA += x;
    meanB += y;
  }
  meanA /= n;
  meanB /= n;
  const meanD = meanA - meanB;
  let varA = 0;
  let varB = 0;
  let varD = 0;
  for (let p = 0; p < a.length; p++) {
    const x = a[p]!;
    const y = b[p]!;
    if (x - x !== 0 || y - y !== 0) continue;
    varA += (x - meanA) ** 2;
    varB += (y - meanB) ** 2;
    varD += (x - y - meanD) ** 2;
  }
  const denominator = Math.max(1, n - 1);
  return {
    estimate: estimateA - estimateB,
    pairedSE: Math.sqrt(varD / denominator / n),
    independentSE: Math.sqrt((varA / denominator + varB / denominator) / n),
    paths: n,
  };
}
