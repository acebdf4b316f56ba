import { z } from 'zod';

/** Field schemas that several cell kinds share. */

/** Stable cell ids survive edits, reordering and forks; comments point at them. */
export const cellIdSchema = z
  .string()
  .regex(/^[A-Za-z0-9_-]{1,64}$/, 'a cell id is 1–64 letters, digits, "-" or "_"');

/** A name usable inside expressions: a parameter, a state variable or a noise source. */
export const symbolNameSchema = z
  .string()
  .regex(
    /^[A-Za-z_][A-Za-z0-9_]{0,31}$/,
    'a name starts with a letter or "_" and has only letters, digits and "_"',
  );

/** Text of a restricted expression (checked by the expression compiler, not here). */
export const expressionSchema = z.string().max(2000, 'an expression is at most 2000 characters');

export const finite = z.number().refine(Number.isFinite, 'must be a finite number');

/** The name a person gives a model or a simulation, shown in pickers and card titles. */
export const cellNameSchema = z.string().max(80, 'a name is at most 80 characters');
