import { findConstant, findFunction } from './functions';
import { helperName } from './prelude';
import type { CheckedExpr, ExprNode } from './tree';

/** Replacements that need no extra brackets: an identifier, an unsigned number, or `(…)` without inner brackets. */
const SELF_CONTAINED = /^(?:[A-Za-z_$][A-Za-z0-9_$]*|[0-9.]+(?:e[+-]?[0-9]+)?|\([^()]*\))$/;

/**
 * What a name may be replaced with: an ASCII identifier the caller declares (`s0`, `w1`, `t`) or
 * a decimal number, bare or in one pair of brackets. Anything else (a user's Unicode name, a
 * property access, a call) is refused, so no text a person typed can reach generated code.
 */
const NUMBER = '-?(?:[0-9]+(?:\\.[0-9]*)?|\\.[0-9]+)(?:e[+-]?[0-9]+)?';
const SAFE_REPLACEMENT = new RegExp(`^(?:[A-Za-z_$][A-Za-z0-9_$]*|${NUMBER}|\\(${NUMBER}\\))$`);

/**
 * JavaScript source of a checked expression, built only from the tree (never from the user's
 * text). Each scope name becomes `names[name]` (an identifier such as `s0`, or a numeric literal);
 * functions become the prelude's helpers. Everything is parenthesised, so precedence never
 * depends on the replacements. Comparisons and logic yield 1 or 0, as in `evaluate`.
 */
export function generateSource(tree: CheckedExpr, names: Readonly<Record<string, string>>): string {
  return emit(tree.root, names);
}

/**
 * Operators by node kind. The types already say this; the check is repeated at run time because
 * generated source is executed, and a tree could reach here by other means than checkExpression.
 */
const OPERATORS: Readonly<Record<string, ReadonlySet<string>>> = {
  unary: new Set(['-', '+', '!']),
  arithmetic: new Set(['+', '-', '*', '/', '**']),
  comparison: new Set(['<', '<=', '>', '>=', '==', '!=']),
  logical: new Set(['&&', '||']),
};

function emit(node: ExprNode, names: Readonly<Record<string, string>>): string {
  if ('op' in node && !OPERATORS[node.kind]?.has(node.op))
    throw new Error(`not an expression operator: ${String(node.op)}`);
  if (node.kind === 'call' && findFunction(node.fn)?.name !== node.fn)
    throw new Error(`not an expression function: ${String(node.fn)}`);
  switch (node.kind) {
    case 'number':
      return numberSource(node.value);
    case 'constant':
      return numberSource(findConstant(node.name)?.value ?? Number.NaN);
    case 'name': {
      if (!Object.hasOwn(names, node.name))
        throw new Error(`no replacement given for the name '${node.name}'`);
      const replacement = names[node.name] ?? '';
      if (!SAFE_REPLACEMENT.test(replacement))
        throw new Error(`not a safe replacement for a name: ${JSON.stringify(replacement)}`);
      return SELF_CONTAINED.test(replacement) ? replacement : `(${replacement})`;
    }
    case 'unary': {
      const operand = emit(node.operand, names);
      return node.op === '!' ? `(${operand} ? 0 : 1)` : `(${node.op}${operand})`;
    }
    case 'arithmetic':
      // Powers go through the portable pow: the engines' own `**` differ in the last bit.
      if (node.op === '**')
        return `${helperName('pow')}(${emit(node.left, names)}, ${emit(node.right, names)})`;
      return `(${emit(node.left, names)} ${node.op} ${emit(node.right, names)})`;
    case 'comparison': {
      const op = node.op === '==' ? '===' : node.op === '!=' ? '!==' : node.op;
      return `((${emit(node.left, names)} ${op} ${emit(node.right, names)}) ? 1 : 0)`;
    }
    case 'logical':
      return `((${emit(node.left, names)} ${node.op} ${emit(node.right, names)}) ? 1 : 0)`;
    case 'conditional':
      return `(${emit(node.test, names)} ? ${emit(node.then, names)} : ${emit(node.otherwise, names)})`;
    case 'call':
      return `${helperName(node.fn)}(${node.args.map((arg) => emit(arg, names)).join(', ')})`;
  }
  throw new Error(`not an expression node: ${String((node as { kind?: unknown }).kind)}`);
}

/** Full precision (String of a double round-trips); negatives in brackets so `- -1` never forms. */
export function numberSource(value: number): string {
  if (!Number.isFinite(value))
    throw new Error(`cannot write the non-finite number ${value} into an expression`);
  const text = String(value);
  return value < 0 || Object.is(value, -0) ? `(${Object.is(value, -0) ? '-0' : text})` : text;
}
