import type { FitSeries } from './problem';

/**
 * The observed transitions of all series, flattened into typed arrays once per fit: series are
 * independent, so a transition never joins two series. Transition k goes from x0[k·d …] at time
 * t0[k] to x1[k·d …] after dt[k].
 */
export interface Transitions {
  count: number;
  d: number;
  t0: Float64Array;
  dt: Float64Array;
  x0: Float64Array;
  x1: Float64Array;
}

export function transitionsOf(series: readonly FitSeries[], d: number): Transitions {
  const count = series.reduce((sum, s) => sum + Math.max(0, s.times.length - 1), 0);
  const t0 = new Float64Array(count);
  const dt = new Float64Array(count);
  const x0 = new Float64Array(count * d);
  const x1 = new Float64Array(count * d);
  let k = 0;
  for (const s of series)
    for (let r = 1; r < s.times.length; r++, k++) {
      t0[k] = s.times[r - 1]!;
      dt[k] = s.times[r]! - s.times[r - 1]!;
      for (let i = 0; i < d; i++) {
        x0[k * d + i] = s.values[r - 1]![i]!;
        x1[k * d + i] = s.values[r]![i]!;
      }
    }
  return { count, d, t0, dt, x0, x1 };
}

/** The median interval between observations (the time scale warning reads it). */
export function medianInterval(transitions: Transitions): number {
  if (transitions.count === 0) return Number.NaN;
  const sorted = Float64Array.from(transitions.dt).sort();
  return sorted[Math.floor((sorted.length - 1) / 2)]!;
}
