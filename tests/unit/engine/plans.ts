import type { SimulationPlan } from '@shared/engine/plan';
import type { BoundaryRule } from '@shared/sheet/document';

/** A hand-made plan for tests: sources are plain JavaScript in t, s0…, w0… and Math.*. */
export function makePlan(options: {
  drift: string[];
  diffusion: string[][];
  initial: number[];
  t1: number;
  steps: number;
  paths: number;
  seed?: number;
  method?: SimulationPlan['method'];
  calculus?: 'ito' | 'stratonovich';
  correlation?: number[][] | null;
  exact?: (string | null)[];
  saveCount?: number;
  samplePaths?: number;
  boundaries?: BoundaryRule[];
  blowupBound?: number | null;
  probeTimes?: number[];
  watches?: SimulationPlan['watches'];
}): SimulationPlan {
  const d = options.drift.length;
  const m = options.diffusion[0]?.length ?? 0;
  return {
    model: {
      stateNames: Array.from({ length: d }, (_, i) => `x${i}`),
      noiseNames: Array.from({ length: m }, (_, j) => `w${j}`),
      stateUnits: Array.from({ length: d }, () => ''),
      initial: options.initial,
      params: {},
      calculus: options.calculus ?? 'ito',
      drift: options.drift,
      diffusion: options.diffusion,
      correlation: options.correlation ?? null,
      exact: options.exact ?? Array.from({ length: d }, () => null),
    },
    method: options.method ?? 'euler-maruyama',
    t0: 0,
    t1: options.t1,
    steps: options.steps,
    paths: options.paths,
    seed: options.seed ?? 20240611,
    saveCount: options.saveCount ?? 11,
    samplePaths: options.samplePaths ?? 3,
    boundaries: options.boundaries ?? Array.from({ length: d }, () => ({ rule: 'none' as const })),
    blowupBound: options.blowupBound ?? null,
    probeTimes: options.probeTimes ?? [],
    watches: options.watches ?? [],
  };
}

/** Kolmogorov–Smirnov statistic D = sup |F_n − F| of a sample against a continuous CDF. */
export function ksStatistic(sample: ArrayLike<number>, cdf: (x: number) => number): number {
  const sorted = Float64Array.from(sample).sort();
  const n = sorted.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(sorted[i]!);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}

/** Critical value of D at the 5 % level for large n: 1.36/√n (Kolmogorov–Smirnov table, e.g. Massey 1951). */
export function ksCritical5(n: number): number {
  return 1.36 / Math.sqrt(n);
}
