import { parse, type Expression, type Node } from 'acorn';
import { HELPER_PREFIX } from '../../expr/prelude';

/**
 * Reads the engine's own generated step source back into a small tree for the wasm emitter. The
 * source is what the JavaScript kernel runs (built by the scheme files from the expression
 * compiler's checked trees, see plan.ts), so both kernels evaluate the same operations in the
 * same order. Only the shapes `generateSource` and the schemes write are accepted: assignments
 * to plain names, numbers, names, + − * /, unary minus and plus, comparisons, && and || as
 * conditions, `c ? a : b`, and calls of the `f_` helpers. Anything else throws `Unsupported`,
 * and the run falls back to the JavaScript kernel.
 */
export class Unsupported extends Error {}

/** The JavaScript engine would not compile or run the kernel (a strict policy, no memory). */
export class Refused extends Unsupported {}

export type ValueNode =
  | { kind: 'number'; value: number }
  | { kind: 'name'; name: string }
  | { kind: 'negate'; operand: ValueNode }
  | { kind: 'arithmetic'; op: '+' | '-' | '*' | '/'; left: ValueNode; right: ValueNode }
  | { kind: 'select'; test: TestNode; then: ValueNode; otherwise: ValueNode }
  | { kind: 'call'; fn: string; args: ValueNode[] };

export type TestNode =
  | { kind: 'compare'; op: '<' | '<=' | '>' | '>=' | '===' | '!=='; left: ValueNode; right: ValueNode }
  | { kind: 'logic'; op: '&&' | '||'; left: TestNode; right: TestNode }
  | { kind: 'truthy'; value: ValueNode };

export interface Assignment {
  target: string;
  value: ValueNode;
}

const ARITHMETIC = new Set(['+', '-', '*', '/']);
const COMPARE = new Set(['<', '<=', '>', '>=', '===', '!==']);
const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

function fail(node: Node, what: string): never {
  throw new Unsupported(`${what} (${node.type})`);
}

function value(node: Expression, names: ReadonlySet<string>): ValueNode {
  switch (node.type) {
    case 'Literal':
      if (typeof node.value !== 'number') fail(node, 'only numbers are supported');
      return { kind: 'number', value: node.value };
    case 'Identifier':
      if (!names.has(node.name))
        throw new Unsupported(`the name ${node.name} is not known to the wasm kernel`);
      return { kind: 'name', name: node.name };
    case 'ParenthesizedExpression':
      return value(node.expression, names);
    case 'UnaryExpression':
      if (node.operator === '-') return { kind: 'negate', operand: value(node.argument, names) };
      if (node.operator === '+') return value(node.argument, names);
      return fail(node, `the operator ${node.operator}`);
    case 'BinaryExpression':
      if (!ARITHMETIC.has(node.operator) || node.left.type === 'PrivateIdentifier')
        fail(node, `the operator ${node.operator} as a value`);
      return {
        kind: 'arithmetic',
        op: node.operator as '+' | '-' | '*' | '/',
        left: value(node.left, names),
        right: value(node.right, names),
      };
    case 'ConditionalExpression':
      return {
        kind: 'select',
        test: test(node.test, names),
        then: value(node.consequent, names),
        otherwise: value(node.alternate, names),
      };
    case 'CallExpression': {
      const callee = node.callee;
      if (callee.type !== 'Identifier' || !callee.name.startsWith(HELPER_PREFIX) || node.optional)
        fail(node, 'only calls of the expression helpers');
      const args = node.arguments.map((arg) => {
        if (arg.type === 'SpreadElement') fail(arg, 'spread arguments');
        return value(arg, names);
      });
      return { kind: 'call', fn: callee.name.slice(HELPER_PREFIX.length), args };
    }
    default:
      return fail(node, 'this construct');
  }
}

function test(node: Expression, names: ReadonlySet<string>): TestNode {
  if (node.type === 'ParenthesizedExpression') return test(node.expression, names);
  if (node.type === 'BinaryExpression' && COMPARE.has(node.operator)) {
    if (node.left.type === 'PrivateIdentifier') fail(node, 'private names');
    return {
      kind: 'compare',
      op: node.operator as '<' | '<=' | '>' | '>=' | '===' | '!==',
      left: value(node.left, names),
      right: value(node.right, names),
    };
  }
  if (node.type === 'LogicalExpression' && (node.operator === '&&' || node.operator === '||')) {
    return { kind: 'logic', op: node.operator, left: test(node.left, names), right: test(node.right, names) };
  }
  return { kind: 'truthy', value: value(node, names) };
}

/**
 * Parses statements `name = expression;` (the step body of a scheme). `names` are the names an
 * expression may read; assignment targets must match `targets`.
 */
export function parseAssignments(source: string, names: ReadonlySet<string>, targets: RegExp): Assignment[] {
  let program;
  try {
    program = parse(source, { ecmaVersion: 2022, sourceType: 'script', preserveParens: true });
  } catch (error) {
    throw new Unsupported(`the step source does not parse: ${String(error)}`);
  }
  return program.body.map((statement) => {
    if (statement.type !== 'ExpressionStatement') fail(statement, 'only assignments');
    const expression = statement.expression;
    if (expression.type !== 'AssignmentExpression' || expression.operator !== '=')
      fail(expression, 'only plain assignments');
    const target = expression.left;
    if (target.type !== 'Identifier' || !NAME.test(target.name) || !targets.test(target.name))
      fail(target, 'only assignments to the step’s own names');
    return { target: target.name, value: value(expression.right, names) };
  });
}

/** Names a value tree reads. */
export function namesRead(node: ValueNode | TestNode, into = new Set<string>()): Set<string> {
  switch (node.kind) {
    case 'name':
      into.add(node.name);
      break;
    case 'negate':
      namesRead(node.operand, into);
      break;
    case 'arithmetic':
    case 'compare':
    case 'logic':
      namesRead(node.left, into);
      namesRead(node.right, into);
      break;
    case 'select':
      namesRead(node.test, into);
      namesRead(node.then, into);
      namesRead(node.otherwise, into);
      break;
    case 'call':
      node.args.forEach((arg) => namesRead(arg, into));
      break;
    case 'truthy':
      namesRead(node.value, into);
      break;
    case 'number':
      break;
  }
  return into;
}
