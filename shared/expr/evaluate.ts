import { findConstant } from './functions';
import { FUNCTION_IMPLEMENTATIONS } from './library';
import { PORTABLE_MATH } from './portable-math';
import type { CheckedExpr, ExprNode } from './tree';

/**
 * Value of a checked expression by walking its tree: no code generation, so it runs under a
 * Content-Security-Policy that forbids eval (parameters, initial values, previews). Same
 * semantics as generated code: comparisons and logic give 1 or 0, truth is "non-zero, not NaN".
 */
export function evaluate(tree: CheckedExpr, values: Readonly<Record<string, number>>): number {
  return evaluateNode(tree.root, values);
}

function evaluateNode(node: ExprNode, values: Readonly<Record<string, number>>): number {
  switch (node.kind) {
    case 'number':
      return node.value;
    case 'constant':
      return findConstant(node.name)?.value ?? Number.NaN;
    case 'name': {
      const value = Object.hasOwn(values, node.name) ? values[node.name] : undefined;
      if (typeof value !== 'number') throw new Error(`no value given for the name '${node.name}'`);
      return value;
    }
    case 'unary': {
      const operand = evaluateNode(node.operand, values);
      return node.op === '-' ? -operand : node.op === '+' ? operand : operand ? 0 : 1;
    }
    case 'arithmetic': {
      const left = evaluateNode(node.left, values);
      const right = evaluateNode(node.right, values);
      switch (node.op) {
        case '+':
          return left + right;
        case '-':
          return left - right;
        case '*':
          return left * right;
        case '/':
          return left / right;
        case '**':
          return PORTABLE_MATH.pow(left, right);
      }
      break;
    }
    case 'comparison': {
      const left = evaluateNode(node.left, values);
      const right = evaluateNode(node.right, values);
      switch (node.op) {
        case '<':
          return left < right ? 1 : 0;
        case '<=':
          return left <= right ? 1 : 0;
        case '>':
          return left > right ? 1 : 0;
        case '>=':
          return left >= right ? 1 : 0;
        case '==':
          return left === right ? 1 : 0;
        case '!=':
          return left !== right ? 1 : 0;
      }
      break;
    }
    case 'logical': {
      // Short-circuit like the generated `a && b` / `a || b`.
      const left = evaluateNode(node.left, values);
      if (node.op === '&&') return left && evaluateNode(node.right, values) ? 1 : 0;
      return left || evaluateNode(node.right, values) ? 1 : 0;
    }
    case 'conditional':
      return evaluateNode(node.test, values)
        ? evaluateNode(node.then, values)
        : evaluateNode(node.otherwise, values);
    case 'call': {
      if (!Object.hasOwn(FUNCTION_IMPLEMENTATIONS, node.fn))
        throw new Error(`not an expression function: ${node.fn}`);
      return FUNCTION_IMPLEMENTATIONS[node.fn](...node.args.map((arg) => evaluateNode(arg, values)));
    }
  }
  throw new Error('unreachable: unknown expression node');
}
