import type { ExpressionFunctionName } from './functions';

/**
 * The math functions as plain JavaScript functions, for the tree-walking evaluator. The prelude
 * (prelude.ts) defines the same functions as source text for generated code; a unit test checks
 * that both agree.
 */
export const FUNCTION_IMPLEMENTATIONS: Readonly<
  Record<ExpressionFunctionName, (...args: number[]) => number>
> = {
  exp: Math.exp,
  log: Math.log,
  sqrt: Math.sqrt,
  abs: Math.abs,
  sin: Math.sin,
  cos: Math.cos,
  tan: Math.tan,
  tanh: Math.tanh,
  sinh: Math.sinh,
  cosh: Math.cosh,
  atan: Math.atan,
  atan2: Math.atan2,
  asin: Math.asin,
  acos: Math.acos,
  min: Math.min,
  max: Math.max,
  pow: Math.pow,
  sign: Math.sign,
  floor: Math.floor,
  ceil: Math.ceil,
  round: Math.round,
  log10: Math.log10,
  log1p: Math.log1p,
  expm1: Math.expm1,
  hypot: Math.hypot,
  clamp: (x: number, lo: number, hi: number) => Math.min(Math.max(x, lo), hi),
  // NaN stays NaN, so a blown-up path is not silently turned into 0 or 1.
  step: (x: number) => (x >= 0 ? 1 : x < 0 ? 0 : NaN),
  pos: (x: number) => Math.max(x, 0),
};
