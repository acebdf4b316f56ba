import { findFunction, type ExpressionFunctionName } from './functions';
import { symbolTex } from './tex-symbols';
import type { CheckedExpr, ExprNode } from './tree';

export { symbolTex };

/**
 * TeX of a checked expression, for reading (KaTeX renders it). Built only from the checked tree,
 * never from the user's text: names go through symbolTex, numbers through String, and every other
 * piece is a constant of this file. Brackets appear only where precedence needs them; division is
 * a fraction, powers are superscripts, log is the natural logarithm (ln).
 */
export function toTex(tree: CheckedExpr): string {
  return emit(tree.root);
}

/**
 * TeX of a checked expression as a factor: bracketed when its top operation binds more loosely
 * than a product (a drift written before "dt", a coefficient before "dW").
 */
export function toTexFactor(tree: CheckedExpr): string {
  return operand(tree.root, precedence(tree.root) < 5);
}

const OPERATORS: Readonly<Record<string, ReadonlySet<string>>> = {
  unary: new Set(['-', '+', '!']),
  arithmetic: new Set(['+', '-', '*', '/', '**']),
  comparison: new Set(['<', '<=', '>', '>=', '==', '!=']),
  logical: new Set(['&&', '||']),
};

const COMPARISON_TEX: Readonly<Record<string, string>> = {
  '<': '<',
  '<=': '\\le',
  '>': '>',
  '>=': '\\ge',
  '==': '=',
  '!=': '\\ne',
};

/** Binding strength of what a node prints as: lower binds more loosely. */
function precedence(node: ExprNode): number {
  switch (node.kind) {
    case 'conditional':
      return 0;
    case 'logical':
      return node.op === '||' ? 1 : 2;
    case 'comparison':
      return 3;
    case 'arithmetic':
      if (negatedFraction(node)) return 6;
      return node.op === '+' || node.op === '-' ? 4 : node.op === '**' ? 7 : 5;
    case 'unary':
      return 6;
    case 'number':
      return node.value < 0 ? 6 : 9;
    default:
      return 9;
  }
}

/** `-a / b`, typeset with the sign before the fraction: −a/b reads as a signed term. */
function negatedFraction(node: ExprNode): boolean {
  return node.kind === 'arithmetic' && node.op === '/' && node.left.kind === 'unary' && node.left.op === '-';
}

/** Starts with a sign of its own, so it needs brackets after another operator. */
function signed(node: ExprNode): boolean {
  return precedence(node) === 6;
}

function bracket(tex: string): string {
  return `\\left(${tex}\\right)`;
}

function operand(node: ExprNode, bracketed: boolean): string {
  return bracketed ? bracket(emit(node)) : emit(node);
}

function emit(node: ExprNode): string {
  if ('op' in node && !OPERATORS[node.kind]?.has(node.op))
    throw new Error(`not an expression operator: ${String(node.op)}`);
  switch (node.kind) {
    case 'number':
      return numberTex(node.value);
    case 'constant':
      if (node.name !== 'pi')
        throw new Error(`not an expression constant: ${String((node as { name?: unknown }).name)}`);
      return '\\pi';
    case 'name':
      return symbolTex(node.name);
    case 'unary': {
      const inner = operand(node.operand, precedence(node.operand) <= 6);
      return node.op === '!' ? `\\lnot ${inner}` : `${node.op}${inner}`;
    }
    case 'arithmetic':
      return arithmetic(node.op, node.left, node.right);
    case 'comparison':
      return `${operand(node.left, precedence(node.left) <= 3)} ${COMPARISON_TEX[node.op]} ${operand(node.right, precedence(node.right) <= 3)}`;
    case 'logical': {
      const loosest = node.op === '||' ? 1 : 2;
      const word = node.op === '||' ? '\\lor' : '\\land';
      return `${operand(node.left, precedence(node.left) < loosest)} ${word} ${operand(node.right, precedence(node.right) < loosest)}`;
    }
    case 'conditional':
      return `\\begin{cases} ${emit(node.then)} & \\text{if } ${emit(node.test)} \\\\ ${emit(node.otherwise)} & \\text{otherwise} \\end{cases}`;
    case 'call':
      return call(node.fn, node.args);
  }
  throw new Error(`not an expression node: ${String((node as { kind?: unknown }).kind)}`);
}

function arithmetic(op: string, left: ExprNode, right: ExprNode): string {
  switch (op) {
    case '+':
    case '-': {
      const rightBracketed =
        precedence(right) < 4 || signed(right) || (op === '-' && precedence(right) === 4);
      return `${operand(left, precedence(left) < 4)} ${op} ${operand(right, rightBracketed)}`;
    }
    case '*': {
      const l = operand(left, precedence(left) < 5);
      const r = operand(right, precedence(right) < 5 || signed(right));
      const joiner = /^[0-9]/.test(r) || signed(right) ? ' \\cdot ' : '\\,';
      return `${l}${joiner}${r}`;
    }
    case '/':
      return left.kind === 'unary' && left.op === '-'
        ? `-\\frac{${emit(left.operand)}}{${emit(right)}}`
        : `\\frac{${emit(left)}}{${emit(right)}}`;
    default:
      return power(left, right);
  }
}

/** A base stays bare only when it is one symbol or a plain number. */
function power(base: ExprNode, exponent: ExprNode): string {
  const bare =
    base.kind === 'name' ||
    base.kind === 'constant' ||
    (base.kind === 'number' && base.value >= 0 && !String(base.value).includes('e'));
  return `${operand(base, !bare)}^{${emit(exponent)}}`;
}

const NAMED_FUNCTIONS: Partial<Record<ExpressionFunctionName, string>> = {
  exp: '\\exp',
  log: '\\ln',
  sin: '\\sin',
  cos: '\\cos',
  tan: '\\tan',
  sinh: '\\sinh',
  cosh: '\\cosh',
  tanh: '\\tanh',
  atan: '\\arctan',
  asin: '\\arcsin',
  acos: '\\arccos',
  min: '\\min',
  max: '\\max',
  log10: '\\log_{10}',
  sign: '\\operatorname{sgn}',
};

function call(fn: ExpressionFunctionName, args: readonly ExprNode[]): string {
  if (findFunction(fn)?.name !== fn) throw new Error(`not an expression function: ${String(fn)}`);
  const list = args.map(emit).join(', ');
  switch (fn) {
    case 'sqrt':
      return `\\sqrt{${list}}`;
    case 'abs':
      return `\\left|${list}\\right|`;
    case 'floor':
      return `\\left\\lfloor ${list}\\right\\rfloor`;
    case 'ceil':
      return `\\left\\lceil ${list}\\right\\rceil`;
    case 'pos':
      return `${bracket(list)}^{+}`;
    case 'pow':
      return power(args[0]!, args[1]!);
    default:
      return `${NAMED_FUNCTIONS[fn] ?? `\\operatorname{${fn}}`}${bracket(list)}`;
  }
}

/** Decimal as JavaScript writes it; an exponent becomes "× 10^k". */
function numberTex(value: number): string {
  if (!Number.isFinite(value)) throw new Error(`cannot typeset the number ${value}`);
  const text = String(value);
  const [mantissa, exponent] = text.split('e');
  return exponent === undefined ? text : `${mantissa} \\times 10^{${Number(exponent)}}`;
}
