import { finiteOrNull } from './json-numbers';

/** What a scenarios cell keeps: per scenario its probes, differences and fan, never the paths. */

/** Median and 5–95 % band of one state at the saved times. */
export interface FanSeries {
  state: string;
  unit: string;
  times: number[];
  q05: number[];
  q50: number[];
  q95: number[];
}

export interface ScenarioDifference {
  estimate: number;
  /** With common random numbers, from the pairs; null when the runs were independent. */
  pairedSE: number | null;
  /** What independent runs give (or gave), from the same paths. */
  independentSE: number;
  /** 95 % interval from the standard error that applies to how the runs were made. */
  ci: [number, number];
}

export interface ScenarioProbeResult {
  estimate: number;
  standardError: number;
  ci: [number, number];
  paths: number;
  warnings: string[];
  /** This scenario minus the baseline; null for the baseline itself or when either failed. */
  difference: ScenarioDifference | null;
  error: string | null;
}

export interface ScenarioResult {
  name: string;
  overrides: Record<string, number>;
  digest: string;
  probes: ScenarioProbeResult[];
  fan: FanSeries[];
}

export interface ScenariosResult {
  baseline: string;
  commonRandomNumbers: boolean;
  paths: number;
  probes: { id: string; title: string }[];
  scenarios: ScenarioResult[];
}

export interface ScenariosJson {
  id: string;
  kind: 'scenarios';
  baseline: string;
  commonRandomNumbers: boolean;
  table: Record<string, number | string | null>[];
}

/** One row per scenario and probe: the table a scenarios cell shows and exports. */
export function scenariosTable(result: ScenariosResult): Record<string, number | string | null>[] {
  return result.scenarios.flatMap((scenario) =>
    scenario.probes.map((probe, k) => ({
      scenario: scenario.name,
      probe: result.probes[k]?.title ?? '',
      estimate: finiteOrNull(probe.estimate),
      standardError: finiteOrNull(probe.standardError),
      ciLow: finiteOrNull(probe.ci[0]),
      ciHigh: finiteOrNull(probe.ci[1]),
      difference: probe.difference ? finiteOrNull(probe.difference.estimate) : null,
      differencePairedSE: probe.difference?.pairedSE == null ? null : finiteOrNull(probe.difference.pairedSE),
      differenceIndependentSE: probe.difference ? finiteOrNull(probe.difference.independentSE) : null,
      differenceCiLow: probe.difference ? finiteOrNull(probe.difference.ci[0]) : null,
      differenceCiHigh: probe.difference ? finiteOrNull(probe.difference.ci[1]) : null,
      digest: scenario.digest,
      ...(probe.error === null ? {} : { error: probe.error }),
    })),
  );
}

export function scenariosJson(id: string, result: ScenariosResult): ScenariosJson {
  return {
    id,
    kind: 'scenarios',
    baseline: result.baseline,
    commonRandomNumbers: result.commonRandomNumbers,
    table: scenariosTable(result),
  };
}
