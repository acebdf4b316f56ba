/**
 * The expression compiler: restricted JavaScript-like expressions, parsed with acorn, checked
 * against a whitelist, then evaluated by walking the tree or turned into source for the engine.
 */
export { EXPRESSION_FUNCTIONS, EXPRESSION_CONSTANTS } from './functions';
export { checkExpression } from './check';
export { usedNames, type CheckedExpr, type ExprError } from './tree';
export { generateSource, numberSource } from './generate';
export { EXPRESSION_PRELUDE } from './prelude';
export { evaluate } from './evaluate';
export { toTex, toTexFactor, symbolTex } from './tex';
