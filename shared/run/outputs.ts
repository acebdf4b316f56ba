import type { Method, ProbeCell, StudyCell } from '../sheet/document';
import type {
  LossCause,
  ProbeEstimate,
  ProbeRequest,
  SimulationResult,
  StudyLevel,
  StudyOptions,
  StudyResult,
} from '../engine/result';

/**
 * Per-cell outputs of a sheet run: small, plain JSON (no typed arrays), what the command-line
 * runner prints and what a stored run record can keep. Non-finite numbers become null, because
 * JSON has no NaN.
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

export interface SimulationOutput {
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
}

export interface ProbeOutput {
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

export interface StudyLevelOutput {
  steps: number;
  h: number;
  strongError: number | null;
  strongSE: number | null;
  weakError: number | null;
  weakSE: number | null;
}

export interface StudyOutput {
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
  levels: StudyLevelOutput[];
  note?: string;
}

/** A numerical cell that could not be computed (the rest of the sheet still runs). */
export interface FailedCellOutput {
  id: string;
  kind: 'simulation' | 'probe' | 'study';
  error: string;
}

export type CellOutput = SimulationOutput | ProbeOutput | StudyOutput | FailedCellOutput;

export interface SheetRunOutput {
  title: string;
  cells: CellOutput[];
}

export function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

export function simulationOutput(id: string, result: SimulationResult): SimulationOutput {
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

export function probeOutput(id: string, estimate: ProbeEstimate): ProbeOutput {
  const output: ProbeOutput = {
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

function studyLevelOutput(level: StudyLevel): StudyLevelOutput {
  return {
    steps: level.steps,
    h: level.h,
    strongError: finiteOrNull(level.strongError),
    strongSE: finiteOrNull(level.strongSE),
    weakError: finiteOrNull(level.weakError),
    weakSE: finiteOrNull(level.weakSE),
  };
}

export function studyOutput(id: string, result: StudyResult): StudyOutput {
  const output: StudyOutput = {
    id,
    kind: 'study',
    strongOrder: finiteOrNull(result.strongOrder),
    strongOrderSE: finiteOrNull(result.strongOrderSE),
    strongOrderCI: [finiteOrNull(result.strongOrderCI[0]), finiteOrNull(result.strongOrderCI[1])],
    weakOrder: finiteOrNull(result.weakOrder),
    weakOrderSE: finiteOrNull(result.weakOrderSE),
    weakOrderCI: [finiteOrNull(result.weakOrderCI[0]), finiteOrNull(result.weakOrderCI[1])],
    reference: result.reference,
    levels: result.levels.map(studyLevelOutput),
  };
  if (result.note) output.note = result.note;
  return output;
}

function stateIndex(stateNames: readonly string[], name: string, cellId: string): number {
  const index = stateNames.indexOf(name);
  if (index < 0) throw new Error(`cell ${cellId}: the model has no state variable "${name}"`);
  return index;
}

/** The engine's view of a probe cell: states by index rather than by name. */
export function probeRequest(cell: ProbeCell, stateNames: readonly string[]): ProbeRequest {
  const request: ProbeRequest = {
    quantity: cell.quantity,
    state: stateIndex(stateNames, cell.state, cell.id),
  };
  if (cell.time !== undefined) request.time = cell.time;
  if (cell.level !== undefined) request.level = cell.level;
  if (cell.probability !== undefined) request.probability = cell.probability;
  if (cell.direction !== undefined) request.direction = cell.direction;
  if (cell.monitoring !== undefined) request.monitoring = cell.monitoring;
  return request;
}

/** The engine's view of a study cell; without a state named, the first state is measured. */
export function studyOptions(cell: StudyCell, stateNames: readonly string[]): StudyOptions {
  return {
    levels: cell.levels,
    coarsestSteps: cell.coarsestSteps,
    paths: cell.paths,
    state: cell.state === undefined ? 0 : stateIndex(stateNames, cell.state, cell.id),
    reference: cell.reference,
  };
}
