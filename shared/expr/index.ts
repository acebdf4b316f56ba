/**
 * The expression compiler: restricted JavaScript-like expressions, parsed with acorn, checked
 * against a whitelist, then evaluated by walking the tree or turned into source for the engine.
 */
export {
  EXPRESSION_FUNCTIONS,
  EXPRESSION_CONSTANTS,
  type ExpressionFunction,
  type ExpressionFunctionName,
  type ExpressionConstant,
  type ExpressionConstantName,
} from './functions';
export { checkExpression, type CheckResult } from './check';
export { usedNames, type CheckedExpr, type ExprError, type ExprNode } from './tree';
export { generateSource, numberSource } from './generate';
export { EXPRESSION_PRELUDE, HELPER_PREFIX } from './prelude';
export { evaluate } from './evaluate';
export { MAX_EXPRESSION_DEPTH, MAX_EXPRESSION_LENGTH } from './limits';
