// Over 300 lines on purpose: the runner's whole JSON vocabulary (one type and one function per
// output kind, and the dispatch) in one file, so the printed schema reads from top to bottom.
import type { Method } from '../sheet/document';
import type { FitResult } from '../fit/problem';
import type { LossCause, ProbeEstimate, SimulationResult, StudyLevel, StudyResult } from '../engine/result';
import type { ObservedData } from '../data/observed';
import type { CellOutput } from './outputs';
import { scenariosJson, type ScenariosJson } from './scenarios-result';
import { sweepJson, type SweepJson } from './sweep-result';

/**
 * A cell's output as small, plain JSON (no typed arrays, no plans): what the command-line runner
 * prints. Non-finite numbers become null, because JSON has no NaN.
 */

export const QUANTILE_KEYS = ['5', '25', '50', '75', '95'] as const;
export type QuantileKey = (typeof QUANTILE_KEYS)[number];

export interface StateSummary {
  mean: number | null;
  variance: number | null;
  quantiles: Record<QuantileKey, number | null>;
}

/** Paths the run could not carry to t1, by cause (see LossSummary in shared/engine/result.ts). */
export interface LossesOutput {
  count: number;
  share: number;
  byCause: Record<LossCause, number>;
  firstTime: number | null;
  /** More than 1 % lost: every estimate of the run describes the surviving paths only. */
  conditional: boolean;
  /** Every path lost: the run has no estimates (the runner exits non-zero). */
  allLost: boolean;
  message: string | null;
  advice: string[];
}

/** The step's stability (see StabilityReport in shared/engine/result.ts). */
export interface StabilityOutput {
  check: 'mean-square' | 'linear-drift';
  stable: boolean;
  /** False when the model's own moments grow: then no step is to blame. */
  modelStable: boolean;
  h: number;
  amplification: number | null;
  lambda: number | null;
  lambdaImag: number | null;
  time: number;
  maxStableStep: number | null;
  message: string;
}

export interface SimulationJson {
  id: string;
  kind: 'simulation';
  method: Method;
  paths: number;
  steps: number;
  /** What a reader must know before reading the numbers below (empty when nothing). */
  warnings: string[];
  /** Distribution of each state variable at t1, over the paths that were not lost. */
  final: Record<string, StateSummary>;
  /** Covariance matrix of the states at t1, rows and columns in state order; null for one state. */
  finalCovariance: (number | null)[][] | null;
  losses: LossesOutput;
  /** Null when the drift could not be linearised (not finite at the initial state). */
  stability: StabilityOutput | null;
  digest: string;
  engineVersion: number;
  /** The kernel that ran (the same numbers either way), and why not wasm when it was not. */
  kernel: 'js' | 'wasm';
  kernelNote?: string;
}

export interface ProbeJson {
  id: string;
  kind: 'probe';
  estimate: number | null;
  standardError: number | null;
  ci: [number | null, number | null];
  paths: number;
  /** What a reader must know before using the estimate (empty when nothing). */
  warnings: string[];
  note?: string;
  /** hit-before and first-passage: how the level was watched between steps, in words. */
  monitoring?: string;
}

export interface StudyLevelJson {
  steps: number;
  h: number;
  strongError: number | null;
  strongSE: number | null;
  weakError: number | null;
  weakSE: number | null;
}

export interface StudyJson {
  id: string;
  kind: 'study';
  strongOrder: number | null;
  /** Standard error and 95 % interval of the fitted strong order (null where it cannot be fitted). */
  strongOrderSE: number | null;
  strongOrderCI: [number | null, number | null];
  weakOrder: number | null;
  weakOrderSE: number | null;
  weakOrderCI: [number | null, number | null];
  reference: 'exact' | 'finest';
  levels: StudyLevelJson[];
  note?: string;
}

/** A cell that could not be computed (the rest of the sheet still runs). */
export interface FailedCellJson {
  id: string;
  kind: string;
  error: string;
}

/** A data cell's output in the runner's JSON: which dataset, and how much of it. */
export interface DataJson {
  id: string;
  kind: 'data';
  datasetId: string;
  checksum: string;
  columns: ObservedData['columns'];
  groups: number;
  observations: number;
}

/** A fit cell's output in the runner's JSON (non-finite numbers as null). */
export interface FitJson {
  id: string;
  kind: 'fit';
  method: FitResult['method'];
  ok: boolean;
  converged: boolean;
  convergence: string;
  estimates: {
    name: string;
    unit: string;
    estimate: number | null;
    standardError: number | null;
    ci: [number | null, number | null];
    atBound: boolean;
  }[];
  logLikelihood: number | null;
  aic: number | null;
  observations: number;
  groups: number;
  ksPValue: number | null;
  warnings: string[];
  advice: string[];
}

export type CellOutputJson =
  SimulationJson | ProbeJson | StudyJson | DataJson | FitJson | SweepJson | ScenariosJson | FailedCellJson;

/** What the command-line runner prints for a sheet. */
export interface SheetRunJson {
  title: string;
  engineVersion: number;
  cells: CellOutputJson[];
}

export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function simulationJson(id: string, result: SimulationResult, engineVersion: number): SimulationJson {
  const last = result.savedTimes.length - 1;
  const final: Record<string, StateSummary> = {};
  result.stateNames.forEach((name, i) => {
    const stats = result.stats[i]!;
    final[name] = {
      mean: finiteOrNull(stats.mean[last]!),
      variance: finiteOrNull(stats.variance[last]!),
      quantiles: {
        '5': finiteOrNull(stats.q05[last]!),
        '25': finiteOrNull(stats.q25[last]!),
        '50': finiteOrNull(stats.q50[last]!),
        '75': finiteOrNull(stats.q75[last]!),
        '95': finiteOrNull(stats.q95[last]!),
      },
    };
  });
  const { losses, stability } = result;
  const warnings = [
    ...(stability !== null && !stability.stable && stability.modelStable ? [stability.message] : []),
    ...(losses.conditional
      ? [`${losses.message ?? ''} ${losses.advice.map((line) => `Advice: ${line}.`).join(' ')}`.trim()]
      : []),
  ];
  return {
    id,
    kind: 'simulation',
    method: result.method,
    paths: result.paths,
    steps: result.steps,
    warnings,
    final,
    finalCovariance: finalCovariance(result),
    losses: {
      count: losses.count,
      share: losses.share,
      byCause: { ...losses.byCause },
      firstTime: losses.firstTime,
      conditional: losses.conditional,
      allLost: losses.allLost,
      message: losses.message,
      advice: [...losses.advice],
    },
    stability:
      stability === null
        ? null
        : {
            check: stability.check,
            stable: stability.stable,
            modelStable: stability.modelStable,
            h: stability.h,
            amplification: finiteOrNull(stability.amplification),
            lambda: finiteOrNull(stability.lambda),
            lambdaImag: finiteOrNull(stability.lambdaImag),
            time: stability.time,
            maxStableStep: stability.maxStableStep,
            message: stability.message,
          },
    digest: result.digest,
    engineVersion,
    kernel: result.kernel,
    ...(result.kernelNote === undefined ? {} : { kernelNote: result.kernelNote }),
  };
}

function finalCovariance(result: SimulationResult): (number | null)[][] | null {
  const { covariance, stateNames } = result;
  if (covariance === null) return null;
  const d = stateNames.length;
  const last = result.savedTimes.length - 1;
  return stateNames.map((_, i) =>
    stateNames.map((__, j) => finiteOrNull(covariance[(last * d + i) * d + j]!)),
  );
}

function probeJson(id: string, estimate: ProbeEstimate): ProbeJson {
  const output: ProbeJson = {
    id,
    kind: 'probe',
    estimate: finiteOrNull(estimate.estimate),
    standardError: finiteOrNull(estimate.standardError),
    ci: [finiteOrNull(estimate.ci[0]), finiteOrNull(estimate.ci[1])],
    paths: estimate.paths,
    warnings: [...(estimate.warnings ?? [])],
  };
  if (estimate.note) output.note = estimate.note;
  if (estimate.monitoring) output.monitoring = estimate.monitoring;
  return output;
}

function studyLevelJson(level: StudyLevel): StudyLevelJson {
  return {
    steps: level.steps,
    h: level.h,
    strongError: finiteOrNull(level.strongError),
    strongSE: finiteOrNull(level.strongSE),
    weakError: finiteOrNull(level.weakError),
    weakSE: finiteOrNull(level.weakSE),
  };
}

function studyJson(id: string, result: StudyResult): StudyJson {
  const output: StudyJson = {
    id,
    kind: 'study',
    strongOrder: finiteOrNull(result.strongOrder),
    strongOrderSE: finiteOrNull(result.strongOrderSE),
    strongOrderCI: [finiteOrNull(result.strongOrderCI[0]), finiteOrNull(result.strongOrderCI[1])],
    weakOrder: finiteOrNull(result.weakOrder),
    weakOrderSE: finiteOrNull(result.weakOrderSE),
    weakOrderCI: [finiteOrNull(result.weakOrderCI[0]), finiteOrNull(result.weakOrderCI[1])],
    reference: result.reference,
    levels: result.levels.map(studyLevelJson),
  };
  if (result.note) output.note = result.note;
  return output;
}

function dataJson(id: string, observed: ObservedData): DataJson {
  return {
    id,
    kind: 'data',
    datasetId: observed.datasetId,
    checksum: observed.checksum,
    columns: observed.columns.map((column) => ({ ...column })),
    groups: observed.series.length,
    observations: observed.series.reduce((sum, series) => sum + series.times.length, 0),
  };
}

function fitJson(id: string, result: FitResult): FitJson {
  return {
    id,
    kind: 'fit',
    method: result.method,
    ok: result.ok,
    converged: result.converged,
    convergence: result.convergence,
    estimates: result.estimates.map((e) => ({
      name: e.name,
      unit: e.unit,
      estimate: finiteOrNull(e.estimate),
      standardError: e.standardError,
      ci: [e.ci[0], e.ci[1]],
      atBound: e.atBound,
    })),
    logLikelihood: finiteOrNull(result.logLikelihood),
    aic: finiteOrNull(result.aic),
    observations: result.observations,
    groups: result.groups,
    ksPValue: result.residuals.ksPValue,
    warnings: [...result.warnings],
    advice: [...result.advice],
  };
}

/** The plain JSON view of a cell's output, as the command-line runner prints it. */
export function cellOutputJson(id: string, cellKind: string, output: CellOutput): CellOutputJson {
  switch (output.kind) {
    case 'simulation':
      return simulationJson(id, output.result, output.engineVersion);
    case 'probe':
      return probeJson(id, output.estimate);
    case 'study':
      return studyJson(id, output.result);
    case 'data':
      return dataJson(id, output.observed);
    case 'fit':
      return fitJson(id, output.result);
    case 'sweep':
      return sweepJson(id, output.result);
    case 'scenarios':
      return scenariosJson(id, output.result);
    case 'error':
      return { id, kind: cellKind, error: output.message };
  }
}
