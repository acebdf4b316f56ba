import type { ObservedData } from '@shared/data/observed';
import { streamSeed } from '@shared/engine/random/stream-seed';
import { Xoshiro128 } from '@shared/engine/random/xoshiro128';
import { normalFrom } from '@shared/engine/random/ziggurat';
import { buildFitProblem } from '@shared/fit/build-problem';
import type { FitMethod, FitProblem } from '@shared/fit/problem';
import { sheetDocumentSchema, type FitCell, type SheetDocument } from '@shared/sheet';

/** Seeded series and small sheets for the fit tests (invented numbers). */

export function generator(seed: number, stream = 0): Xoshiro128 {
  const state = new Uint32Array(4);
  streamSeed(seed, stream, state);
  return new Xoshiro128(state);
}

/** Ornstein–Uhlenbeck dX = κ(μ − X)dt + σ dW sampled with its exact Gaussian transition. */
export function ouSeries(
  random: Xoshiro128,
  truth: { kappa: number; mu: number; sigma: number },
  n: number,
  dt: number,
  x0: number,
): number[] {
  const values = [x0];
  const decay = Math.exp(-truth.kappa * dt);
  const sd = truth.sigma * Math.sqrt((1 - decay * decay) / (2 * truth.kappa));
  for (let i = 1; i < n; i++)
    values.push(truth.mu + (values[i - 1]! - truth.mu) * decay + sd * normalFrom(random));
  return values;
}

/** Geometric Brownian motion dX = a X dt + s X dW sampled exactly through its log. */
export function gbmSeries(
  random: Xoshiro128,
  a: number,
  s: number,
  n: number,
  dt: number,
  x0: number,
): number[] {
  const values = [x0];
  for (let i = 1; i < n; i++)
    values.push(values[i - 1]! * Math.exp((a - (s * s) / 2) * dt + s * Math.sqrt(dt) * normalFrom(random)));
  return values;
}

export function observedOf(state: string, series: { times: number[]; values: number[] }[]): ObservedData {
  return {
    datasetId: 'test',
    checksum: 'c'.repeat(64),
    name: 'test data',
    columns: [{ column: state, state, unit: '' }],
    series: series.map((s, i) => ({
      group: series.length > 1 ? `g${i}` : null,
      times: s.times,
      values: { [state]: s.values },
    })),
  };
}

interface SheetSpec {
  params: { name: string; value: number | string; min?: number; max?: number; unit?: string }[];
  drift: string;
  diffusion: string;
  state?: string;
  estimate: string[];
  method: FitMethod;
  fit?: Partial<FitCell>;
}

export function fitSheet(spec: SheetSpec): { doc: SheetDocument; cell: FitCell } {
  const state = spec.state ?? 'X';
  const doc = sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'fit test',
    cells: [
      { id: 'p', kind: 'params', params: spec.params },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: state, initial: '1', drift: spec.drift, diffusion: { W: spec.diffusion } }],
        noises: [{ name: 'W' }],
      },
      {
        id: 'obs',
        kind: 'data',
        dataset: null,
        model: 'm',
        timeColumn: 'time',
        columns: [{ column: state, state, unit: '' }],
      },
      {
        id: 'f',
        kind: 'fit',
        data: 'obs',
        model: 'm',
        parameters: spec.estimate,
        method: spec.method,
        ...spec.fit,
      },
    ],
  });
  const cell = doc.cells.find((c): c is FitCell => c.kind === 'fit')!;
  return { doc, cell };
}

export const OU_PARAMS = (start: { kappa: number; mu: number; sigma: number }) => [
  { name: 'kappa', value: start.kappa, min: 0, max: 50 },
  { name: 'mu', value: start.mu },
  { name: 'sigma', value: start.sigma, min: 0 },
];

/** An OU fit problem over `series`, starting from `start`. */
export function ouProblem(
  series: { times: number[]; values: number[] }[],
  method: FitMethod,
  start = { kappa: 1, mu: 0, sigma: 1 },
  fit: Partial<FitCell> = {},
): FitProblem {
  const { doc, cell } = fitSheet({
    params: OU_PARAMS(start),
    drift: 'kappa * (mu - X)',
    diffusion: 'sigma',
    estimate: ['kappa', 'mu', 'sigma'],
    method,
    fit,
  });
  return buildFitProblem(doc, cell, observedOf('X', series));
}

export const evenTimes = (n: number, dt: number) => Array.from({ length: n }, (_, i) => i * dt);
