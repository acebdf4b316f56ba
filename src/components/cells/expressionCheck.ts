import { checkExpression } from '@shared/expr';
import { EXPRESSION_CONSTANTS, EXPRESSION_FUNCTIONS } from '@shared/expr/functions';

/** A name an expression may use, with what it is, for completion and checking. */
export interface ScopeName {
  name: string;
  kind: 'parameter' | 'state' | 'noise' | 'time' | 'constant' | 'function';
  /** Shown beside the completion: a unit, a value, a function's doc. */
  detail?: string;
}

export interface ExpressionProblem {
  from: number;
  to: number;
  message: string;
}

/** Names no user-defined symbol may take: the time, the constants and the functions. */
export const RESERVED_NAMES: readonly string[] = [
  't',
  ...EXPRESSION_CONSTANTS.map((c) => c.name),
  ...EXPRESSION_FUNCTIONS.map((f) => f.name),
];

/** Built-in names every expression may use (the functions and constants, with their docs). */
export const BUILTIN_NAMES: readonly ScopeName[] = [
  ...EXPRESSION_CONSTANTS.map((c): ScopeName => ({ name: c.name, kind: 'constant', detail: c.doc })),
  ...EXPRESSION_FUNCTIONS.map((f): ScopeName => ({ name: f.name, kind: 'function', detail: f.doc })),
];

/**
 * Problems of an expression against the names in scope, each at its exact position in the text.
 * The shared checker is the one the engine's code generator relies on, so what is marked here is
 * exactly what a run would refuse.
 */
export function expressionProblems(text: string, scope: readonly ScopeName[]): ExpressionProblem[] {
  const names = scope
    .filter((entry) => entry.kind !== 'function' && entry.kind !== 'constant')
    .map((entry) => entry.name);
  const checked = checkExpression(text, names);
  if (checked.ok) return [];
  return checked.errors.map((error) => ({ from: error.from, to: error.to, message: error.message }));
}
