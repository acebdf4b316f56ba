import { describe, expect, it } from 'vitest';
import { checkExpression, EXPRESSION_PRELUDE, generateSource } from '@shared/expr';
import { PORTABLE_MATH } from '@shared/expr/portable-math';

/**
 * The engine's elementary functions must give the same bits in every JavaScript engine, so the
 * generated code and the tree evaluator never call the engine's own transcendental Math functions
 * (they differ between Node 20 and a current Chromium; the e2e test tests/e2e/same-digests.test.ts
 * compares digests across the two).
 */
describe('portable elementary functions', () => {
  it('are what generated code calls, for functions and for the power operator', () => {
    for (const name of [
      'exp',
      'log',
      'pow',
      'sin',
      'cos',
      'tan',
      'atan',
      'sinh',
      'cosh',
      'tanh',
      'log1p',
      'expm1',
    ]) {
      expect(EXPRESSION_PRELUDE).not.toMatch(new RegExp(`Math\\.${name}\\b`));
    }
    const tree = checkExpression('x ** 1.5', ['x']);
    if (!tree.ok) throw new Error('the expression should check');
    expect(generateSource(tree.tree, { x: 's0' })).toBe('f_pow(s0, 1.5)');
  });

  it('agree with the reference values to within a few units in the last place', () => {
    // Against values known exactly (common practice, no source), and within 4 ulp of this
    // engine's own Math.exp (IEEE-754 asks elementary functions to be close, not exact).
    expect(PORTABLE_MATH.exp(PORTABLE_MATH.log(120))).toBeCloseTo(120, 12);
    expect(PORTABLE_MATH.pow(2, 10)).toBe(1024);
    expect(PORTABLE_MATH.pow(3.7, 2)).toBe(3.7 * 3.7);
    expect(PORTABLE_MATH.sin(Math.PI / 6)).toBeCloseTo(0.5, 15);
    expect(PORTABLE_MATH.atan(1) * 4).toBeCloseTo(Math.PI, 15);
    for (let x = -20; x <= 20; x += 0.37) {
      expect(Math.abs(PORTABLE_MATH.exp(x) - Math.exp(x))).toBeLessThanOrEqual(
        4 * Number.EPSILON * Math.exp(x),
      );
    }
  });
});
