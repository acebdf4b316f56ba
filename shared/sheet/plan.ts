import { checkExpression, evaluate, generateSource, numberSource, type CheckedExpr } from '../expr';
import type { ModelSpec, SimulationPlan, WatchSpec } from '../engine/plan';
import { checkSheet } from './check';
import { isIdentity } from './correlation';
import type { BoundaryRule, ModelCell, SheetDocument, SimulationCell } from './document';
import { SheetIssuesError } from './issues';
import { TIME_NAME } from './names';
import { resolveCheckedParameters } from './resolve';
import { findModel, findSimulation, indexSheet, modelScopes } from './sheet-index';

/**
 * The engine's input for one simulation cell: parameters (overrides applied) folded into the
 * expression sources as literals, state i as `s{i}`, noise j as `w{j}` (exact solutions only),
 * the step count, boundaries in state order, and the extra times and watched levels that the
 * probes reading this simulation need. Throws a SheetIssuesError listing the problems of the
 * cells involved (the simulation, its model, the params cells and its probes).
 */
export function buildSimulationPlan(doc: SheetDocument, simulationCellId: string): SimulationPlan {
  const index = indexSheet(doc);
  const sim = findSimulation(index, simulationCellId);
  if (!sim) throw new Error(`there is no simulation cell '${simulationCellId}'`);

  const probes = doc.cells.filter((c) => c.kind === 'probe' && c.simulation === sim.id);
  const involved = new Set([
    sim.id,
    sim.model,
    ...index.paramsCells.map((c) => c.id),
    ...probes.map((c) => c.id),
  ]);
  const issues = checkSheet(doc).filter((issue) => involved.has(issue.cellId));
  if (issues.length > 0) throw new SheetIssuesError(issues, `simulation '${sim.id}'`);
  const model = findModel(index, sim.model);
  if (!model) throw new Error(`simulation '${sim.id}' names no model cell`); // unreachable after checkSheet

  const params = resolveCheckedParameters(index, sim.overrides, sim.id);
  return {
    model: buildModelSpec(model, params, modelScopes(index, model)),
    method: sim.method,
    t0: sim.t0,
    t1: sim.t1,
    steps: stepCount(sim),
    paths: sim.paths,
    seed: sim.seed,
    saveCount: sim.saveCount,
    samplePaths: sim.samplePaths,
    boundaries: model.states.map(
      (s): BoundaryRule =>
        (Object.hasOwn(sim.boundaries, s.name) ? sim.boundaries[s.name] : undefined) ?? { rule: 'none' },
    ),
    blowupBound: sim.blowupBound ?? null,
    probeTimes: probeTimes(doc, sim),
    watches: watches(doc, sim, model),
  };
}

export function stepCount(sim: SimulationCell): number {
  if (sim.steps !== undefined) return sim.steps;
  return Math.max(1, Math.round((sim.t1 - sim.t0) / (sim.stepSize ?? sim.t1 - sim.t0)));
}

function buildModelSpec(
  model: ModelCell,
  params: Record<string, number>,
  scopes: ReturnType<typeof modelScopes>,
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

  return {
    stateNames: model.states.map((s) => s.name),
    noiseNames: model.noises.map((n) => n.name),
    stateUnits: model.states.map((s) => s.unit ?? ''),
    initial: model.states.map((s) => evaluate(compile(s.initial, scopes.initial), params)),
    params: { ...params },
    calculus: model.calculus,
    drift: model.states.map((s) => generateSource(compile(s.drift, scopes.coefficient), coefficientNames)),
    diffusion: model.states.map((s) =>
      model.noises.map((n) => {
        const text = Object.hasOwn(s.diffusion, n.name) ? s.diffusion[n.name] : undefined;
        return text === undefined ? '0' : generateSource(compile(text, scopes.coefficient), coefficientNames);
      }),
    ),
    correlation:
      model.correlation !== undefined && model.noises.length > 1 && !isIdentity(model.correlation)
        ? model.correlation.map((row) => [...row])
        : null,
    exact: model.states.map((s) =>
      s.exact === undefined || s.exact.trim() === ''
        ? null
        : generateSource(compile(s.exact, scopes.exact), exactNames),
    ),
  };
}

function probeTimes(doc: SheetDocument, sim: SimulationCell): number[] {
  const times = new Set<number>();
  for (const cell of doc.cells) {
    if (cell.kind === 'probe' && cell.simulation === sim.id && cell.time !== undefined) times.add(cell.time);
    // A histogram needs every path's value at its time too, like a probe.
    if (
      cell.kind === 'chart' &&
      cell.simulation === sim.id &&
      cell.view === 'histogram' &&
      cell.time !== undefined
    ) {
      if (cell.time >= sim.t0 && cell.time <= sim.t1) times.add(cell.time);
    }
  }
  times.delete(sim.t1);
  return [...times].sort((a, b) => a - b);
}

function watches(doc: SheetDocument, sim: SimulationCell, model: ModelCell): WatchSpec[] {
  const found = new Map<string, WatchSpec>();
  for (const cell of doc.cells) {
    if (cell.kind !== 'probe' || cell.simulation !== sim.id || cell.level === undefined) continue;
    const state = model.states.findIndex((s) => s.name === cell.state);
    let direction: WatchSpec['direction'];
    if (cell.quantity === 'hit-before' || cell.quantity === 'first-passage')
      direction = cell.direction ?? 'above';
    else if (cell.quantity === 'extinction') direction = 'below';
    else continue;
    found.set(`${state}|${cell.level}|${direction}`, { state, level: cell.level, direction });
  }
  return [...found.values()];
}
