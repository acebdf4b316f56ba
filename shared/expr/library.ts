import type { ExpressionFunctionName } from './functions';
import { PORTABLE_MATH } from './portable-math';

/**
 * The math functions as plain JavaScript functions, for the tree-walking evaluator. The prelude
 * (prelude.ts) defines the same functions as source text for generated code; a unit test checks
 * that both agree.
 */
export const FUNCTION_IMPLEMENTATIONS: Readonly<
  Record<ExpressionFunctionName, (...args: number[]) => number>
> = {
  exp: PORTABLE_MATH.exp,
  log: PORTABLE_MATH.log,
  sqrt: Math.sqrt,
  abs: Math.abs,
  sin: PORTABLE_MATH.sin,
  cos: PORTABLE_MATH.cos,
  tan: PORTABLE_MATH.tan,
  tanh: PORTABLE_MATH.tanh,
  sinh: PORTABLE_MATH.sinh,
  cosh: PORTABLE_MATH.cosh,
  atan: PORTABLE_MATH.atan,
  atan2: PORTABLE_MATH.atan2,
  asin: PORTABLE_MATH.asin,
  acos: PORTABLE_MATH.acos,
  min: Math.min,
  max: Math.max,
  pow: PORTABLE_MATH.pow,
  sign: Math.sign,
  floor: Math.floor,
  ceil: Math.ceil,
  round: Math.round,
  log10: PORTABLE_MATH.log10,
  log1p: PORTABLE_MATH.log1p,
  expm1: PORTABLE_MATH.expm1,
  hypot: PORTABLE_MATH.hypot,
  clamp: (x: number, lo: number, hi: number) => Math.min(Math.max(x, lo), hi),
  // NaN stays NaN, so a blown-up path is not silently turned into 0 or 1.
  step: (x: number) => (x >= 0 ? 1 : x < 0 ? 0 : NaN),
  pos: (x: number) => Math.max(x, 0),
};
