import { checkExpression, evaluate, generateSource, numberSource, type CheckedExpr } from '../expr';
import type { ModelSpec, SimulationPlan, WatchSpec } from '../engine/plan';
import { kindOf } from '../cells/registry';
import { checkSheet } from './check';
import { isIdentity } from './correlation';
import type { BoundaryRule, ModelCell, SheetDocument, SimulationCell } from './document';
import { SheetIssuesError } from './issues';
import { TIME_NAME } from './names';
import { stepCount } from './step-count';

export { stepCount };
import { resolveCheckedParameters } from './resolve';
import { findModel, findSimulation, indexSheet, modelScopes } from './sheet-index';

/**
 * The engine's input for one simulation cell: parameters (overrides applied) folded into the
 * expression sources as literals, state i as `s{i}`, noise j as `w{j}` (exact solutions only),
 * the step count, boundaries in state order, and the extra times and watched levels that the
 * probes reading this simulation need. Throws a SheetIssuesError listing the problems of the
 * cells involved (the simulation, its model, the params cells and its probes).
 */
export function buildSimulationPlan(
  doc: SheetDocument,
  simulationCellId: string,
  point: PlanPoint = {},
): SimulationPlan {
  const index = indexSheet(doc);
  const sim = findSimulation(index, simulationCellId);
  if (!sim) throw new Error(`there is no simulation cell '${simulationCellId}'`);

  const model = findModel(index, sim.model);
  const asks = model ? simulationRequests(doc, sim, model) : { askingCellIds: [], times: [], watches: [] };
  const involved = new Set([sim.id, sim.model, ...index.paramsCells.map((c) => c.id), ...asks.askingCellIds]);
  const issues = checkSheet(doc).filter((issue) => involved.has(issue.cellId));
  if (issues.length > 0) throw new SheetIssuesError(issues, `simulation '${sim.id}'`);
  if (!model) throw new Error(`simulation '${sim.id}' names no model cell`); // unreachable after checkSheet

  const params = resolveCheckedParameters(index, { ...sim.overrides, ...point.overrides }, sim.id);
  return {
    model: buildModelSpec(model, params, modelScopes(index, model), point.inputNames ?? []),
    method: sim.method,
    t0: sim.t0,
    t1: sim.t1,
    steps: stepCount(sim),
    paths: point.paths ?? sim.paths,
    seed: point.seed ?? sim.seed,
    saveCount: sim.saveCount,
    samplePaths: sim.samplePaths,
    boundaries: model.states.map(
      (s): BoundaryRule =>
        (Object.hasOwn(sim.boundaries, s.name) ? sim.boundaries[s.name] : undefined) ?? { rule: 'none' },
    ),
    blowupBound: sim.blowupBound ?? null,
    // No cell reads running extremes: a probe of hitting a level asks for a watch of it.
    recordExtremes: false,
    probeTimes: asks.times,
    watches: asks.watches,
  };
}

/**
 * One point of a run of many (a sweep point, a scenario): parameter overrides on top of the
 * simulation's own, and the parameters that vary between points, compiled as kernel inputs
 * (ModelSpec.inputForm; none: the plain literal path). Paths and seed replace the simulation's.
 */
export interface PlanPoint {
  overrides?: Readonly<Record<string, number>>;
  inputNames?: readonly string[];
  paths?: number;
  seed?: number;
}

function buildModelSpec(
  model: ModelCell,
  params: Record<string, number>,
  scopes: ReturnType<typeof modelScopes>,
  inputNames: readonly string[],
): ModelSpec {
  const parameterSources: Record<string, string> = {};
  for (const [name, value] of Object.entries(params)) {
    const literal = numberSource(value); // negatives come bracketed already
    parameterSources[name] = literal.startsWith('(') ? literal : `(${literal})`;
  }
  const stateSources: Record<string, string> = {};
  model.states.forEach((s, i) => (stateSources[s.name] = `s${i}`));
  const noiseSources: Record<string, string> = {};
  model.noises.forEach((n, j) => (noiseSources[n.name] = `w${j}`));
  const coefficientNames = { ...parameterSources, ...stateSources, [TIME_NAME]: TIME_NAME };
  const exactNames = { ...coefficientNames, ...noiseSources };

  const compile = (text: string, scope: readonly string[]): CheckedExpr => {
    const checked = checkExpression(text, scope);
    if (!checked.ok)
      throw new Error(`unchecked expression reached the plan builder: ${checked.errors[0]?.message ?? ''}`);
    return checked.tree;
  };

  const coefficients = (names: Readonly<Record<string, string>>) => ({
    drift: model.states.map((s) => generateSource(compile(s.drift, scopes.coefficient), names)),
    diffusion: model.states.map((s) =>
      model.noises.map((n) => {
        const text = Object.hasOwn(s.diffusion, n.name) ? s.diffusion[n.name] : undefined;
        return text === undefined ? '0' : generateSource(compile(text, scopes.coefficient), names);
      }),
    ),
  });
  const plain = coefficients(coefficientNames);
  const inputs = inputNames.filter((name) => Object.hasOwn(params, name));
  const inputSources: Record<string, string> = {};
  inputs.forEach((name, k) => (inputSources[name] = `pv${k}`));

  return {
    stateNames: model.states.map((s) => s.name),
    noiseNames: model.noises.map((n) => n.name),
    stateUnits: model.states.map((s) => s.unit ?? ''),
    initial: model.states.map((s) => evaluate(compile(s.initial, scopes.initial), params)),
    params: { ...params },
    calculus: model.calculus,
    drift: plain.drift,
    diffusion: plain.diffusion,
    correlation:
      model.correlation !== undefined && model.noises.length > 1 && !isIdentity(model.correlation)
        ? model.correlation.map((row) => [...row])
        : null,
    exact: model.states.map((s) =>
      s.exact === undefined || s.exact.trim() === ''
        ? null
        : generateSource(compile(s.exact, scopes.exact), exactNames),
    ),
    ...(inputs.length === 0
      ? {}
      : { inputForm: { names: inputs, ...coefficients({ ...coefficientNames, ...inputSources }) } }),
  };
}

/**
 * The extra times and watched levels that the cells reading this simulation ask for (each kind's
 * `asksOf`), without duplicates, and which cells asked.
 */
function simulationRequests(doc: SheetDocument, sim: SimulationCell, model: ModelCell) {
  const askingCellIds: string[] = [];
  const times = new Set<number>();
  const watches = new Map<string, WatchSpec>();
  for (const cell of doc.cells) {
    const asks = kindOf(cell).asksOf?.(cell, sim, model);
    if (!asks) continue;
    askingCellIds.push(cell.id);
    for (const time of asks.times) times.add(time);
    for (const watch of asks.watches) {
      watches.set(`${watch.state}|${watch.level}|${watch.direction}|${watch.correction}`, watch);
    }
  }
  times.delete(sim.t1);
  return { askingCellIds, times: [...times].sort((a, b) => a - b), watches: [...watches.values()] };
}

/**
 * The parameters whose resolved values differ between the points of a run of many (each point's
 * overrides on top of the simulation's own): the ones to compile as kernel inputs. A parameter
 * defined from a swept one varies with it and is listed too.
 */
export function varyingParameters(
  doc: SheetDocument,
  simulationCellId: string,
  points: readonly Readonly<Record<string, number>>[],
): string[] {
  const index = indexSheet(doc);
  const sim = findSimulation(index, simulationCellId);
  if (!sim) throw new Error(`there is no simulation cell '${simulationCellId}'`);
  const resolved = points.map((overrides) =>
    resolveCheckedParameters(index, { ...sim.overrides, ...overrides }, sim.id),
  );
  const first = resolved[0] ?? {};
  return Object.keys(first).filter((name) =>
    resolved.some((values) => !Object.is(values[name], first[name])),
  );
}
