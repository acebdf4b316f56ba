import { z } from 'zod';
import { checkModel } from '../sheet/check-model';
import type { CellKindDefinition } from './kind';
import { cellIdSchema, cellNameSchema, expressionSchema, finite, symbolNameSchema } from './fields';
import { freshName } from './helpers';

export const stateVariableSchema = z.object({
  name: symbolNameSchema,
  /** Initial value: an expression of parameters. */
  initial: expressionSchema,
  unit: z.string().max(40, 'a unit is at most 40 characters').optional(),
  /** Drift coefficient: an expression of parameters, state variables and t. */
  drift: expressionSchema,
  /** Diffusion coefficient per noise source name; a missing entry means 0. */
  diffusion: z.record(z.string(), expressionSchema),
  /**
   * Optional exact solution X_t, used by step-size studies. In scope: parameters, t, each noise
   * source's name standing for its Brownian motion W_t, and each state name standing for its
   * initial value.
   */
  exact: expressionSchema.optional(),
});

export const noiseSourceSchema = z.object({
  name: symbolNameSchema,
  description: z.string().max(200, 'a description is at most 200 characters').optional(),
});

/** An SDE system: state variables with drift and diffusion per noise source, in Itô or Stratonovich form. */
export const modelCellSchema = z.object({
  id: cellIdSchema,
  kind: z.literal('model'),
  name: cellNameSchema.optional(),
  states: z
    .array(stateVariableSchema)
    .min(1, 'a model needs at least one state variable')
    .max(16, 'a model has at most 16 state variables'),
  noises: z.array(noiseSourceSchema).max(16, 'a model has at most 16 noise sources'),
  /** Correlation matrix of the noise sources (m × m, symmetric, unit diagonal, positive definite). */
  correlation: z.array(z.array(finite)).optional(),
  calculus: z.enum(['ito', 'stratonovich']).default('ito'),
});

export const modelKind: CellKindDefinition<'model'> = {
  kind: 'model',
  label: 'Model',
  word: 'model',
  colour: 'teal',
  create({ id, doc, taken }) {
    const state = freshName('x', taken);
    const noise = freshName('W', new Set([...taken, state]));
    const modelCount = doc.cells.filter((cell) => cell.kind === 'model').length;
    return {
      id,
      kind: 'model',
      name: modelCount === 0 ? 'New model' : `New model ${modelCount + 1}`,
      states: [{ name: state, initial: '1', drift: `-${state}`, diffusion: { [noise]: '0.2' } }],
      noises: [{ name: noise }],
      calculus: 'ito',
    };
  },
  title: (cell) => cell.name ?? cell.states.map((state) => state.name).join(', '),
  reads: (_cell, { paramsCellIds }) => [...paramsCellIds],
  check: (cell, { index, parameterValues }) => checkModel(index, cell, parameterValues),
};
