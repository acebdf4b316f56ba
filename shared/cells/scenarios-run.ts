import type { CellOutput } from '../run/outputs';
import { pairedDifference } from '../engine/paired-difference';
import { Z95 } from '../engine/probes';
import type { SimulationResult } from '../engine/result';
import { estimateAt, independentSeed, PointRunner, type PointEstimate } from '../run/point-runner';
import type { FanSeries, ScenarioProbeResult, ScenarioResult } from '../run/scenarios-result';
import type { ScenariosCell } from '../sheet/document';
import type { RunStepContext } from './kind';
import { secondsSince } from './helpers';
import { probeCellOf } from './many-points';
import { probeKind, probeRequest } from './probe';

/**
 * The run step of a scenarios cell: the baseline first, then every other scenario, each the
 * simulation with its overrides, compiled once with the parameters that differ as kernel inputs.
 * With common random numbers (the default) every scenario uses the simulation's seed, so each
 * difference from the baseline is paired path by path; only the baseline's influence values are
 * kept while the others run.
 */
export async function runScenarios(cell: ScenariosCell, context: RunStepContext): Promise<CellOutput> {
  const started = performance.now();
  const base = context.plan(cell.simulation);
  const probes = cell.probes.map((id) => {
    const probe = probeCellOf(context.doc, id);
    if (!probe) throw new Error(`the scenarios cell names no probe cell '${id}'`);
    return { id, title: probeKind.title(probe), request: probeRequest(probe, base.model.stateNames) };
  });
  const baselineIndex = Math.max(
    0,
    cell.scenarios.findIndex((s) => s.name === cell.baseline),
  );
  const order = [baselineIndex, ...cell.scenarios.keys()].filter((k, i) => i === 0 || k !== baselineIndex);
  const overrides = cell.scenarios.map((scenario) => scenario.overrides);
  const inputNames = context.varyingParameters(cell.simulation, overrides);
  const paths = cell.paths ?? base.paths;
  const crn = !cell.independent;
  const runner = new PointRunner(context, order.length, order.length * paths);

  const results: ScenarioResult[] = new Array(cell.scenarios.length);
  let baseline: PointEstimate[] = [];
  for (const [position, k] of order.entries()) {
    const scenario = cell.scenarios[k]!;
    const seed = crn ? base.seed : independentSeed(base.seed, position);
    const plan = context.pointPlan(cell.simulation, {
      overrides: scenario.overrides,
      inputNames,
      paths,
      seed,
    });
    const result = await runner.run(plan);
    const estimates = probes.map((probe) => estimateAt(result, probe.request));
    if (position === 0) baseline = estimates;
    results[k] = {
      name: scenario.name,
      overrides: { ...scenario.overrides },
      digest: result.digest,
      probes: estimates.map((at, j) => probeResult(at, position === 0 ? null : baseline[j]!, crn)),
      fan: fanOf(result, base.model.stateUnits),
    };
  }
  return {
    kind: 'scenarios',
    result: {
      baseline: cell.scenarios[baselineIndex]!.name,
      commonRandomNumbers: crn,
      paths,
      probes: probes.map(({ id, title }) => ({ id, title })),
      scenarios: results,
    },
    finishedAt: new Date(),
    seconds: secondsSince(started),
  };
}

function probeResult(at: PointEstimate, baseline: PointEstimate | null, crn: boolean): ScenarioProbeResult {
  const estimate = at.estimate;
  let difference: ScenarioProbeResult['difference'] = null;
  if (baseline?.estimate && estimate && at.influence && baseline.influence) {
    const paired = pairedDifference(
      estimate.estimate,
      baseline.estimate.estimate,
      at.influence,
      baseline.influence,
    );
    const se = crn ? paired.pairedSE : paired.independentSE;
    difference = {
      estimate: paired.estimate,
      pairedSE: crn ? paired.pairedSE : null,
      independentSE: paired.independentSE,
      ci: [paired.estimate - Z95 * se, paired.estimate + Z95 * se],
    };
  } else if (baseline?.estimate && estimate) {
    // No influence values for this quantity: the independent-run error is all that can be said.
    const se = Math.hypot(estimate.standardError, baseline.estimate.standardError);
    const change = estimate.estimate - baseline.estimate.estimate;
    difference = {
      estimate: change,
      pairedSE: null,
      independentSE: se,
      ci: [change - Z95 * se, change + Z95 * se],
    };
  }
  return {
    estimate: estimate?.estimate ?? NaN,
    standardError: estimate?.standardError ?? NaN,
    ci: estimate?.ci ?? [NaN, NaN],
    paths: estimate?.paths ?? 0,
    warnings: [...(estimate?.warnings ?? [])],
    difference,
    error: at.error,
  };
}

/** Median and 5–95 % band of every state at the saved times (what the fan chart draws). */
function fanOf(result: SimulationResult, units: readonly string[]): FanSeries[] {
  return result.stateNames.map((state, i) => ({
    state,
    unit: units[i] ?? '',
    times: Array.from(result.savedTimes),
    q05: Array.from(result.stats[i]!.q05),
    q50: Array.from(result.stats[i]!.q50),
    q95: Array.from(result.stats[i]!.q95),
  }));
}
