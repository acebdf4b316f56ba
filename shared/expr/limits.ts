/** Longest expression text accepted; the sheet schema has the same bound. */
export const MAX_EXPRESSION_LENGTH = 2000;

/**
 * Deepest nesting of brackets or of the checked tree. Far beyond what a model needs, and far
 * below what would strain the parser's or the evaluator's call stack.
 */
export const MAX_EXPRESSION_DEPTH = 64;
