import type { CellOutput } from '../run/outputs';
import { pairedDifference } from '../engine/paired-difference';
import { searchTarget, type CurvePoint } from '../engine/target-search';
import { estimateAt, independentSeed, PointRunner } from '../run/point-runner';
import type { SweepPointResult } from '../run/sweep-result';
import type { SweepCell } from '../sheet/document';
import type { RunStepContext } from './kind';
import { secondsSince } from './helpers';
import { probeCellOf, refinePathsOf } from './many-points';
import { probeKind, probeRequest } from './probe';
import { axisValues, sweepPoints } from './sweep';

/**
 * The run step of a sweep: every point is the probe's simulation with the swept parameters
 * overridden, compiled once with those parameters as kernel inputs; with common random numbers
 * (the default) every point uses the simulation's seed, so path p sees the same noise at every
 * value. Then, for a target, a search on refined runs (shared/engine/target-search.ts).
 */
export async function runSweep(cell: SweepCell, context: RunStepContext): Promise<CellOutput> {
  const started = performance.now();
  const probe = probeCellOf(context.doc, cell.probe);
  if (!probe) throw new Error(`the sweep names no probe cell ('${cell.probe}')`);
  const simulationId = probe.simulation;
  const base = context.plan(simulationId);
  const request = probeRequest(probe, base.model.stateNames);
  const points = sweepPoints(cell);
  const inputNames = context.varyingParameters(simulationId, points);
  const paths = cell.paths ?? base.paths;
  const crn = !cell.independent;
  const target = cell.target && cell.axes.length === 1 ? cell.target : undefined;
  const refinePaths = target ? refinePathsOf(target, paths) : 0;
  const runner = new PointRunner(context, points.length, points.length * paths);
  if (target) runner.extend(target.refineRuns, target.refineRuns * refinePaths);

  let previous: Float64Array | null = null;
  let made = 0;
  const runAt = async (overrides: Record<string, number>, pointPaths: number) => {
    const seed = crn ? base.seed : independentSeed(base.seed, made);
    made++;
    const plan = context.pointPlan(simulationId, { overrides, inputNames, paths: pointPaths, seed });
    const result = await runner.run(plan);
    return { result, at: estimateAt(result, request) };
  };

  const results: SweepPointResult[] = [];
  for (const overrides of points) {
    const { result, at } = await runAt(overrides, paths);
    const estimate = at.estimate;
    const step =
      cell.axes.length === 1 && previous !== null && at.influence !== null && estimate !== null
        ? stepChange(results[results.length - 1]!, estimate.estimate, previous, at.influence, crn)
        : null;
    results.push({
      values: cell.axes.map((axis) => overrides[axis.parameter]!),
      estimate: estimate?.estimate ?? NaN,
      standardError: estimate?.standardError ?? NaN,
      ci: estimate?.ci ?? [NaN, NaN],
      paths: estimate?.paths ?? 0,
      digest: result.digest,
      warnings: [...(estimate?.warnings ?? [])],
      step,
      error: at.error,
    });
    previous = at.influence;
  }

  let search = null;
  if (target) {
    const parameter = cell.axes[0]!.parameter;
    const curve: CurvePoint[] = results
      .filter((point) => point.error === null && Number.isFinite(point.estimate))
      .map((point) => ({ x: point.values[0]!, estimate: point.estimate, ci: point.ci }));
    search = await searchTarget(curve, target.value, {
      iterations: target.refineRuns,
      isCancelled: () => context.isCancelled(),
      async evaluate(x) {
        const { at } = await runAt({ [parameter]: x }, refinePaths);
        if (at.estimate === null)
          throw new Error(`the refined run at ${parameter} = ${x} failed: ${at.error}`);
        return { x, estimate: at.estimate.estimate, ci: at.estimate.ci };
      },
    });
  }

  return {
    kind: 'sweep',
    result: {
      parameters: cell.axes.map((axis) => axis.parameter),
      axisValues: cell.axes.map(axisValues),
      probeTitle: probeKind.title(probe),
      commonRandomNumbers: crn,
      pathsPerPoint: paths,
      kernelInputs: inputNames,
      points: results,
      target: search,
    },
    finishedAt: new Date(),
    seconds: secondsSince(started),
  };
}

/** The change from the previous point, with the paired and the independent standard error. */
function stepChange(
  before: SweepPointResult,
  estimate: number,
  previous: Float64Array,
  influence: Float64Array,
  crn: boolean,
): SweepPointResult['step'] {
  if (before.error !== null) return null;
  const difference = pairedDifference(estimate, before.estimate, influence, previous);
  return {
    estimate: difference.estimate,
    pairedSE: crn ? difference.pairedSE : null,
    independentSE: difference.independentSE,
  };
}
