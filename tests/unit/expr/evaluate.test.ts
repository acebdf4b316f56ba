import { describe, expect, it } from 'vitest';
import { checkExpression, evaluate, type CheckedExpr } from '@shared/expr';

function value(text: string, values: Record<string, number> = {}): number {
  const result = checkExpression(text, Object.keys(values));
  if (!result.ok) throw new Error(result.errors.map((e) => e.message).join('; '));
  return evaluate(result.tree, values);
}

describe('evaluate against hand-computed values', () => {
  // Elementary identities of the real functions (any calculus text), evaluated exactly or to
  // within a few ulps.
  it.each([
    ['sin(pi / 6)', 0.5],
    ['cos(pi)', -1],
    ['exp(log(7.25))', 7.25],
    ['hypot(3, 4)', 5],
    ['atan2(1, 1)', Math.PI / 4],
    ['acos(-1)', Math.PI],
    ['asin(1)', Math.PI / 2],
    ['log10(1000)', 3],
    ['sqrt(2) ** 2', 2],
    ['cosh(0) + sinh(0) + tanh(0)', 1],
    ['log1p(0) + expm1(0)', 0],
    ['pow(2, 10)', 1024],
    ['2 ** -1', 0.5],
  ])('%s = %s', (text, expected) => {
    expect(value(text)).toBeCloseTo(expected, 12);
  });

  it.each([
    ['2 ** 3 ** 2', 512], // ** is right-associative (ECMAScript 2016)
    ['-(2 ** 2)', -4],
    ['(-2) ** 2', 4],
    ['1 + 2 * 3', 7],
    ['(1 + 2) * 3', 9],
    ['7 - 2 - 1', 4],
    ['8 / 2 / 2', 2],
    ['clamp(5, 0, 1)', 1],
    ['clamp(-5, 0, 1)', 0],
    ['clamp(0.25, 0, 1)', 0.25],
    ['step(0)', 1],
    ['step(-1e-300)', 0],
    ['pos(-2) + pos(3)', 3],
    ['sign(-3)', -1],
    ['floor(-1.5)', -2],
    ['ceil(-1.5)', -1],
    ['round(2.5)', 3], // halves go up, as ECMAScript's Math.round
    ['round(-2.5)', -2],
    ['min(3, 1, 2) + max(3, 1, 2)', 4],
    ['abs(-4.5)', 4.5],
  ])('%s = %s exactly', (text, expected) => {
    expect(value(text)).toBe(expected);
  });

  it('turns comparisons and logic into 1 and 0, with JavaScript truthiness', () => {
    expect(value('1 < 2 && 3 > 4')).toBe(0);
    expect(value('0 || 5')).toBe(1);
    expect(value('0 || 0')).toBe(0);
    expect(value('!0')).toBe(1);
    expect(value('!(0 / 0)')).toBe(1); // NaN is falsy
    expect(value('1 == 1.0') + value('1 === 1') + value('1 !== 2') + value('1 != 1')).toBe(3);
    expect(value('2 <= 2') + value('2 >= 3')).toBe(1);
  });

  it('reads names from the values given', () => {
    expect(value('theta * (mu - x)', { theta: 1.5, mu: 0.75, x: 0.25 })).toBe(0.75);
    expect(value('x > 0 ? x : -x', { x: -3 })).toBe(3);
  });

  it('short-circuits && and ||', () => {
    // The right side would read a missing value: it must not be evaluated.
    const tree = checkExpression('0 && k', ['k']);
    expect(tree.ok && evaluate(tree.tree, {})).toBe(0);
  });

  it('propagates NaN through step so a blown-up path stays visible', () => {
    expect(value('step(0 / 0)')).toBeNaN();
  });

  it('throws a clear error for a name without a value, ignoring inherited properties', () => {
    const result = checkExpression('constructor + 1', ['constructor']);
    expect(result.ok).toBe(true);
    if (result.ok)
      expect(() => evaluate(result.tree, {})).toThrow("no value given for the name 'constructor'");
  });

  it('refuses a forged call of an inherited property', () => {
    const forged = {
      root: { kind: 'call', fn: 'constructor', args: [] },
      names: [],
    } as unknown as CheckedExpr;
    expect(() => evaluate(forged, {})).toThrow('not an expression function: constructor');
  });
});
