import type { SavedStats } from './result';

/** Joint sample moments of two columns over the paths finite in both. */
export interface PairMoments {
  count: number;
  /** Unbiased covariance (divisor n − 1); NaN when count < 2. */
  covariance: number;
  /** Unbiased variances of each column over the same paths. */
  varianceX: number;
  varianceY: number;
  /** Mean of ((x − x̄)(y − ȳ))² (divisor n), for the standard error of the covariance. */
  productSquare: number;
}

/** Two passes with the rounding residue removed, as `moments` (Chan, Golub & LeVeque 1983). */
export function pairMoments(x: ArrayLike<number>, y: ArrayLike<number>): PairMoments {
  let count = 0;
  let sumX = 0;
  let sumY = 0;
  for (let p = 0; p < x.length; p++) {
    const a = x[p]!;
    const b = y[p]!;
    if (a - a === 0 && b - b === 0) {
      sumX += a;
      sumY += b;
      count++;
    }
  }
  if (count < 2) return { count, covariance: NaN, varianceX: NaN, varianceY: NaN, productSquare: NaN };
  const meanX = sumX / count;
  const meanY = sumY / count;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  let cx = 0;
  let cy = 0;
  let product2 = 0;
  for (let p = 0; p < x.length; p++) {
    const a = x[p]!;
    const b = y[p]!;
    if (a - a === 0 && b - b === 0) {
      const dx = a - meanX;
      const dy = b - meanY;
      sxy += dx * dy;
      sxx += dx * dx;
      syy += dy * dy;
      cx += dx;
      cy += dy;
      product2 += dx * dx * dy * dy;
    }
  }
  return {
    count,
    covariance: (sxy - (cx * cy) / count) / (count - 1),
    varianceX: (sxx - (cx * cx) / count) / (count - 1),
    varianceY: (syy - (cy * cy) / count) / (count - 1),
    productSquare: product2 / count,
  };
}

/**
 * The covariance matrix of the states at every saved time, index (k · d + i) · d + j, or null for
 * a model with one state. The diagonal is the saved variance itself (the same numbers); a lost
 * path is NaN in every state, so every entry rests on the same live paths.
 */
export function savedCovariance(
  savedValues: Float64Array[],
  stats: SavedStats[],
  paths: number,
  saveCount: number,
): Float64Array | null {
  const d = savedValues.length;
  if (d < 2) return null;
  const out = new Float64Array(saveCount * d * d);
  for (let k = 0; k < saveCount; k++) {
    for (let i = 0; i < d; i++) {
      out[(k * d + i) * d + i] = stats[i]!.variance[k]!;
      const x = savedValues[i]!.subarray(k * paths, (k + 1) * paths);
      for (let j = i + 1; j < d; j++) {
        const y = savedValues[j]!.subarray(k * paths, (k + 1) * paths);
        const value = pairMoments(x, y).covariance;
        out[(k * d + i) * d + j] = value;
        out[(k * d + j) * d + i] = value;
      }
    }
  }
  return out;
}
