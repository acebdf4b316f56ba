/**
 * Sample statistics used by the merge and the probes. Pure functions over typed arrays.
 */

/**
 * Quantile of SORTED finite values by Hyndman & Fan (1996) type 7 (linear interpolation between
 * order statistics; the default of most statistics packages): with h = (n − 1)p,
 * Q(p) = x_(⌊h⌋+1) + (h − ⌊h⌋)(x_(⌊h⌋+2) − x_(⌊h⌋+1)) in 1-based order statistics.
 */
export function quantileSorted(sorted: ArrayLike<number>, count: number, probability: number): number {
  if (count === 0) return NaN;
  const position = (count - 1) * probability;
  const below = Math.floor(position);
  const above = Math.min(count - 1, below + 1);
  const lower = sorted[below]!;
  return lower + (position - below) * (sorted[above]! - lower);
}

/** Copies the finite values of `values` into `scratch`, sorts them ascending, returns how many. */
export function sortFinite(values: ArrayLike<number>, scratch: Float64Array): number {
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i]!;
    if (value - value === 0) scratch[count++] = value;
  }
  scratch.subarray(0, count).sort();
  return count;
}

export interface Moments {
  count: number;
  mean: number;
  /** Unbiased (n − 1); NaN when count < 2. */
  variance: number;
  /** Central fourth moment (divisor n), for the standard error of the variance. */
  fourthCentral: number;
}

/** Mean, unbiased variance and fourth central moment of the finite values (two passes, stable). */
export function moments(values: ArrayLike<number>): Moments {
  let count = 0;
  let sum = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i]!;
    if (value - value === 0) {
      sum += value;
      count++;
    }
  }
  if (count === 0) return { count, mean: NaN, variance: NaN, fourthCentral: NaN };
  const mean = sum / count;
  let squares = 0;
  let fourth = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i]!;
    if (value - value === 0) {
      const deviation = value - mean;
      const square = deviation * deviation;
      squares += square;
      fourth += square * square;
      compensation += deviation;
    }
  }
  // Corrected two-pass formula (Chan, Golub & LeVeque 1983): subtract the rounding residue.
  const variance = count < 2 ? NaN : (squares - (compensation * compensation) / count) / (count - 1);
  return { count, mean, variance, fourthCentral: fourth / count };
}

/**
 * Rearranges values[lo..hi] so that values[k] holds the k-th smallest of them, everything before
 * it is ≤ and everything after it is ≥ (Hoare's FIND, 1961, with a median-of-three pivot).
 * Expected linear time; no allocation.
 */
export function selectInPlace(values: Float64Array, lo: number, hi: number, k: number): void {
  let left = lo;
  let right = hi;
  while (right > left) {
    const middle = (left + right) >>> 1;
    // Median of three as pivot, which also guards sorted input.
    let a = values[left]!;
    let b = values[middle]!;
    let c = values[right]!;
    if (a > b) [a, b] = [b, a];
    if (b > c) [b, c] = [c, b];
    if (a > b) [a, b] = [b, a];
    const pivot = b;
    let i = left;
    let j = right;
    while (i <= j) {
      while (values[i]! < pivot) i++;
      while (values[j]! > pivot) j--;
      if (i <= j) {
        const swap = values[i]!;
        values[i] = values[j]!;
        values[j] = swap;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return;
  }
}

/**
 * Type-7 quantiles (see quantileSorted) of the first `count` entries of `values`, which must be
 * finite, without a full sort: selects the needed order statistics in increasing order, each
 * search confined to the part not yet fixed. Reorders `values`. `probabilities` ascending.
 */
export function quantilesInPlace(
  values: Float64Array,
  count: number,
  probabilities: readonly number[],
  out: Float64Array,
): void {
  if (count === 0) {
    out.fill(NaN, 0, probabilities.length);
    return;
  }
  let fixed = 0;
  const select = (rank: number): number => {
    if (rank >= fixed) {
      selectInPlace(values, fixed, count - 1, rank);
      fixed = rank;
    }
    return values[rank]!;
  };
  probabilities.forEach((probability, index) => {
    const position = (count - 1) * probability;
    const below = Math.floor(position);
    const lower = select(below);
    // After selecting `below`, the next order statistic is the minimum of what lies above it.
    let upper = lower;
    if (below + 1 < count && position > below) {
      upper = Infinity;
      for (let i = below + 1; i < count; i++) if (values[i]! < upper) upper = values[i]!;
    }
    out[index] = lower + (position - below) * (upper - lower);
  });
}
