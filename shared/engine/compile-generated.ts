import { PORTABLE_MATH, PORTABLE_MATH_NAME } from '../expr/portable-math';

/**
 * The one place the engine turns generated source into a function. Every source passed here is
 * built by the engine from a simulation plan, whose expression sources come only from
 * `generateSource` over trees the expression compiler checked (shared/expr), plus numeric
 * literals and the engine's own templates: never from a user's text. It runs only where eval is
 * allowed: the simulation worker (the page's Content-Security-Policy forbids it) and Node.
 */
export function compileGenerated<F>(parameters: readonly string[], body: string): F {
  // The prelude's helpers read the portable elementary functions through PORTABLE_MATH_NAME.
  const withMath = new Function(PORTABLE_MATH_NAME, ...parameters, body) as (...args: unknown[]) => unknown;
  return withMath.bind(null, PORTABLE_MATH) as F;
}
