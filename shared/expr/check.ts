import type { Expression, Node, SpreadElement, Super, PrivateIdentifier } from 'acorn';
import {
  EXPRESSION_FUNCTIONS,
  arityAccepts,
  describeArity,
  findConstant,
  findFunction,
  type ExpressionFunctionName,
} from './functions';
import { MAX_EXPRESSION_DEPTH } from './limits';
import { parseExpressionText } from './syntax';
import {
  collectNames,
  type CheckedExpr,
  type ExprError,
  type ExprNode,
  type ComparisonOperator,
} from './tree';

export type CheckResult = { ok: true; tree: CheckedExpr } | { ok: false; errors: ExprError[] };

/**
 * Parses and checks an expression against the whitelist. This is a security boundary: a shared
 * sheet is someone else's code, and only the tree built here ever reaches code generation.
 * Every problem found is returned, each with its position in the text.
 */
export function checkExpression(text: string, scope: readonly string[]): CheckResult {
  const parsed = parseExpressionText(text);
  if (!parsed.ok) return parsed;
  const checker = new Checker(text, scope);
  const root = checker.convert(parsed.node, 1);
  if (checker.errors.length > 0 || root === null) {
    return { ok: false, errors: checker.errors.sort((a, b) => a.from - b.from || a.to - b.to) };
  }
  return { ok: true, tree: { root, names: collectNames(root) } };
}

type AnyExpression = Expression | SpreadElement | Super | PrivateIdentifier;

const FUNCTION_LIST = EXPRESSION_FUNCTIONS.map((f) => f.name).join(', ');
const MAX_LISTED_NAMES = 30;

const COMPARISONS: Readonly<Record<string, ComparisonOperator>> = {
  '<': '<',
  '<=': '<=',
  '>': '>',
  '>=': '>=',
  '==': '==',
  '===': '==',
  '!=': '!=',
  '!==': '!=',
};

const BINARY_MESSAGES: Readonly<Record<string, string>> = {
  '^': 'use ** for powers',
  '%': 'the remainder operator % is not available',
  '&': 'bitwise operators are not allowed; use && for "and"',
  '|': 'bitwise operators are not allowed; use || for "or"',
  '<<': 'bitwise shifts are not allowed',
  '>>': 'bitwise shifts are not allowed',
  '>>>': 'bitwise shifts are not allowed',
  in: "'in' is not allowed in expressions",
  instanceof: "'instanceof' is not allowed in expressions",
};

const NODE_MESSAGES: Readonly<Record<string, string>> = {
  ThisExpression: "'this' is not allowed in expressions",
  Super: "'super' is not allowed in expressions",
  ArrayExpression: 'arrays are not allowed in expressions',
  ObjectExpression: 'objects are not allowed in expressions',
  FunctionExpression: 'functions cannot be defined inside an expression',
  ArrowFunctionExpression: 'functions cannot be defined inside an expression',
  ClassExpression: 'classes are not allowed in expressions',
  UpdateExpression: '++ and -- are not allowed: an expression cannot change a value',
  MemberExpression: 'property access (a.b or a[b]) is not allowed in expressions',
  NewExpression: "'new' is not allowed in expressions",
  SequenceExpression: 'a comma is only allowed between the arguments of a function',
  YieldExpression: "'yield' is not allowed in expressions",
  AwaitExpression: "'await' is not allowed in expressions",
  TemplateLiteral: 'template strings are not allowed in expressions',
  TaggedTemplateExpression: 'template strings are not allowed in expressions',
  MetaProperty: 'new.target and import.meta are not allowed in expressions',
  ChainExpression: 'optional chaining (?.) is not allowed in expressions',
  ImportExpression: 'import() is not allowed in expressions',
  SpreadElement: 'spread (...) is not allowed in expressions',
  PrivateIdentifier: 'private names (#name) are not allowed in expressions',
};

/** Decimal and exponent literals only: no hex, octal, binary, legacy octal, separators or BigInt. */
const DECIMAL_LITERAL = /^(?:(?:0|[1-9][0-9]*)(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?$/;

class Checker {
  readonly errors: ExprError[] = [];
  private readonly scope: ReadonlySet<string>;
  private depthReported = false;

  constructor(
    private readonly text: string,
    scopeNames: readonly string[],
  ) {
    this.scope = new Set(scopeNames);
  }

  convert(node: AnyExpression, depth: number): ExprNode | null {
    if (depth > MAX_EXPRESSION_DEPTH) {
      if (!this.depthReported) {
        this.depthReported = true;
        this.fail(node, `the expression is nested more than ${MAX_EXPRESSION_DEPTH} levels deep`);
      }
      return null;
    }
    switch (node.type) {
      case 'ParenthesizedExpression':
        return this.convert(node.expression, depth);
      case 'Literal':
        return this.literal(node);
      case 'Identifier':
        return this.identifier(node, node.name);
      case 'UnaryExpression': {
        const operand = this.convert(node.argument, depth + 1);
        if (node.operator !== '-' && node.operator !== '+' && node.operator !== '!') {
          const message =
            node.operator === '~'
              ? 'bitwise operators are not allowed'
              : `'${node.operator}' is not allowed in expressions`;
          return this.fail(node, message);
        }
        return operand && { kind: 'unary', op: node.operator, operand };
      }
      case 'BinaryExpression': {
        const left = this.convert(node.left, depth + 1);
        const right = this.convert(node.right, depth + 1);
        const op = node.operator;
        if (op === '+' || op === '-' || op === '*' || op === '/' || op === '**') {
          return left && right && { kind: 'arithmetic', op, left, right };
        }
        const comparison = COMPARISONS[op];
        if (comparison) return left && right && { kind: 'comparison', op: comparison, left, right };
        return this.failOperator(
          node.left,
          node.right,
          op,
          BINARY_MESSAGES[op] ?? `the operator ${op} is not allowed`,
        );
      }
      case 'LogicalExpression': {
        const left = this.convert(node.left, depth + 1);
        const right = this.convert(node.right, depth + 1);
        if (node.operator === '??')
          return this.failOperator(node.left, node.right, '??', 'the operator ?? is not allowed');
        return left && right && { kind: 'logical', op: node.operator, left, right };
      }
      case 'ConditionalExpression': {
        const test = this.convert(node.test, depth + 1);
        const then = this.convert(node.consequent, depth + 1);
        const otherwise = this.convert(node.alternate, depth + 1);
        return test && then && otherwise && { kind: 'conditional', test, then, otherwise };
      }
      case 'CallExpression':
        return this.call(node.callee, node.arguments, node, depth);
      case 'AssignmentExpression':
        return this.fail(
          node,
          node.operator === '='
            ? 'assignment (=) is not allowed; to compare, use =='
            : `assignment (${node.operator}) is not allowed`,
        );
      default:
        return this.fail(node, NODE_MESSAGES[node.type] ?? `${node.type} is not allowed in expressions`);
    }
  }

  private literal(node: Extract<Expression, { type: 'Literal' }>): ExprNode | null {
    const raw = this.text.slice(node.start, node.end);
    if ('regex' in node && node.regex)
      return this.fail(node, 'regular expressions are not allowed in expressions');
    if ('bigint' in node && node.bigint !== undefined)
      return this.fail(node, 'BigInt literals (like 1n) are not allowed; write 1');
    if (typeof node.value === 'string')
      return this.fail(node, 'strings are not allowed; expressions work with numbers');
    if (typeof node.value !== 'number')
      return this.fail(node, `'${raw}' is not allowed; use 1 and 0 for true and false`);
    if (!DECIMAL_LITERAL.test(raw)) {
      return this.fail(node, `write numbers in decimal, like 12, 0.5 or 3e-4 (not '${raw}')`);
    }
    if (!Number.isFinite(node.value)) return this.fail(node, `the number ${raw} is too large`);
    return { kind: 'number', value: node.value };
  }

  private identifier(node: Node, name: string): ExprNode | null {
    if (!this.plainName(node, name)) return null;
    if (this.scope.has(name)) return { kind: 'name', name };
    const constant = findConstant(name);
    if (constant) return { kind: 'constant', name: constant.name as 'pi' };
    if (findFunction(name)) return this.fail(node, `'${name}' is a function: call it, like ${name}(x)`);
    if (name.normalize('NFC') !== name && this.scope.has(name.normalize('NFC'))) {
      return this.fail(
        node,
        `'${name}' is written with a combining accent; retype it as one letter to use the name '${name.normalize('NFC')}'`,
      );
    }
    return this.fail(node, `unknown name '${name}'; ${this.describeScope()}`);
  }

  /** `\u0065xp` is the name `exp` to the parser; reject escapes so the text reads as it runs. */
  private plainName(node: Node, name: string): boolean {
    if (this.text.slice(node.start, node.end) === name) return true;
    this.fail(node, 'write names without escape sequences (\\u…)');
    return false;
  }

  private call(
    wrappedCallee: Expression | Super,
    args: readonly (Expression | SpreadElement)[],
    node: Node,
    depth: number,
  ): ExprNode | null {
    const converted = args.map((arg) => this.convert(arg, depth + 1));
    let callee = wrappedCallee;
    while (callee.type === 'ParenthesizedExpression') callee = callee.expression;
    if (callee.type !== 'Identifier') {
      if (callee.type === 'MemberExpression' || callee.type === 'Super') this.convert(callee, depth + 1);
      return this.fail(callee, `only the math functions can be called: ${FUNCTION_LIST}`);
    }
    if (!this.plainName(callee, callee.name)) return null;
    const fn = findFunction(callee.name);
    if (!fn)
      return this.fail(callee, `'${callee.name}' is not a function; the functions are: ${FUNCTION_LIST}`);
    if (!arityAccepts(fn.arity, args.length)) {
      return this.fail(node, `${fn.name} takes ${describeArity(fn.arity)}, not ${args.length}`);
    }
    if (converted.some((arg) => arg === null)) return null;
    return { kind: 'call', fn: fn.name as ExpressionFunctionName, args: converted as ExprNode[] };
  }

  private describeScope(): string {
    if (this.scope.size === 0) return 'no names are in scope here';
    const names = [...this.scope].sort();
    const listed = names.slice(0, MAX_LISTED_NAMES).join(', ');
    const more = names.length > MAX_LISTED_NAMES ? ` and ${names.length - MAX_LISTED_NAMES} more` : '';
    return `names in scope: ${listed}${more}`;
  }

  private failOperator(left: Node, right: Node, op: string, message: string): null {
    const at = this.text.indexOf(op, left.end);
    const from = at >= 0 && at < right.start ? at : left.end;
    this.errors.push({ from, to: at >= 0 && at < right.start ? at + op.length : right.start, message });
    return null;
  }

  private fail(node: Node, message: string): null {
    this.errors.push({ from: node.start, to: node.end, message });
    return null;
  }
}
