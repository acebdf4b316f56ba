import { describe, expect, it } from 'vitest';
import { checkExpression, EXPRESSION_FUNCTIONS, usedNames, type ExprError } from '@shared/expr';

const SCOPE = ['x', 'b', 't', 'a'];

function errorsOf(text: string, scope: readonly string[] = SCOPE): ExprError[] {
  const result = checkExpression(text, scope);
  if (result.ok) throw new Error(`expected '${text}' to be rejected`);
  return result.errors;
}

describe('checkExpression messages and positions', () => {
  it('answers ^ with "use ** for powers" at the operator', () => {
    expect(errorsOf('a ^ 2')).toEqual([{ from: 2, to: 3, message: 'use ** for powers' }]);
  });

  it('names an unknown name and lists the scope, sorted', () => {
    expect(errorsOf('k * x')).toEqual([
      { from: 0, to: 1, message: "unknown name 'k'; names in scope: a, b, t, x" },
    ]);
  });

  it('says when no names are in scope', () => {
    expect(errorsOf('k', [])[0]?.message).toBe("unknown name 'k'; no names are in scope here");
  });

  it('reports wrong arity with the expected count', () => {
    expect(errorsOf('exp(1, 2)')).toEqual([{ from: 0, to: 9, message: 'exp takes 1 argument, not 2' }]);
    expect(errorsOf('clamp(x, 0)')[0]?.message).toBe('clamp takes 3 arguments, not 2');
    expect(errorsOf('max()')[0]?.message).toBe('max takes 1 to 32 arguments, not 0');
  });

  it('lists the functions that exist when an unknown one is called', () => {
    const [error] = errorsOf('gamma(x)');
    expect(error?.from).toBe(0);
    expect(error?.to).toBe(5);
    expect(error?.message).toMatch(/^'gamma' is not a function; the functions are: exp, log, sqrt/);
    for (const fn of EXPRESSION_FUNCTIONS) expect(error?.message).toContain(fn.name);
  });

  it('returns every error, in text order, not only the first', () => {
    const errors = errorsOf('k + a ^ 2 + m(1) + exp(1, 2)');
    expect(errors.map((e) => [e.from, e.to])).toEqual([
      [0, 1],
      [6, 7],
      [12, 13],
      [19, 28],
    ]);
  });

  it('points at member access, this and strings where they stand', () => {
    expect(errorsOf('1 + x.y')).toEqual([
      { from: 4, to: 7, message: 'property access (a.b or a[b]) is not allowed in expressions' },
    ]);
    expect(errorsOf('2 * this')[0]).toMatchObject({ from: 4, to: 8 });
    expect(errorsOf('x + "s"')[0]).toMatchObject({
      from: 4,
      to: 7,
      message: 'strings are not allowed; expressions work with numbers',
    });
  });

  it('asks for brackets around a negated base of **', () => {
    expect(errorsOf('-x ** 2')[0]?.message).toBe(
      'a minus sign before ** needs brackets: write (-a) ** b or -(a ** b)',
    );
  });

  it('rejects text after the expression', () => {
    expect(errorsOf('x y')).toEqual([
      { from: 2, to: 3, message: "unexpected text after the expression: 'y'" },
    ]);
  });

  it('rejects comments with their position', () => {
    expect(errorsOf('x /* hidden */ + 1')).toEqual([
      { from: 2, to: 14, message: 'comments are not allowed in expressions' },
    ]);
  });

  it('rejects empty and over-long input', () => {
    expect(errorsOf('')[0]?.message).toBe('the expression is empty');
    expect(errorsOf('x'.repeat(2001), ['x'.repeat(2001)])[0]).toMatchObject({
      from: 2000,
      to: 2001,
      message: 'an expression is at most 2000 characters; this one has 2001',
    });
  });

  it('rejects names written with escape sequences', () => {
    expect(errorsOf('\\u0061 + 1')[0]).toMatchObject({
      from: 0,
      to: 6,
      message: 'write names without escape sequences (\\u…)',
    });
  });

  it('asks for decimal numbers', () => {
    expect(errorsOf('0x1F')[0]?.message).toBe("write numbers in decimal, like 12, 0.5 or 3e-4 (not '0x1F')");
  });

  it('explains a function used as a value', () => {
    expect(errorsOf('exp + 1')[0]?.message).toBe("'exp' is a function: call it, like exp(x)");
  });

  it('reports an unfinished expression at its end', () => {
    expect(errorsOf('x +')[0]).toMatchObject({ from: 2, to: 3, message: 'the expression ends too early' });
  });

  it('suggests == for a stray =', () => {
    expect(errorsOf('x = 1')[0]?.message).toMatch(/to compare, use ==/);
  });
});

describe('checkExpression accepts the whitelist', () => {
  it.each([
    '1',
    '.5',
    '2.',
    '3e-4',
    '1.5E+3',
    '-x',
    '+x',
    '!x',
    'a + b - x * t / 2 ** 3',
    '(a)',
    'x < 1 || x <= 2 && x > 0 && x >= -1',
    'x == 1 ? a : b',
    'x === 1 || x !== 2 || x != 3',
    'exp(log(sqrt(abs(x))))',
    'sin(x) + cos(x) + tan(x) + tanh(x) + sinh(x) + cosh(x)',
    'atan(x) + atan2(x, 1) + asin(0.5) + acos(0.5)',
    'min(x) + max(a, b, x) + pow(x, 2) + sign(x)',
    'floor(x) + ceil(x) + round(x) + log10(x) + log1p(x) + expm1(x)',
    'hypot(a, b) + clamp(x, 0, 1) + step(x) + pos(x)',
    'pi * x',
    '  x  ',
    '(exp)(1)',
  ])('accepts %s', (text) => {
    expect(checkExpression(text, SCOPE)).toMatchObject({ ok: true });
  });

  it('carries the names used, without constants or functions', () => {
    const result = checkExpression('x * exp(-a * t) + pi + x', SCOPE);
    expect(result.ok).toBe(true);
    if (result.ok) expect([...usedNames(result.tree)].sort()).toEqual(['a', 't', 'x']);
  });

  it('lets a scope name named like a constant win over the constant', () => {
    const result = checkExpression('pi', ['pi']);
    expect(result.ok && [...usedNames(result.tree)]).toEqual(['pi']);
  });
});
