import { z } from 'zod';
import { firstInvisibleCharacter } from '../expr/invisible';

/** Field schemas that several cell kinds share. */

/** Stable cell ids survive edits, reordering and forks; comments point at them. */
export const cellIdSchema = z
  .string()
  .regex(/^[A-Za-z0-9_-]{1,64}$/, 'a cell id is 1–64 letters, digits, "-" or "_"');

/**
 * A name usable inside expressions: a parameter, a state variable or a noise source. Letters of
 * any alphabet (Unicode general category L: θ, σ, μ, Ω, ж, ø …), the digits 0–9 and "_"; it
 * starts with a letter or "_"; at most 32 characters. Everything else is refused, including
 * subscript and superscript digits (₁, ²: not letters), combining accents (type the composed
 * letter) and invisible characters (zero-width joiners, direction marks), so that a name reads
 * as it is. Generated code never contains a name: the plan builder replaces each one.
 */
const SYMBOL_NAME_RULE =
  'a name starts with a letter (any alphabet, e.g. θ or x) or "_", then has only letters, digits 0–9 and "_", at most 32 characters (no spaces, accents typed separately or subscript digits such as ₁: write θ1 or θ_1)';

/** A letter that JavaScript also reads as the start of a name (U+2E2F, a letter, is not one). */
const LETTER = String.raw`(?:(?=\p{ID_Start})\p{L})`;
const SYMBOL_NAME = new RegExp(String.raw`^(?:${LETTER}|_)(?:${LETTER}|[0-9_]){0,31}$`, 'u');

export const symbolNameSchema = z
  .string()
  .regex(SYMBOL_NAME, SYMBOL_NAME_RULE)
  // Hangul fillers are letters that show nothing.
  .refine((name) => firstInvisibleCharacter(name) === null, SYMBOL_NAME_RULE);

/** Text of a restricted expression (checked by the expression compiler, not here). */
export const expressionSchema = z.string().max(2000, 'an expression is at most 2000 characters');

export const finite = z.number().refine(Number.isFinite, 'must be a finite number');

/** The name a person gives a model or a simulation, shown in pickers and card titles. */
export const cellNameSchema = z.string().max(80, 'a name is at most 80 characters');
