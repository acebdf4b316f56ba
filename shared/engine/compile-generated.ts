/**
 * The one place the engine turns generated source into a function. Every source passed here is
 * built by the engine from a simulation plan, whose expression sources come only from
 * `generateSource` over trees the expression compiler checked (shared/expr), plus numeric
 * literals and the engine's own templates: never from a user's text. It runs only where eval is
 * allowed: the simulation worker (the page's Content-Security-Policy forbids it) and Node.
 */
export function compileGenerated<F>(parameters: readonly string[], body: string): F {
  return new Function(...parameters, body) as F;
}
