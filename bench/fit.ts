import { buildFitProblem } from '../shared/fit/build-problem';
import { compileFitModel } from '../shared/fit/compile';
import { buildLikelihood, fitModel } from '../shared/fit/fit-model';
import type { FitMethod } from '../shared/fit/problem';
import { transitionsOf } from '../shared/fit/transitions';
import { streamSeed } from '../shared/engine/random/stream-seed';
import { Xoshiro128 } from '../shared/engine/random/xoshiro128';
import { normalFrom } from '../shared/engine/random/ziggurat';
import { sheetDocumentSchema, type FitCell } from '../shared/sheet/index';
import { median } from './median';

/**
 * `npm run bench:fit [-- --rounds N]`: an Ornstein–Uhlenbeck fit to 10,000 observations by the
 * exact likelihood and by the Euler pseudo-likelihood. Per method: the time of one likelihood
 * evaluation through the fit's own path (compiled model, transitions, likelihood) against a plain
 * hand-written loop computing the same number over the same data, their ratio, and the time of
 * the whole fit (search, Hessian, residuals). One JSON line each; medians over rounds.
 */
const N = 10_000;
const DT = 0.1;
const TRUTH = { kappa: 0.9, mu: 1.2, sigma: 0.35 };

function parseRounds(argv: string[]): number {
  const at = argv.indexOf('--rounds');
  if (at < 0) return 3;
  const n = Number(argv[at + 1]);
  if (!Number.isInteger(n) || n < 1) throw new Error(`--rounds needs a positive whole number`);
  return n;
}

function ouData(): { times: number[]; values: number[] } {
  const state = new Uint32Array(4);
  streamSeed(4711, 0, state);
  const random = new Xoshiro128(state);
  const decay = Math.exp(-TRUTH.kappa * DT);
  const sd = TRUTH.sigma * Math.sqrt((1 - decay * decay) / (2 * TRUTH.kappa));
  const values = [TRUTH.mu];
  for (let i = 1; i < N; i++)
    values.push(TRUTH.mu + (values[i - 1]! - TRUTH.mu) * decay + sd * normalFrom(random));
  return { times: values.map((_, i) => i * DT), values };
}

function problemFor(method: FitMethod, data: { times: number[]; values: number[] }) {
  const doc = sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'bench',
    cells: [
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'kappa', value: 0.5, min: 0, max: 20 },
          { name: 'mu', value: 1 },
          { name: 'sigma', value: 0.5, min: 0 },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'X', initial: '1', drift: 'kappa * (mu - X)', diffusion: { W: 'sigma' } }],
        noises: [{ name: 'W' }],
      },
      {
        id: 'd',
        kind: 'data',
        dataset: null,
        model: 'm',
        timeColumn: 't',
        columns: [{ column: 'X', state: 'X', unit: '' }],
      },
      { id: 'f', kind: 'fit', data: 'd', model: 'm', parameters: ['kappa', 'mu', 'sigma'], method },
    ],
  });
  const cell = doc.cells.find((c): c is FitCell => c.kind === 'fit')!;
  const observed = {
    datasetId: 'bench',
    checksum: '0'.repeat(64),
    name: 'bench',
    columns: [{ column: 'X', state: 'X', unit: '' }],
    series: [{ group: null, times: data.times, values: { X: data.values } }],
  };
  return buildFitProblem(doc, cell, observed);
}

/** The same log-likelihood as a plain loop: no compiled model, no general machinery. */
function plainLoop(method: FitMethod, x: Float64Array, dt: Float64Array, theta: Float64Array): number {
  const kappa = theta[0]!;
  const mu = theta[1]!;
  const sigma = theta[2]!;
  let sum = 0;
  for (let k = 0; k < dt.length; k++) {
    const h = dt[k]!;
    let mean: number;
    let variance: number;
    if (method === 'exact') {
      const decay = Math.exp(-kappa * h);
      mean = mu + (x[k]! - mu) * decay;
      variance = (sigma * sigma * -Math.expm1(-2 * kappa * h)) / (2 * kappa);
    } else {
      mean = x[k]! + kappa * (mu - x[k]!) * h;
      variance = sigma * sigma * h;
    }
    const e = x[k + 1]! - mean;
    sum -= 0.5 * Math.log(2 * Math.PI * variance) + (0.5 * e * e) / variance;
  }
  return sum;
}

/** Seconds per call of `work`, repeated until at least 0.3 s have passed. */
function perCall(work: () => number): { seconds: number; value: number } {
  let value = work();
  let calls = 0;
  const started = performance.now();
  while (performance.now() - started < 300) {
    value = work();
    calls++;
  }
  return { seconds: (performance.now() - started) / 1000 / calls, value };
}

const rounds = parseRounds(process.argv.slice(2));
const data = ouData();
const x = Float64Array.from(data.values);
for (const method of ['exact', 'euler'] as const) {
  const problem = problemFor(method, data);
  const model = compileFitModel(problem.model);
  const transitions = transitionsOf(problem.series, 1);
  const likelihood = buildLikelihood(problem, model, transitions);
  const theta = Float64Array.of(0.8, 1.1, 0.4);
  const engine: number[] = [];
  const plain: number[] = [];
  const fits: number[] = [];
  let difference = 0;
  let evaluations = 0;
  for (let r = 0; r < rounds; r++) {
    const ours = perCall(() => likelihood.logLikelihood(theta));
    const loop = perCall(() => plainLoop(method, x, transitions.dt, theta));
    engine.push(ours.seconds);
    plain.push(loop.seconds);
    difference = Math.abs(ours.value - loop.value);
    const started = performance.now();
    evaluations = fitModel(problem).evaluations;
    fits.push((performance.now() - started) / 1000);
  }
  const perEvaluation = median(engine);
  const plainPerEvaluation = median(plain);
  process.stdout.write(
    JSON.stringify({
      case: `fit-ou-${method}`,
      observations: N,
      secondsPerEvaluation: perEvaluation,
      plainLoopSecondsPerEvaluation: plainPerEvaluation,
      ratioToPlainLoop: perEvaluation / plainPerEvaluation,
      sameValueWithin: difference,
      fitSeconds: median(fits),
      fitEvaluations: evaluations,
    }) + '\n',
  );
}
