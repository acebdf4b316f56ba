import type { Method } from '../sheet/document';
import type { SimulationPlan } from '../engine/plan';
import type { ProbeEstimate, SimulationResult, StudyLevel, StudyResult } from '../engine/result';

/**
 * What a run leaves on a cell: one type for every runner (browser, command line, tests). Charts
 * show the output of the simulation they name. `cellOutputJson` turns an output into small, plain
 * JSON (no typed arrays, no plans): what the command-line runner prints. Non-finite numbers
 * become null there, because JSON has no NaN.
 */
export type CellOutput =
  | {
      kind: 'simulation';
      plan: SimulationPlan;
      result: SimulationResult;
      /** The engine version that computed it (shared/engine/version.ts). */
      engineVersion: number;
      finishedAt: Date;
      seconds: number;
    }
  | { kind: 'probe'; estimate: ProbeEstimate; finishedAt: Date }
  | { kind: 'study'; plan: SimulationPlan; result: StudyResult; finishedAt: Date; seconds: number }
  | { kind: 'error'; message: string; finishedAt: Date };

export const QUANTILE_KEYS = ['5', '25', '50', '75', '95'] as const;
export type QuantileKey = (typeof QUANTILE_KEYS)[number];

export interface StateSummary {
  mean: number | null;
  variance: number | null;
  quantiles: Record<QuantileKey, number | null>;
}

export interface SimulationJson {
  id: string;
  kind: 'simulation';
  method: Method;
  paths: number;
  steps: number;
  /** Distribution of each state variable at t1, over paths that did not blow up. */
  final: Record<string, StateSummary>;
  blowups: number;
  digest: string;
  engineVersion: number;
}

export interface ProbeJson {
  id: string;
  kind: 'probe';
  estimate: number | null;
  standardError: number | null;
  ci: [number | null, number | null];
  paths: number;
  note?: string;
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
  weakOrder: number | null;
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

export type CellOutputJson = SimulationJson | ProbeJson | StudyJson | FailedCellJson;

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
  return {
    id,
    kind: 'simulation',
    method: result.method,
    paths: result.paths,
    steps: result.steps,
    final,
    blowups: result.blowups.count,
    digest: result.digest,
    engineVersion,
  };
}

function probeJson(id: string, estimate: ProbeEstimate): ProbeJson {
  const output: ProbeJson = {
    id,
    kind: 'probe',
    estimate: finiteOrNull(estimate.estimate),
    standardError: finiteOrNull(estimate.standardError),
    ci: [finiteOrNull(estimate.ci[0]), finiteOrNull(estimate.ci[1])],
    paths: estimate.paths,
  };
  if (estimate.note) output.note = estimate.note;
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
    weakOrder: finiteOrNull(result.weakOrder),
    reference: result.reference,
    levels: result.levels.map(studyLevelJson),
  };
  if (result.note) output.note = result.note;
  return output;
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
    case 'error':
      return { id, kind: cellKind, error: output.message };
  }
}
