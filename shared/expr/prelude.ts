import { EXPRESSION_FUNCTIONS, type ExpressionFunctionName } from './functions';
import { PORTABLE_MATH_NAME } from './portable-math';

/** Prefix of the helper names in generated code: never collides with `t`, `s0…` or `w0…`. */
export const HELPER_PREFIX = 'f_';

export function helperName(fn: ExpressionFunctionName): string {
  return `${HELPER_PREFIX}${fn}`;
}

/**
 * Source of each helper; the same definitions as FUNCTION_IMPLEMENTATIONS in library.ts. The
 * transcendental ones read PORTABLE_MATH (portable-math.ts), which compileGenerated passes in as
 * `f_lib`, so generated code gives the same bits in every JavaScript engine.
 */
const HELPER_SOURCES: Readonly<Record<ExpressionFunctionName, string>> = {
  exp: `${PORTABLE_MATH_NAME}.exp`,
  log: `${PORTABLE_MATH_NAME}.log`,
  sqrt: 'Math.sqrt',
  abs: 'Math.abs',
  sin: `${PORTABLE_MATH_NAME}.sin`,
  cos: `${PORTABLE_MATH_NAME}.cos`,
  tan: `${PORTABLE_MATH_NAME}.tan`,
  tanh: `${PORTABLE_MATH_NAME}.tanh`,
  sinh: `${PORTABLE_MATH_NAME}.sinh`,
  cosh: `${PORTABLE_MATH_NAME}.cosh`,
  atan: `${PORTABLE_MATH_NAME}.atan`,
  atan2: `${PORTABLE_MATH_NAME}.atan2`,
  asin: `${PORTABLE_MATH_NAME}.asin`,
  acos: `${PORTABLE_MATH_NAME}.acos`,
  min: 'Math.min',
  max: 'Math.max',
  pow: `${PORTABLE_MATH_NAME}.pow`,
  sign: 'Math.sign',
  floor: 'Math.floor',
  ceil: 'Math.ceil',
  round: 'Math.round',
  log10: `${PORTABLE_MATH_NAME}.log10`,
  log1p: `${PORTABLE_MATH_NAME}.log1p`,
  expm1: `${PORTABLE_MATH_NAME}.expm1`,
  hypot: `${PORTABLE_MATH_NAME}.hypot`,
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
