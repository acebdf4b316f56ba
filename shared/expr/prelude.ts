import { EXPRESSION_FUNCTIONS, type ExpressionFunctionName } from './functions';

/** Prefix of the helper names in generated code: never collides with `t`, `s0…` or `w0…`. */
export const HELPER_PREFIX = 'f_';

export function helperName(fn: ExpressionFunctionName): string {
  return `${HELPER_PREFIX}${fn}`;
}

/** Source of each helper; the same definitions as FUNCTION_IMPLEMENTATIONS in library.ts. */
const HELPER_SOURCES: Readonly<Record<ExpressionFunctionName, string>> = {
  exp: 'Math.exp',
  log: 'Math.log',
  sqrt: 'Math.sqrt',
  abs: 'Math.abs',
  sin: 'Math.sin',
  cos: 'Math.cos',
  tan: 'Math.tan',
  tanh: 'Math.tanh',
  sinh: 'Math.sinh',
  cosh: 'Math.cosh',
  atan: 'Math.atan',
  atan2: 'Math.atan2',
  asin: 'Math.asin',
  acos: 'Math.acos',
  min: 'Math.min',
  max: 'Math.max',
  pow: 'Math.pow',
  sign: 'Math.sign',
  floor: 'Math.floor',
  ceil: 'Math.ceil',
  round: 'Math.round',
  log10: 'Math.log10',
  log1p: 'Math.log1p',
  expm1: 'Math.expm1',
  hypot: 'Math.hypot',
  clamp: '(x, lo, hi) => Math.min(Math.max(x, lo), hi)',
  step: '(x) => (x >= 0 ? 1 : x < 0 ? 0 : NaN)',
  pos: '(x) => Math.max(x, 0)',
};

/**
 * JavaScript `const` declarations of every helper function, to be placed once at the top of a
 * generated function body, before any code from generateSource.
 */
export const EXPRESSION_PRELUDE: string = `const ${EXPRESSION_FUNCTIONS.map(
  (f) => `${helperName(f.name)} = ${HELPER_SOURCES[f.name]}`,
).join(', ')};`;
