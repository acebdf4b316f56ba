import { z } from 'zod';
import { methodSchema } from '../cells/simulation';
import { cellIdSchema } from '../cells/fields';
import type { SimulationPlan } from '../engine/plan';
import type { SavedStats, SimulationResult } from '../engine/result';
import type { SheetDocument } from '../sheet/document';
import type { KeptOutput } from './run-sheet';
import { FIT_METHODS, type FitResult } from '../fit/problem';
import { MAX_QQ_POINTS } from '../fit/residual-check';
import type { CellOutput } from './outputs';
import {
  restoredScenarios,
  restoredSweep,
  scenariosSummarySchema,
  summariseScenarios,
  summariseSweep,
  sweepSummarySchema,
} from './version-results-points';

/**
 * The compact summary of a sheet's results saved with a version, so that an old version opens
 * with its numbers and charts ("as saved with version N") without running again: each
 * simulation's saved statistics on at most MAX_TIMES saved times, a few sample paths, its losses,
 * stability and digest; each probe's estimate; each study's orders; each fit's estimates; each
 * sweep's and scenarios cell's result (version-results-points.ts). Tens of kilobytes (18 to 61
 * KiB for the example sheets), not the per-path values: a chart that needs every path's values
 * (a histogram) asks for a run instead, and a restored output is never reused as the input of a
 * new run.
 */

/** Saved times kept per simulation; the first and the last are always among them. */
export const MAX_TIMES = 101;
/** Sample paths kept per state variable. */
export const MAX_PATHS = 10;
/** The summary's JSON size limit, in characters (the server refuses more). */
export const MAX_SUMMARY_CHARS = 600_000;

/** JSON has no NaN or infinity: they travel as null and come back as NaN. */
const value = z.number().nullable();
const series = z.array(value).max(MAX_TIMES);
const stateName = z.string().max(64);

const statsSchema = z.object({
  mean: series,
  variance: series,
  q05: series,
  q25: series,
  q50: series,
  q75: series,
  q95: series,
  min: series,
  max: series,
  live: z.array(z.number().int().min(0)).max(MAX_TIMES),
});

const lossesSchema = z.object({
  count: z.number().int().min(0),
  paths: z.number().int().min(0),
  share: z.number(),
  byCause: z.object({ domain: z.number().int(), infinite: z.number().int(), bound: z.number().int() }),
  firstTime: z.number().nullable(),
  conditional: z.boolean(),
  allLost: z.boolean(),
  message: z.string().max(2000).nullable(),
  advice: z.array(z.string().max(2000)).max(20),
});

const stabilitySchema = z.object({
  check: z.enum(['mean-square', 'linear-drift']),
  scheme: methodSchema,
  lambda: value,
  lambdaImag: value,
  mu: value,
  h: z.number(),
  time: z.number(),
  stable: z.boolean(),
  modelStable: z.boolean(),
  amplification: value,
  maxStableStep: value,
  message: z.string().max(2000),
});

const extinctionSchema = z.object({
  state: z.number().int().min(0),
  count: z.number().int().min(0),
  firstTime: value,
  meanTime: value,
});

const simulationSummarySchema = z.object({
  kind: z.literal('simulation'),
  engineVersion: z.number().int().min(1),
  seconds: z.number().min(0),
  stateNames: z.array(stateName).min(1).max(16),
  method: methodSchema,
  paths: z.number().int().min(0),
  cancelled: z.boolean(),
  steps: z.number().int().min(1),
  h: z.number(),
  t0: z.number(),
  t1: z.number(),
  seed: z.number().int(),
  savedTimes: series.min(1),
  savedSteps: z.array(z.number().int().min(0)).max(MAX_TIMES),
  stats: z.array(statsSchema).max(16),
  /** d × d per kept time, or null for one state. */
  covariance: z
    .array(value)
    .max(MAX_TIMES * 256)
    .nullable(),
  /** Per state, per kept path, the values at the kept times. */
  samplePaths: z.array(z.array(series).max(MAX_PATHS)).max(16),
  losses: lossesSchema,
  extinctions: z.array(extinctionSchema).max(16),
  stability: stabilitySchema.nullable(),
  digest: z.string().min(1).max(200),
  /** The kernel that ran (absent in summaries saved before the wasm kernel: JavaScript). */
  kernel: z.enum(['js', 'wasm']).optional(),
});

const probeSummarySchema = z.object({
  kind: z.literal('probe'),
  estimate: z.object({
    estimate: value,
    standardError: value,
    ci: z.tuple([value, value]),
    paths: z.number().int().min(0),
    note: z.string().max(2000).optional(),
    warnings: z.array(z.string().max(2000)).max(20).optional(),
    monitoring: z.string().max(2000).optional(),
  }),
});

const studyLevelSchema = z.object({
  steps: z.number().int().min(1),
  h: z.number(),
  strongError: value,
  strongSE: value,
  weakError: value,
  weakSE: value,
});

const studySummarySchema = z.object({
  kind: z.literal('study'),
  seconds: z.number().min(0),
  result: z.object({
    levels: z.array(studyLevelSchema).max(20),
    strongOrder: value,
    strongOrderSE: value,
    strongOrderCI: z.tuple([value, value]),
    weakOrder: value,
    weakOrderSE: value,
    weakOrderCI: z.tuple([value, value]),
    reference: z.enum(['exact', 'finest']),
    paths: z.number().int().min(0),
    excluded: z.number().int().min(0),
    note: z.string().max(2000).optional(),
  }),
});

const words = z.string().max(2000);

const fitSummarySchema = z.object({
  kind: z.literal('fit'),
  seconds: z.number().min(0),
  result: z.object({
    method: z.enum(FIT_METHODS),
    ok: z.boolean(),
    estimates: z
      .array(
        z.object({
          name: z.string().max(64),
          unit: z.string().max(40),
          estimate: value,
          standardError: value,
          ci: z.tuple([value, value]),
          atBound: z.boolean(),
        }),
      )
      .max(20),
    logLikelihood: value,
    aic: value,
    observations: z.number().int().min(0),
    transitions: z.number().int().min(0),
    groups: z.number().int().min(0),
    evaluations: z.number().int().min(0),
    converged: z.boolean(),
    convergence: words,
    advice: z.array(words).max(20),
    warnings: z.array(words).max(20),
    residuals: z.object({
      count: z.number().int().min(0),
      ksStatistic: value,
      ksPValue: value,
      basis: words,
      qq: z.array(z.tuple([value, value])).max(MAX_QQ_POINTS),
    }),
    startsBelowBest: z.number().int().min(0),
    seconds: z.number().min(0),
  }),
});

const cellSummarySchema = z.discriminatedUnion('kind', [
  simulationSummarySchema,
  probeSummarySchema,
  studySummarySchema,
  fitSummarySchema,
  sweepSummarySchema,
  scenariosSummarySchema,
]);

export const versionResultsSchema = z
  .record(cellIdSchema, cellSummarySchema)
  .refine((cells) => Object.keys(cells).length <= 500, 'a sheet holds at most 500 cells');
export type VersionResults = z.infer<typeof versionResultsSchema>;
type SimulationSummary = z.infer<typeof simulationSummarySchema>;

const toJson = (x: number): number | null => (Number.isFinite(x) ? x : null);
/**
 * Sample paths are only drawn, so six significant digits are plenty and halve their size; the
 * statistics keep every digit (the summary line and the runner read them).
 */
const drawn = (x: number): number | null => (Number.isFinite(x) ? Number(x.toPrecision(6)) : null);
const fromJson = (x: number | null): number => x ?? Number.NaN;

/** At most MAX_TIMES indices spread evenly over 0..count-1, with both ends. */
export function keptTimeIndices(count: number): number[] {
  if (count <= MAX_TIMES) return Array.from({ length: count }, (_, k) => k);
  const indices = new Set<number>();
  for (let j = 0; j < MAX_TIMES; j++) indices.add(Math.round((j * (count - 1)) / (MAX_TIMES - 1)));
  return [...indices].sort((a, b) => a - b);
}

const STAT_KEYS = ['mean', 'variance', 'q05', 'q25', 'q50', 'q75', 'q95', 'min', 'max'] as const;

function summariseSimulation(
  result: SimulationResult,
  engineVersion: number,
  seconds: number,
): SimulationSummary {
  const kept = keptTimeIndices(result.savedTimes.length);
  const pick = (values: ArrayLike<number>) => kept.map((k) => toJson(values[k]!));
  const d = result.stateNames.length;
  const stats = result.stats.map((s) => ({
    ...(Object.fromEntries(STAT_KEYS.map((key) => [key, pick(s[key])])) as Record<
      (typeof STAT_KEYS)[number],
      (number | null)[]
    >),
    live: kept.map((k) => s.live[k]!),
  }));
  const covariance = result.covariance
    ? kept.flatMap((k) => Array.from(result.covariance!.subarray(k * d * d, (k + 1) * d * d), toJson))
    : null;
  return {
    kind: 'simulation',
    engineVersion,
    seconds,
    stateNames: [...result.stateNames],
    method: result.method,
    paths: result.paths,
    cancelled: result.cancelled,
    steps: result.steps,
    h: result.h,
    t0: result.t0,
    t1: result.t1,
    seed: result.seed,
    savedTimes: pick(result.savedTimes),
    savedSteps: kept.map((k) => result.savedSteps[k]!),
    stats,
    covariance,
    samplePaths: result.samplePaths.map((paths) =>
      paths.slice(0, MAX_PATHS).map((path) => kept.map((k) => drawn(path[k]!))),
    ),
    losses: { ...result.losses, byCause: { ...result.losses.byCause }, advice: [...result.losses.advice] },
    extinctions: result.extinctions.map((e) => ({
      ...e,
      firstTime: e.firstTime === null ? null : toJson(e.firstTime),
      meanTime: e.meanTime === null ? null : toJson(e.meanTime),
    })),
    stability: result.stability
      ? {
          ...result.stability,
          lambda: toJson(result.stability.lambda),
          lambdaImag: toJson(result.stability.lambdaImag),
          mu: result.stability.mu === null ? null : toJson(result.stability.mu),
          amplification: toJson(result.stability.amplification),
          maxStableStep:
            result.stability.maxStableStep === null ? null : toJson(result.stability.maxStableStep),
        }
      : null,
    digest: result.digest,
    kernel: result.kernel,
  };
}

/**
 * The summary of the outputs that match the document as it is now (their fingerprint is the
 * document's), for saving with a version. Larger than MAX_SUMMARY_CHARS, the sample paths go
 * first; the numbers stay.
 */
export function summariseResults(
  doc: SheetDocument,
  kept: (cellId: string) => KeptOutput | undefined,
  fingerprints: Readonly<Record<string, string>>,
): VersionResults {
  const results: VersionResults = {};
  for (const cell of doc.cells) {
    const current = kept(cell.id);
    if (!current || current.fingerprint !== fingerprints[cell.id]) continue;
    const { output } = current;
    if (output.kind === 'simulation' && !output.result.cancelled)
      results[cell.id] = summariseSimulation(output.result, output.engineVersion, output.seconds);
    else if (output.kind === 'probe')
      results[cell.id] = {
        kind: 'probe',
        estimate: {
          ...output.estimate,
          estimate: toJson(output.estimate.estimate),
          standardError: toJson(output.estimate.standardError),
          ci: [toJson(output.estimate.ci[0]), toJson(output.estimate.ci[1])],
        },
      };
    else if (output.kind === 'study')
      results[cell.id] = {
        kind: 'study',
        seconds: output.seconds,
        result: {
          ...output.result,
          levels: output.result.levels.map((level) => ({
            steps: level.steps,
            h: level.h,
            strongError: toJson(level.strongError),
            strongSE: toJson(level.strongSE),
            weakError: toJson(level.weakError),
            weakSE: toJson(level.weakSE),
          })),
          strongOrder: toJson(output.result.strongOrder),
          strongOrderSE: toJson(output.result.strongOrderSE),
          strongOrderCI: [toJson(output.result.strongOrderCI[0]), toJson(output.result.strongOrderCI[1])],
          weakOrder: toJson(output.result.weakOrder),
          weakOrderSE: toJson(output.result.weakOrderSE),
          weakOrderCI: [toJson(output.result.weakOrderCI[0]), toJson(output.result.weakOrderCI[1])],
        },
      };
    else if (output.kind === 'fit') results[cell.id] = summariseFit(output.result, output.seconds);
    else if (output.kind === 'sweep') results[cell.id] = summariseSweep(output.result, output.seconds);
    else if (output.kind === 'scenarios')
      results[cell.id] = summariseScenarios(output.result, output.seconds, keptTimeIndices);
  }
  if (JSON.stringify(results).length > MAX_SUMMARY_CHARS)
    for (const summary of Object.values(results)) if (summary.kind === 'simulation') summary.samplePaths = [];
  return results;
}

type FitSummary = z.infer<typeof fitSummarySchema>;

function summariseFit(result: FitResult, seconds: number): FitSummary {
  const orNull = (x: number | null) => (x === null ? null : toJson(x));
  return {
    kind: 'fit',
    seconds,
    result: {
      ...result,
      estimates: result.estimates.map((e) => ({
        ...e,
        estimate: toJson(e.estimate),
        standardError: orNull(e.standardError),
        ci: [orNull(e.ci[0]), orNull(e.ci[1])],
      })),
      logLikelihood: toJson(result.logLikelihood),
      aic: toJson(result.aic),
      advice: [...result.advice],
      warnings: [...result.warnings],
      residuals: {
        ...result.residuals,
        ksStatistic: orNull(result.residuals.ksStatistic),
        ksPValue: orNull(result.residuals.ksPValue),
        qq: result.residuals.qq.map(([a, b]) => [toJson(a), toJson(b)]),
      },
    },
  };
}

function restoredFit(summary: FitSummary): FitResult {
  const { result } = summary;
  const finiteOrNull = (x: number | null) => (x === null || !Number.isFinite(x) ? null : x);
  return {
    ...result,
    estimates: result.estimates.map((e) => ({
      ...e,
      estimate: fromJson(e.estimate),
      ci: [e.ci[0], e.ci[1]],
    })),
    logLikelihood: fromJson(result.logLikelihood),
    aic: fromJson(result.aic),
    advice: [...result.advice],
    warnings: [...result.warnings],
    residuals: {
      ...result.residuals,
      ksStatistic: finiteOrNull(result.residuals.ksStatistic),
      ksPValue: finiteOrNull(result.residuals.ksPValue),
      qq: result.residuals.qq.map(([a, b]) => [fromJson(a), fromJson(b)]),
    },
  };
}

const floats = (values: (number | null)[]) => Float64Array.from(values, fromJson);

function restoredSimulation(summary: SimulationSummary): SimulationResult {
  const d = summary.stateNames.length;
  const stats: SavedStats[] = summary.stats.map((s) => ({
    mean: floats(s.mean),
    variance: floats(s.variance),
    q05: floats(s.q05),
    q25: floats(s.q25),
    q50: floats(s.q50),
    q75: floats(s.q75),
    q95: floats(s.q95),
    min: floats(s.min),
    max: floats(s.max),
    live: Int32Array.from(s.live),
  }));
  const empty = () => Array.from({ length: d }, () => new Float64Array(0));
  return {
    stateNames: [...summary.stateNames],
    method: summary.method,
    paths: summary.paths,
    cancelled: summary.cancelled,
    steps: summary.steps,
    h: summary.h,
    t0: summary.t0,
    t1: summary.t1,
    seed: summary.seed,
    savedTimes: floats(summary.savedTimes),
    savedSteps: Int32Array.from(summary.savedSteps),
    stats,
    // Per-path values are not kept with a version: charts that need them say so.
    savedValues: empty(),
    covariance: summary.covariance ? floats(summary.covariance) : null,
    samplePaths: summary.samplePaths.map((paths) => paths.map(floats)),
    finalValues: empty(),
    probes: [],
    runningMax: empty(),
    runningMin: empty(),
    watches: [],
    watchLevels: new Float64Array(0),
    firstPassage: [],
    absorptionTime: empty(),
    blowupTime: new Float64Array(0),
    lossCause: new Uint8Array(0),
    losses: { ...summary.losses },
    blowups: {
      count: summary.losses.byCause.bound + summary.losses.byCause.infinite,
      firstTime: summary.losses.firstTime,
      suggestion: null,
    },
    extinctions: summary.extinctions.map((e) => ({ ...e })),
    stability: summary.stability
      ? {
          ...summary.stability,
          lambda: fromJson(summary.stability.lambda),
          lambdaImag: fromJson(summary.stability.lambdaImag),
          amplification: fromJson(summary.stability.amplification),
          maxStableStep: summary.stability.maxStableStep,
          mu: summary.stability.mu,
        }
      : null,
    digest: summary.digest,
    kernel: summary.kernel ?? 'js',
  };
}

/**
 * The outputs a saved summary stands for, by cell id, for the cells of `doc` whose kind matches.
 * `planOf` builds a simulation's plan from the version's document (charts read it); a simulation
 * whose plan cannot be built is left out.
 */
export function outputsFromResults(
  doc: SheetDocument,
  results: VersionResults,
  planOf: (simulationId: string) => SimulationPlan | null,
  savedAt: Date,
): Map<string, CellOutput> {
  const outputs = new Map<string, CellOutput>();
  for (const cell of doc.cells) {
    const summary = Object.hasOwn(results, cell.id) ? results[cell.id] : undefined;
    if (!summary || summary.kind !== cell.kind) continue;
    if (summary.kind === 'simulation') {
      const plan = planOf(cell.id);
      if (!plan) continue;
      outputs.set(cell.id, {
        kind: 'simulation',
        plan,
        result: restoredSimulation(summary),
        engineVersion: summary.engineVersion,
        finishedAt: savedAt,
        seconds: summary.seconds,
      });
    } else if (summary.kind === 'probe') {
      const { estimate } = summary;
      outputs.set(cell.id, {
        kind: 'probe',
        estimate: {
          ...estimate,
          estimate: fromJson(estimate.estimate),
          standardError: fromJson(estimate.standardError),
          ci: [fromJson(estimate.ci[0]), fromJson(estimate.ci[1])],
        },
        finishedAt: savedAt,
      });
    } else if (summary.kind === 'fit') {
      outputs.set(cell.id, {
        kind: 'fit',
        result: restoredFit(summary),
        finishedAt: savedAt,
        seconds: summary.seconds,
      });
    } else if (summary.kind === 'sweep') {
      outputs.set(cell.id, {
        kind: 'sweep',
        result: restoredSweep(summary),
        finishedAt: savedAt,
        seconds: summary.seconds,
      });
    } else if (summary.kind === 'scenarios') {
      outputs.set(cell.id, {
        kind: 'scenarios',
        result: restoredScenarios(summary),
        finishedAt: savedAt,
        seconds: summary.seconds,
      });
    } else if (cell.kind === 'study') {
      const { result } = summary;
      const plan = planOf(cell.simulation);
      if (!plan) continue;
      outputs.set(cell.id, {
        kind: 'study',
        plan,
        result: {
          ...result,
          levels: result.levels.map((level) => ({
            steps: level.steps,
            h: level.h,
            strongError: fromJson(level.strongError),
            strongSE: fromJson(level.strongSE),
            weakError: fromJson(level.weakError),
            weakSE: fromJson(level.weakSE),
          })),
          strongOrder: fromJson(result.strongOrder),
          strongOrderSE: fromJson(result.strongOrderSE),
          strongOrderCI: [fromJson(result.strongOrderCI[0]), fromJson(result.strongOrderCI[1])],
          weakOrder: fromJson(result.weakOrder),
          weakOrderSE: fromJson(result.weakOrderSE),
          weakOrderCI: [fromJson(result.weakOrderCI[0]), fromJson(result.weakOrderCI[1])],
        },
        finishedAt: savedAt,
        seconds: summary.seconds,
      });
    }
  }
  return outputs;
}
