import { z } from 'zod';
import type { ScenariosResult } from './scenarios-result';
import type { SweepResult } from './sweep-result';

/**
 * The summaries of sweeps and scenarios saved with a version (see version-results.ts): their
 * results as they are (they keep no paths), with non-finite numbers as null, and a scenario's
 * fans on at most `maxTimes` saved times. Restored, a missing number is NaN again.
 */

const value = z.number().nullable();
const text = z.string().max(2000);
const name = z.string().max(64);
const interval = z.tuple([value, value]);
const MAX_POINTS = 400;

const sweepPointSchema = z.object({
  values: z.array(z.number()).max(2),
  estimate: value,
  standardError: value,
  ci: interval,
  paths: z.number().int().min(0),
  digest: z.string().max(32),
  warnings: z.array(text).max(20),
  step: z.object({ estimate: value, pairedSE: value, independentSE: value }).nullable(),
  error: text.nullable(),
});
const curvePointSchema = z.object({ x: z.number(), estimate: value, ci: interval });

export const sweepSummarySchema = z.object({
  kind: z.literal('sweep'),
  seconds: z.number().min(0),
  result: z.object({
    parameters: z.array(name).max(2),
    axisValues: z.array(z.array(z.number()).max(MAX_POINTS)).max(2),
    probeTitle: text,
    commonRandomNumbers: z.boolean(),
    pathsPerPoint: z.number().int().min(0),
    kernelInputs: z.array(name).max(200),
    points: z.array(sweepPointSchema).max(MAX_POINTS),
    target: z
      .object({
        target: z.number(),
        bracketed: z.boolean(),
        root: value,
        interval: z.tuple([z.number(), z.number()]).nullable(),
        openBelow: z.boolean(),
        openAbove: z.boolean(),
        refined: z.array(curvePointSchema).max(20),
        message: text,
      })
      .nullable(),
  }),
});

const series = z.array(value).max(10_001);
const scenarioProbeSchema = z.object({
  estimate: value,
  standardError: value,
  ci: interval,
  paths: z.number().int().min(0),
  warnings: z.array(text).max(20),
  difference: z.object({ estimate: value, pairedSE: value, independentSE: value, ci: interval }).nullable(),
  error: text.nullable(),
});

export const scenariosSummarySchema = z.object({
  kind: z.literal('scenarios'),
  seconds: z.number().min(0),
  result: z.object({
    baseline: text,
    commonRandomNumbers: z.boolean(),
    paths: z.number().int().min(0),
    probes: z.array(z.object({ id: name, title: text })).max(8),
    scenarios: z
      .array(
        z.object({
          name: text,
          overrides: z.record(name, z.number()),
          digest: z.string().max(32),
          probes: z.array(scenarioProbeSchema).max(8),
          fan: z
            .array(
              z.object({ state: name, unit: text, times: series, q05: series, q50: series, q95: series }),
            )
            .max(20),
        }),
      )
      .max(12),
  }),
});

type SweepSummary = z.infer<typeof sweepSummarySchema>;
type ScenariosSummary = z.infer<typeof scenariosSummarySchema>;

const toJson = (x: number): number | null => (Number.isFinite(x) ? x : null);
const fromJson = (x: number | null): number => x ?? Number.NaN;
const pair = (ci: readonly [number, number]): [number | null, number | null] => [
  toJson(ci[0]),
  toJson(ci[1]),
];
const unpair = (ci: readonly [number | null, number | null]): [number, number] => [
  fromJson(ci[0]),
  fromJson(ci[1]),
];

export function summariseSweep(result: SweepResult, seconds: number): SweepSummary {
  return {
    kind: 'sweep',
    seconds,
    result: {
      ...result,
      points: result.points.map((point) => ({
        ...point,
        estimate: toJson(point.estimate),
        standardError: toJson(point.standardError),
        ci: pair(point.ci),
        step: point.step && {
          estimate: toJson(point.step.estimate),
          pairedSE: point.step.pairedSE === null ? null : toJson(point.step.pairedSE),
          independentSE: toJson(point.step.independentSE),
        },
      })),
      target: result.target && {
        ...result.target,
        root: result.target.root === null ? null : toJson(result.target.root),
        refined: result.target.refined.map((p) => ({ x: p.x, estimate: toJson(p.estimate), ci: pair(p.ci) })),
      },
    },
  };
}

export function restoredSweep(summary: SweepSummary): SweepResult {
  const { result } = summary;
  return {
    ...result,
    points: result.points.map((point) => ({
      ...point,
      estimate: fromJson(point.estimate),
      standardError: fromJson(point.standardError),
      ci: unpair(point.ci),
      step: point.step && {
        estimate: fromJson(point.step.estimate),
        pairedSE: point.step.pairedSE,
        independentSE: fromJson(point.step.independentSE),
      },
    })),
    target: result.target && {
      ...result.target,
      refined: result.target.refined.map((p) => ({
        x: p.x,
        estimate: fromJson(p.estimate),
        ci: unpair(p.ci),
      })),
    },
  };
}

/** `kept`: the saved-time indices to keep of each fan (version-results.ts, keptTimeIndices). */
export function summariseScenarios(
  result: ScenariosResult,
  seconds: number,
  kept: (count: number) => number[],
): ScenariosSummary {
  return {
    kind: 'scenarios',
    seconds,
    result: {
      ...result,
      scenarios: result.scenarios.map((scenario) => ({
        ...scenario,
        probes: scenario.probes.map((probe) => ({
          ...probe,
          estimate: toJson(probe.estimate),
          standardError: toJson(probe.standardError),
          ci: pair(probe.ci),
          difference: probe.difference && {
            estimate: toJson(probe.difference.estimate),
            pairedSE: probe.difference.pairedSE === null ? null : toJson(probe.difference.pairedSE),
            independentSE: toJson(probe.difference.independentSE),
            ci: pair(probe.difference.ci),
          },
        })),
        fan: scenario.fan.map((fan) => {
          const at = kept(fan.times.length);
          const pick = (values: number[]) => at.map((k) => toJson(values[k]!));
          return {
            ...fan,
            times: pick(fan.times),
            q05: pick(fan.q05),
            q50: pick(fan.q50),
            q95: pick(fan.q95),
          };
        }),
      })),
    },
  };
}

export function restoredScenarios(summary: ScenariosSummary): ScenariosResult {
  const { result } = summary;
  const numbers = (values: (number | null)[]) => values.map(fromJson);
  return {
    ...result,
    scenarios: result.scenarios.map((scenario) => ({
      ...scenario,
      probes: scenario.probes.map((probe) => ({
        ...probe,
        estimate: fromJson(probe.estimate),
        standardError: fromJson(probe.standardError),
        ci: unpair(probe.ci),
        difference: probe.difference && {
          estimate: fromJson(probe.difference.estimate),
          pairedSE: probe.difference.pairedSE,
          independentSE: fromJson(probe.difference.independentSE),
          ci: unpair(probe.difference.ci),
        },
      })),
      fan: scenario.fan.map((fan) => ({
        ...fan,
        times: numbers(fan.times),
        q05: numbers(fan.q05),
        q50: numbers(fan.q50),
        q95: numbers(fan.q95),
      })),
    })),
  };
}
