import { z } from 'zod';
import { checkExpression } from '../expr';
import { buildFitProblem, exactAvailability } from '../fit/build-problem';
import { FIT_METHODS } from '../fit/problem';
import { startProblem } from '../fit/transform';
import type { FitCell, ModelCell, SheetDocument } from '../sheet/document';
import type { SheetIssue } from '../sheet/issues';
import { findModel, indexSheet, modelScopes, wrongReference, type SheetIndex } from '../sheet/sheet-index';
import type { CellKindDefinition, CheckContext } from './kind';
import { cellIdSchema, symbolNameSchema } from './fields';
import { nearestCell, secondsSince } from './helpers';

/**
 * Parameter estimation: maximum likelihood of a model's parameters from a data cell's observed
 * series, by the exact transition (where the model has a closed form), the Euler
 * pseudo-likelihood, or the simulated likelihood with sub-steps. Starting values and bounds come
 * from the params cell; the estimates go back there through "Use these values".
 */
export const fitCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('fit'),
  /** The data cell whose observations are fitted. */
  data: cellIdSchema,
  /** The model fitted; the data cell must observe its states. */
  model: cellIdSchema,
  /** Parameters estimated; the others keep their values. */
  parameters: z.array(symbolNameSchema).max(20, 'a fit estimates at most 20 parameters'),
  method: z.enum(FIT_METHODS).default('euler'),
  /** Optimiser starts: the params cell's values, then spread-out starts. */
  starts: z.number().int().min(1, 'at least one start').max(20, 'at most 20 starts').default(1),
  /** Simulated likelihood: sub-steps per observation interval. */
  subSteps: z.number().int().min(1, 'at least one sub-step').max(64, 'at most 64 sub-steps').default(8),
  /** Simulated likelihood: simulated paths per observation interval. */
  draws: z.number().int().min(2, 'at least 2 draws').max(1024, 'at most 1024 draws').default(32),
  seed: z.number().int().min(0).max(2_147_483_647).default(1),
});

export const FIT_METHOD_LABELS: Record<FitCell['method'], string> = {
  exact: 'exact likelihood',
  euler: 'Euler pseudo-likelihood',
  simulated: 'simulated likelihood',
};

/** The parameters a model's drift and diffusion read, in the sheet's order. */
export function parametersOfModel(index: SheetIndex, model: ModelCell): string[] {
  const scope = modelScopes(index, model).coefficient;
  const used = new Set<string>();
  for (const state of model.states)
    for (const text of [state.drift, ...Object.values(state.diffusion)]) {
      const checked = checkExpression(text, scope);
      if (checked.ok) for (const name of checked.tree.names) used.add(name);
    }
  return index.parameterNames.filter((name) => used.has(name));
}

function checkFit(cell: FitCell, { index }: CheckContext): SheetIssue[] {
  const issues: SheetIssue[] = [];
  const issue = (path: (string | number)[], message: string) =>
    issues.push({ cellId: cell.id, path, message });
  const data = index.cellsById.get(cell.data);
  if (data?.kind !== 'data') issue(['data'], wrongReference(index, cell.data, 'data'));
  const model = findModel(index, cell.model);
  if (!model) {
    issue(['model'], wrongReference(index, cell.model, 'model'));
    return issues;
  }
  if (data?.kind === 'data' && data.model !== model.id)
    issue(['data'], `data cell '${data.id}' observes model '${data.model}', not '${model.id}'`);
  // No parameter picked yet is a step to take, not a fault: the run says so.
  const used = new Set(parametersOfModel(index, model));
  const seen = new Set<string>();
  cell.parameters.forEach((name, i) => {
    const entry = index.parameters.get(name);
    if (seen.has(name)) issue(['parameters', i], `${name} is listed twice`);
    seen.add(name);
    if (!entry) {
      issue(['parameters', i], `there is no parameter '${name}'`);
      return;
    }
    if (typeof entry.parameter.value !== 'number') {
      issue(['parameters', i], `${name} is defined by an expression; only a plain number can be estimated`);
      return;
    }
    if (!used.has(name))
      issue(
        ['parameters', i],
        `the model's drift and diffusion do not use ${name}, so the data cannot tell its value`,
      );
    const start = startProblem({
      name,
      unit: '',
      start: entry.parameter.value,
      lower: entry.parameter.min ?? null,
      upper: entry.parameter.max ?? null,
    });
    if (start) issue(['parameters', i], start);
  });
  if (cell.method === 'exact') {
    const availability = exactAvailability(index.doc, model.id);
    if (availability.form === null)
      issue(
        ['method'],
        `the exact likelihood is not available: ${availability.reason ?? 'no closed form'}; pick the Euler pseudo-likelihood or the simulated likelihood`,
      );
  }
  return issues;
}

function cannotAddFit(doc: SheetDocument, index: number): string | null {
  if (!nearestCell(doc, 'data', index)) return 'add a data cell first';
  if (!nearestCell(doc, 'params', index)) return 'add a parameters cell first';
  return null;
}

export const fitKind: CellKindDefinition<'fit'> = {
  kind: 'fit',
  label: 'Fit',
  word: 'fit',
  colour: 'olive',
  cannotAdd: cannotAddFit,
  create({ id, doc, index }) {
    const data = nearestCell(doc, 'data', index);
    const modelId = data?.model ?? nearestCell(doc, 'model', index)?.id ?? 'model';
    const sheet = indexSheet(doc);
    const model = sheet.cellsById.get(modelId);
    const parameters =
      model?.kind === 'model'
        ? parametersOfModel(sheet, model).filter(
            (name) => typeof sheet.parameters.get(name)?.parameter.value === 'number',
          )
        : [];
    const exact = model?.kind === 'model' && exactAvailability(doc, model.id).form !== null;
    return {
      id,
      kind: 'fit',
      data: data?.id ?? 'data',
      model: modelId,
      parameters,
      method: exact ? 'exact' : 'euler',
      starts: 1,
      subSteps: 8,
      draws: 32,
      seed: 1,
    };
  },
  title: (cell) =>
    `${cell.parameters.length > 0 ? cell.parameters.join(', ') : 'no parameters'} by ${FIT_METHOD_LABELS[cell.method]}`,
  reads: (cell, { paramsCellIds }) => [cell.data, cell.model, ...paramsCellIds],
  check: checkFit,
  run: {
    rank: 1,
    needs: (cell) => [cell.data],
    async execute(cell, context) {
      const source = context.currentOutput(cell.data);
      if (source?.kind !== 'data') {
        const reason =
          source?.kind === 'error'
            ? `its data cell failed: ${source.message}`
            : 'its data cell has no observations';
        throw new Error(`cannot fit: ${reason}`);
      }
      if (cell.parameters.length === 0) throw new Error('pick at least one parameter to estimate');
      if (!context.executor.runFit) throw new Error('this runner cannot fit models');
      const problem = buildFitProblem(context.doc, cell, source.observed);
      const started = performance.now();
      const result = await context.executor.runFit(problem, context.onProgress);
      return { kind: 'fit', result, finishedAt: new Date(), seconds: secondsSince(started) };
    },
  },
};
