import { z } from 'zod';
import type { StudyOptions } from '../engine/result';
import { checkReader } from '../sheet/check-readers';
import type { StudyCell } from '../sheet/document';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, symbolNameSchema } from './fields';
import { firstStateOf, nearestCell, needsSimulation, secondsSince } from './helpers';
import { stateIndex } from './state-index';

/** A step-size study: strong and weak error against step size, with fitted orders. */
export const studyCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('study'),
  simulation: cellIdSchema,
  /** Number of step sizes, each half the one before. */
  levels: z.number().int().min(3).max(12).default(5),
  /** Steps at the coarsest level; the finest has coarsestSteps · 2^(levels−1). */
  coarsestSteps: z.number().int().min(1).max(100_000).default(8),
  paths: z.number().int().min(10).max(1_000_000).default(2000),
  state: symbolNameSchema.optional(),
  reference: z.enum(['auto', 'exact', 'finest']).default('auto'),
});

/** The engine's view of a study cell; without a state named, the first state is measured. */
export function studyOptions(cell: StudyCell, stateNames: readonly string[]): StudyOptions {
  return {
    levels: cell.levels,
    coarsestSteps: cell.coarsestSteps,
    paths: cell.paths,
    state: stateIndex(stateNames, cell.state, 'study'),
    reference: cell.reference,
  };
}

export const studyKind: CellKindDefinition<'study'> = {
  kind: 'study',
  label: 'Step-size study',
  word: 'step-size study',
  colour: 'slate',
  cannotAdd: needsSimulation,
  create({ id, doc, index }) {
    const simulation = nearestCell(doc, 'simulation', index);
    return {
      id,
      kind: 'study',
      simulation: simulation?.id ?? 'simulation',
      levels: 5,
      coarsestSteps: 8,
      paths: 2000,
      state: firstStateOf(doc, simulation),
      reference: 'auto',
    };
  },
  title: (cell) => `${cell.levels} step sizes, ${cell.paths} paths`,
  reads: (cell) => [cell.simulation],
  check: (cell, { index }) => checkReader(index, cell),
  run: {
    rank: 1,
    async execute(cell, context) {
      const plan = context.plan(cell.simulation);
      const started = performance.now();
      const result = await context.executor.runStudy(
        plan,
        studyOptions(cell, plan.model.stateNames),
        context.onProgress,
      );
      return { kind: 'study', plan, result, finishedAt: new Date(), seconds: secondsSince(started) };
    },
  },
};
