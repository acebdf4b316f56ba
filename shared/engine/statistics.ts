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
 * Hoare partition of values[left..right] around the median of its first, middle and last entries
 * (Hoare 1961, FIND; Wirth 1976, §2.3.4). Afterwards values[left..j] ≤ pivot ≤ values[i..right]
 * and every entry strictly between j and i equals the pivot. Returns j; i is stored in `crossing[0]`.
 */
function partition(values: Float64Array, left: number, right: number, crossing: Int32Array): number {
  let a = values[left]!;
  let b = values[(left + right) >>> 1]!;
  const c = values[right]!;
  if (a > b) {
    const swap = a;
    a = b;
    b = swap;
  }
  if (b > c) {
    b = c;
  }
  if (a > b) {
    b = a;
  }
  const pivot = b;
  let i = left;
  let j = right;
  while (i <= j) {
    let low = values[i]!;
    while (low < pivot) low = values[++i]!;
    let high = values[j]!;
    while (high > pivot) high = values[--j]!;
    if (i <= j) {
      values[i] = high;
      values[j] = low;
      i++;
      j--;
    }
  }
  crossing[0] = i;
  return j;
}

const crossingScratch = new Int32Array(1);

/**
 * Rearranges values[lo..hi] so that values[k] holds the k-th smallest of them, everything before
 * it is ≤ and everything after it is ≥. Expected linear time.
 */
export function selectInPlace(values: Float64Array, lo: number, hi: number, k: number): void {
  const ranks = Int32Array.of(k);
  selectRanks(values, lo, hi, ranks, 0, 0);
}

/**
 * Puts every rank in ranks[first..last] (ascending, all within [left, right]) in its sorted place:
 * one partition serves all ranks, and only the sides that still hold ranks are searched further
 * (multiple selection; expected cost about n·(2 + log₂ r) comparisons for r ranks).
 */
function selectRanks(
  values: Float64Array,
  left: number,
  right: number,
  ranks: Int32Array,
  first: number,
  last: number,
): void {
  while (first <= last && right > left) {
    const j = partition(values, left, right, crossingScratch);
    const i = crossingScratch[0]!;
    let leftEnd = first;
    while (leftEnd <= last && ranks[leftEnd]! <= j) leftEnd++;
    let rightStart = leftEnd;
    while (rightStart <= last && ranks[rightStart]! < i) rightStart++;
    if (leftEnd > first) selectRanks(values, left, j, ranks, first, leftEnd - 1);
    first = rightStart;
    left = i;
  }
}

/**
 * Type-7 quantiles (see quantileSorted) of the first `count` entries of `values`, which must be
 * finite, without a full sort: places just the order statistics needed (each ⌊h⌋ and ⌊h⌋ + 1) by
 * multiple selection. Reorders `values`.
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
  const wanted = new Set<number>();
  for (const probability of probabilities) {
    const below = Math.floor((count - 1) * probability);
    wanted.add(below);
    wanted.add(Math.min(count - 1, below + 1));
  }
  const ranks = Int32Array.from(wanted).sort();
  selectRanks(values, 0, count - 1, ranks, 0, ranks.length - 1);
  probabilities.forEach((probability, index) => {
    const position = (count - 1) * probability;
    const below = Math.floor(position);
    const lower = values[below]!;
    const upper = values[Math.min(count - 1, below + 1)]!;
    out[index] = lower + (position - below) * (upper - lower);
  });
}
