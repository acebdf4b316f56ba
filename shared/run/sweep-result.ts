import type { TargetSearchResult } from '../engine/target-search';
import { finiteOrNull } from './json-numbers';

/** What a sweep cell keeps: one probe per point, never the paths (see shared/cells/sweep.ts). */
export interface SweepPointResult {
  /** The swept parameters' values at this point, in axis order. */
  values: number[];
  estimate: number;
  standardError: number;
  ci: [number, number];
  paths: number;
  digest: string;
  warnings: string[];
  /** One-parameter sweeps: the change from the previous value, paired path by path. */
  step: { estimate: number; pairedSE: number | null; independentSE: number } | null;
  /** Why this point has no estimate (the others still stand). */
  error: string | null;
}

export interface SweepResult {
  parameters: string[];
  /** Values of each axis; points run over the first axis slowest. */
  axisValues: number[][];
  probeTitle: string;
  commonRandomNumbers: boolean;
  pathsPerPoint: number;
  /** Parameters compiled as kernel inputs (empty: one literal kernel, nothing varied). */
  kernelInputs: string[];
  points: SweepPointResult[];
  target: TargetSearchResult | null;
}

export interface SweepJson {
  id: string;
  kind: 'sweep';
  probe: string;
  parameters: string[];
  commonRandomNumbers: boolean;
  pathsPerPoint: number;
  table: Record<string, number | string | null>[];
  target: {
    value: number;
    bracketed: boolean;
    root: number | null;
    interval: [number, number] | null;
    message: string;
  } | null;
}

/** The table a sweep shows and exports: one row per point. */
export function sweepTable(result: SweepResult): Record<string, number | string | null>[] {
  return result.points.map((point) => {
    const row: Record<string, number | string | null> = {};
    result.parameters.forEach((name, axis) => (row[name] = point.values[axis]!));
    row.estimate = finiteOrNull(point.estimate);
    row.standardError = finiteOrNull(point.standardError);
    row.ciLow = finiteOrNull(point.ci[0]);
    row.ciHigh = finiteOrNull(point.ci[1]);
    row.paths = point.paths;
    if (result.parameters.length === 1) {
      row.stepChange = point.step ? finiteOrNull(point.step.estimate) : null;
      row.stepPairedSE = point.step?.pairedSE == null ? null : finiteOrNull(point.step.pairedSE);
      row.stepIndependentSE = point.step ? finiteOrNull(point.step.independentSE) : null;
    }
    row.digest = point.digest;
    if (point.error !== null) row.error = point.error;
    return row;
  });
}

export function sweepJson(id: string, result: SweepResult): SweepJson {
  const target = result.target;
  return {
    id,
    kind: 'sweep',
    probe: result.probeTitle,
    parameters: [...result.parameters],
    commonRandomNumbers: result.commonRandomNumbers,
    pathsPerPoint: result.pathsPerPoint,
    table: sweepTable(result),
    target:
      target === null
        ? null
        : {
            value: target.target,
            bracketed: target.bracketed,
            root: target.root,
            interval: target.interval,
            message: target.message,
          },
  };
}
