import { checkExpression, evaluate, generateSource, numberSource, type CheckedExpr } from '../expr';
import type { ObservedData } from '../data/observed';
import type { FitCell, ModelCell, SheetDocument } from '../sheet/document';
import { isIdentity } from '../sheet/correlation';
import { TIME_NAME } from '../sheet/names';
import { analyseParameters, evaluateParameters } from '../sheet/parameters';
import { findModel, indexSheet, modelScopes, type SheetIndex } from '../sheet/sheet-index';
import type { FitProblem, FitSeries } from './problem';
import { recogniseExactForm, type Recognition } from './recognise';

/**
 * Turns a fit cell, its model, the sheet's parameters and a data cell's observations into the
 * plain-data problem the executor runs (fit-model.ts). Parameters become `p0…` in dependency
 * order, states `s0…`; every source is generated from a checked tree. Throws with a plain message
 * when the sheet cannot be fitted as it is (it imports nothing that imports the cell registry).
 */

function compile(text: string, scope: readonly string[], what: string): CheckedExpr {
  const checked = checkExpression(text, scope);
  if (!checked.ok) throw new Error(`${what}: ${checked.errors[0]?.message ?? 'not a valid expression'}`);
  return checked.tree;
}

interface ModelTreesAndScope {
  drift: CheckedExpr[];
  diffusion: (CheckedExpr | null)[][];
}

function modelTrees(index: SheetIndex, model: ModelCell): ModelTreesAndScope {
  const scope = modelScopes(index, model).coefficient;
  return {
    drift: model.states.map((s) => compile(s.drift, scope, `the drift of ${s.name}`)),
    diffusion: model.states.map((s) =>
      model.noises.map((n) => {
        const text = Object.hasOwn(s.diffusion, n.name) ? s.diffusion[n.name] : undefined;
        return text === undefined || text.trim() === ''
          ? null
          : compile(text, scope, `the diffusion of ${s.name} by ${n.name}`);
      }),
    ),
  };
}

/**
 * Whether the exact likelihood applies to a model, and why not: the tree analysis of
 * recognise.ts, then for geometric Brownian motion a check with numbers that the drift and the
 * diffusion vanish at zero (at the parameters' values and at a second, shifted set).
 */
export function exactAvailability(doc: SheetDocument, modelId: string): Recognition {
  const index = indexSheet(doc);
  const model = findModel(index, modelId);
  if (!model) return { form: null, reason: 'the fit names no model' };
  let trees: ModelTreesAndScope;
  try {
    trees = modelTrees(index, model);
  } catch (error) {
    return { form: null, reason: error instanceof Error ? error.message : String(error) };
  }
  const recognition = recogniseExactForm({
    stateNames: model.states.map((s) => s.name),
    drift: trees.drift.map((tree) => tree.root),
    diffusion: trees.diffusion.map((row) => row.map((tree) => tree?.root ?? null)),
  });
  if (recognition.form === null) return recognition;
  if (model.calculus === 'stratonovich' && recognition.form !== 'linear')
    return {
      form: null,
      reason: 'the model is in Stratonovich form with a diffusion that depends on the state',
    };
  if (recognition.form === 'gbm') {
    const values = evaluateParameters(index, analyseParameters(index)).values;
    const shifted = Object.fromEntries(Object.entries(values).map(([k, v]) => [k, v * 1.37 + 0.11]));
    const state = model.states[0]!.name;
    const vanishes = [values, shifted].every((params) => {
      const scope = { ...params, [state]: 0, [TIME_NAME]: 0 };
      const atZero = (tree: CheckedExpr | null) => tree === null || evaluate(tree, scope) === 0;
      return atZero(trees.drift[0]!) && trees.diffusion[0]!.every(atZero);
    });
    if (!vanishes)
      return {
        form: null,
        reason:
          'the drift or the diffusion does not vanish at zero, so the model is not geometric Brownian motion and no closed-form transition is known',
      };
  }
  return recognition;
}

export function buildFitProblem(doc: SheetDocument, cell: FitCell, observed: ObservedData): FitProblem {
  const index = indexSheet(doc);
  const model = findModel(index, cell.model);
  if (!model) throw new Error(`the fit names no model cell '${cell.model}'`);
  const analysis = analyseParameters(index);
  if (analysis.issues.length > 0 || analysis.order === null)
    throw new Error('the parameters have problems: fix them in the parameters cell first');
  const { values } = evaluateParameters(index, analysis);

  const estimated = cell.parameters.map((name) => {
    const entry = index.parameters.get(name);
    if (!entry) throw new Error(`there is no parameter '${name}' to estimate`);
    if (typeof entry.parameter.value !== 'number')
      throw new Error(
        `${name} is defined by an expression; only a parameter with a plain number can be estimated`,
      );
    return {
      name,
      unit: entry.parameter.unit ?? '',
      start: entry.parameter.value,
      lower: entry.parameter.min ?? null,
      upper: entry.parameter.max ?? null,
    };
  });

  const order = analysis.order;
  const ids: Record<string, string> = {};
  order.forEach((name, i) => (ids[name] = `p${i}`));
  const body = order
    .map((name, i) => {
      const e = cell.parameters.indexOf(name);
      if (e >= 0) return `const p${i} = theta[${e}];`;
      const tree = analysis.trees.get(name);
      const value = values[name];
      if (tree) return `const p${i} = ${generateSource(tree, ids)};`;
      if (value === undefined) throw new Error(`parameter '${name}' has no value`);
      return `const p${i} = ${numberSource(value)};`;
    })
    .join('\n');

  const availability = exactAvailability(doc, model.id);
  if (cell.method === 'exact' && availability.form === null)
    throw new Error(
      `the exact likelihood is not available for this model: ${availability.reason ?? 'no closed form'}. Pick the Euler pseudo-likelihood or the simulated likelihood`,
    );
  if (model.calculus === 'stratonovich' && availability.form !== 'linear')
    throw new Error(
      'the fit reads models in Itô form; this model is in Stratonovich form with a state-dependent diffusion: write its Itô drift and switch the model to Itô',
    );
  const trees = modelTrees(index, model);
  const names = { ...ids, [TIME_NAME]: TIME_NAME } as Record<string, string>;
  model.states.forEach((s, i) => (names[s.name] = `s${i}`));

  return {
    method: cell.method,
    exactForm: availability.form,
    model: {
      stateNames: model.states.map((s) => s.name),
      noiseCount: model.noises.length,
      parameterCount: order.length,
      parameterBody: body,
      drift: trees.drift.map((tree) => generateSource(tree, names)),
      diffusion: trees.diffusion.map((row) => row.map((tree) => (tree ? generateSource(tree, names) : '0'))),
      correlation:
        model.correlation !== undefined && model.noises.length > 1 && !isIdentity(model.correlation)
          ? model.correlation.map((row) => [...row])
          : null,
    },
    parameters: estimated,
    ...fitSeries(model, observed),
    starts: cell.starts,
    simulated: { subSteps: cell.subSteps, draws: cell.draws, seed: cell.seed },
  };
}

/** Every state observed at each kept time: rows with a missing value are dropped (and counted). */
function fitSeries(model: ModelCell, observed: ObservedData): { series: FitSeries[]; droppedRows: number } {
  const states = model.states.map((s) => s.name);
  const missing = states.filter((state) => !observed.columns.some((c) => c.state === state));
  if (missing.length > 0)
    throw new Error(
      `the data observe no ${missing.join(', ')}: a fit needs every state of the model observed (map a column to each in the data cell)`,
    );
  let droppedRows = 0;
  const series = observed.series.map((s): FitSeries => {
    const times: number[] = [];
    const values: number[][] = [];
    s.times.forEach((time, r) => {
      const row = states.map((state) => s.values[state]?.[r] ?? null);
      if (row.some((v) => v === null)) {
        droppedRows++;
        return;
      }
      times.push(time);
      values.push(row as number[]);
    });
    return { group: s.group, times, values };
  });
  return { series, droppedRows };
}
