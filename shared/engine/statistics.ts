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

/** Below this many values the quantiles are selected directly; above, buckets narrow them first. */
const BUCKETED_FROM = 4096;
const BUCKETS = 2048;
const bucketCounts = new Int32Array(BUCKETS);
const bucketWanted = new Uint8Array(BUCKETS);

/**
 * Type-7 quantiles (see quantileSorted) of the first `count` entries of `values`, which must be
 * finite, without a full sort: places just the order statistics needed (each ⌊h⌋ and ⌊h⌋ + 1) by
 * multiple selection. Uses `values` as scratch (its contents afterwards are unspecified).
 *
 * For many values the selection is narrowed first, with the same result: one pass counts the
 * values in 2,048 equal-width buckets between the minimum and maximum (the bucket index is a
 * non-decreasing function of the value, so every value of a bucket is ≤ every value of a later
 * one), the values of the buckets that hold a wanted rank are moved to the front, and the ranks
 * are selected among those alone. Partitioning is slow in JavaScript for its unpredictable
 * branches; the counting pass has none. A 50,000-value column took about 1.4 ms before.
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
  const places = count >= BUCKETED_FROM ? narrowToBuckets(values, count, ranks) : null;
  if (places === null) selectRanks(values, 0, count - 1, ranks, 0, ranks.length - 1);
  else selectRanks(values, 0, places.kept - 1, places.ranks, 0, ranks.length - 1);
  const valueAt = (rank: number): number =>
    places === null ? values[rank]! : values[places.ranks[ranks.indexOf(rank)]!]!;
  probabilities.forEach((probability, index) => {
    const position = (count - 1) * probability;
    const below = Math.floor(position);
    const lower = valueAt(below);
    const upper = valueAt(Math.min(count - 1, below + 1));
    out[index] = lower + (position - below) * (upper - lower);
  });
}

/**
 * Moves the values of the buckets that hold the ranks to the front of `values` (in their order)
 * and returns how many were kept and where each rank is among them; null when the values have
 * no finite positive spread (all equal, or a spread that overflows), for plain selection.
 */
function narrowToBuckets(
  values: Float64Array,
  count: number,
  ranks: Int32Array,
): { kept: number; ranks: Int32Array } | null {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < count; i++) {
    const value = values[i]!;
    if (value < min) min = value;
    if (value > max) max = value;
  }
  const spread = max - min;
  if (!(spread > 0 && spread < Infinity)) return null;
  const scale = BUCKETS / spread;
  const last = BUCKETS - 1;
  bucketCounts.fill(0);
  for (let i = 0; i < count; i++) bucketCounts[Math.min(last, ((values[i]! - min) * scale) | 0)]!++;
  // The bucket of each rank, then the rank's place among the kept values.
  bucketWanted.fill(0);
  const bucketOf = new Int32Array(ranks.length);
  const withinBucket = new Int32Array(ranks.length);
  let bucket = 0;
  let before = 0;
  ranks.forEach((rank, r) => {
    while (before + bucketCounts[bucket]! <= rank) before += bucketCounts[bucket++]!;
    bucketOf[r] = bucket;
    withinBucket[r] = rank - before;
    bucketWanted[bucket] = 1;
  });
  const keptBefore = new Int32Array(BUCKETS);
  let kept = 0;
  for (let b = 0; b < BUCKETS; b++) {
    keptBefore[b] = kept;
    if (bucketWanted[b] === 1) kept += bucketCounts[b]!;
  }
  let at = 0;
  for (let i = 0; i < count; i++) {
    const value = values[i]!;
    if (bucketWanted[Math.min(last, ((value - min) * scale) | 0)] === 1) values[at++] = value;
  }
  return { kept, ranks: bucketOf.map((b, r) => keptBefore[b]! + withinBucket[r]!) };
}
