/** Binning of path values for a histogram drawn as a density (area 1 over the live paths). */
export interface Histogram {
  /** Bin edges, length bins + 1. */
  edges: number[];
  counts: number[];
  /** counts / (n · width): comparable with a probability density. */
  density: number[];
  /** Finite values binned. */
  n: number;
  /** Values left out (NaN, ±∞: blown-up or absorbed-and-stopped paths). */
  excluded: number;
}

/**
 * Bins by the Rice rule, ⌈2·n^{1/3}⌉ (Terrell & Scott 1985), between 10 and 200, unless the
 * chart asks for a number.
 */
export function defaultBinCount(n: number): number {
  return Math.min(200, Math.max(10, Math.ceil(2 * Math.cbrt(n))));
}

export function histogram(values: ArrayLike<number>, bins?: number): Histogram {
  let min = Infinity;
  let max = -Infinity;
  let n = 0;
  for (let i = 0; i < values.length; i += 1) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    n += 1;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const excluded = values.length - n;
  if (n === 0) return { edges: [], counts: [], density: [], n, excluded };
  const count = bins ?? defaultBinCount(n);
  // All values equal (a degenerate law, e.g. t = t0): one bin of unit width around them.
  if (max === min) {
    min -= 0.5;
    max += 0.5;
  }
  const width = (max - min) / count;
  const counts = new Array<number>(count).fill(0);
  for (let i = 0; i < values.length; i += 1) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    const bin = Math.min(count - 1, Math.floor((v - min) / width));
    counts[bin]! += 1;
  }
  const edges = Array.from({ length: count + 1 }, (_, i) => min + i * width);
  return { edges, counts, density: counts.map((c) => c / (n * width)), n, excluded };
}
