import { z } from 'zod';
import { checkReader } from '../sheet/check-readers';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, finite, symbolNameSchema } from './fields';
import { firstStateOf, nearestCell, needsSimulation } from './helpers';

export const chartViewSchema = z.enum(['paths', 'fan', 'histogram', 'phase']);

/** A picture of one simulation's result: sample paths, a quantile fan, a histogram or a phase plot. */
export const chartCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('chart'),
  simulation: cellIdSchema,
  view: chartViewSchema,
  state: symbolNameSchema,
  /** Second state variable for a phase plot. */
  stateY: symbolNameSchema.optional(),
  pathCount: z.number().int().min(1).max(1000).optional(),
  /** Time of a histogram; default t1. */
  time: finite.optional(),
  bins: z.number().int().min(5).max(400).optional(),
  title: z.string().max(120, 'a chart title is at most 120 characters').optional(),
});

export const chartKind: CellKindDefinition<'chart'> = {
  kind: 'chart',
  label: 'Chart',
  word: 'chart',
  colour: 'moss',
  cannotAdd: needsSimulation,
  create({ id, doc, index }) {
    const simulation = nearestCell(doc, 'simulation', index);
    return {
      id,
      kind: 'chart',
      simulation: simulation?.id ?? 'simulation',
      view: 'fan',
      state: firstStateOf(doc, simulation),
    };
  },
  title: (cell) => cell.title ?? `${cell.view} of ${cell.state}`,
  reads: (cell) => [cell.simulation],
  check: (cell, { index }) => checkReader(index, cell),
  /** A histogram needs every path's value at its time too, like a probe. */
  asksOf(cell, simulation) {
    if (cell.simulation !== simulation.id || cell.view !== 'histogram' || cell.time === undefined)
      return null;
    if (!(cell.time >= simulation.t0 && cell.time <= simulation.t1)) return null;
    return { times: [cell.time], watches: [] };
  },
  showsOutputOf: (cell) => cell.simulation,
};
