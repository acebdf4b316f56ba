import { z } from 'zod';
import { checkExpression } from '../expr';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, expressionSchema, finite, symbolNameSchema } from './fields';
import { freshName } from './helpers';

export const parameterSchema = z.object({
  name: symbolNameSchema,
  /** A number, or an expression of other parameters (circular definitions are rejected by the checker). */
  value: z.union([finite, expressionSchema]),
  unit: z.string().max(40, 'a unit is at most 40 characters').optional(),
  min: finite.optional(),
  max: finite.optional(),
  description: z.string().max(500, 'a description is at most 500 characters').optional(),
});

/**
 * Named parameters with units and ranges. Their names, values and cycles are checked across all
 * params cells at once (shared/sheet/check.ts), since a parameter may be defined by another's.
 */
export const paramsCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('params'),
  params: z.array(parameterSchema).max(200, 'a parameters cell holds at most 200 parameters'),
});

export const paramsKind: CellKindDefinition<'params'> = {
  kind: 'params',
  label: 'Parameters',
  word: 'parameters',
  colour: 'ochre',
  create: ({ id, taken }) => ({
    id,
    kind: 'params',
    params: [{ name: freshName('k', taken), value: 1, description: 'a new parameter' }],
  }),
  title: (cell) => cell.params.map((param) => param.name).join(', '),
  /** The params cells whose parameters this cell's expressions use. */
  reads(cell, { definedIn }) {
    const scope = [...definedIn.keys()];
    const reads: string[] = [];
    for (const parameter of cell.params) {
      if (typeof parameter.value !== 'string') continue;
      const checked = checkExpression(parameter.value, scope);
      if (!checked.ok) continue;
      for (const name of checked.tree.names) {
        const source = definedIn.get(name);
        if (source !== undefined) reads.push(source);
      }
    }
    return reads;
  },
};
