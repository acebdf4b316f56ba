import jStat from 'jstat';

/**
 * How well a simulated band covers what was observed: the share of observed points inside the
 * simulated 5–95 % band at their own times, with a 95 % Clopper–Pearson interval (the exact
 * binomial interval: Clopper & Pearson 1934, Biometrika 26, 404–413; beta quantiles from jstat).
 * A model that describes the data puts about 90 % of points inside. The interval treats the
 * points as independent; points of one series usually are not, so it is too narrow then.
 */

export interface BandCoverage {
  /** Observed points inside the simulated time range (others are not counted). */
  counted: number;
  inside: number;
  /** Points outside [t0, t1] of the simulation, left out. */
  outsideTimeRange: number;
  share: number | null;
  /** 95 % Clopper–Pearson interval of the share; null without points. */
  interval: [number, number] | null;
}

/** Clopper–Pearson interval for k successes in n trials at level 1 − alpha. */
export function clopperPearson(k: number, n: number, alpha = 0.05): [number, number] {
  if (!(n > 0) || k < 0 || k > n) throw new RangeError(`need 0 ≤ k ≤ n and n > 0 (k = ${k}, n = ${n})`);
  const lower = k === 0 ? 0 : jStat.beta.inv(alpha / 2, k, n - k + 1);
  const upper = k === n ? 1 : jStat.beta.inv(1 - alpha / 2, k + 1, n - k);
  return [lower, upper];
}

/** Linear interpolation of a saved statistic at time t (saved times ascending). */
function interpolate(times: ArrayLike<number>, values: ArrayLike<number>, t: number): number {
  let hi = 1;
  while (hi < times.length - 1 && times[hi]! < t) hi += 1;
  const t0 = times[hi - 1]!;
  const t1 = times[hi]!;
  if (t1 === t0) return values[hi]!;
  const w = (t - t0) / (t1 - t0);
  return values[hi - 1]! * (1 - w) + values[hi]! * w;
}

export function bandCoverage(
  band: { times: ArrayLike<number>; low: ArrayLike<number>; high: ArrayLike<number> },
  observed: { times: readonly number[]; values: readonly number[] },
): BandCoverage {
  const first = band.times[0]!;
  const last = band.times[band.times.length - 1]!;
  let counted = 0;
  let inside = 0;
  let outsideTimeRange = 0;
  observed.times.forEach((t, i) => {
    if (!(t >= first && t <= last) || band.times.length < 2) {
      outsideTimeRange += 1;
      return;
    }
    const low = interpolate(band.times, band.low, t);
    const high = interpolate(band.times, band.high, t);
    if (!Number.isFinite(low) || !Number.isFinite(high)) {
      outsideTimeRange += 1;
      return;
    }
    counted += 1;
    const value = observed.values[i]!;
    if (value >= low && value <= high) inside += 1;
  });
  return {
    counted,
    inside,
    outsideTimeRange,
    share: counted > 0 ? inside / counted : null,
    interval: counted > 0 ? clopperPearson(inside, counted) : null,
  };
}
