import { describe, expect, it } from 'vitest';
import {
  checkExpression,
  evaluate,
  EXPRESSION_FUNCTIONS,
  EXPRESSION_PRELUDE,
  generateSource,
  numberSource,
  type CheckedExpr,
} from '@shared/expr';
import { FUNCTION_IMPLEMENTATIONS } from '@shared/expr/library';
import { compileGenerated } from '@shared/engine/compile-generated';

// Runs generated source the way the engine does, through its one compile function.
function compile(source: string): (t: number, s0: number, s1: number) => number {
  return compileGenerated(['t', 's0', 's1'], `${EXPRESSION_PRELUDE}\nreturn ${source};`);
}

const SCOPE = ['t', 'x', 'y', 'k', 'm'];
const NAMES = { t: 't', x: 's0', y: 's1', k: '(-1.25)', m: '(0.3)' };
const PARAMS = { k: -1.25, m: 0.3 };

const EXPRESSIONS = [
  'k * (m - x)',
  '-k - -x',
  '- -x',
  '-(x ** 0) + (-x) ** 2',
  '2 ** 3 ** 0.5',
  'x / y - t * k',
  'exp(-k * t) * sin(x) + cos(y)',
  'sqrt(abs(x * y)) + log(1 + x * x)',
  'tanh(x) + sinh(y) - cosh(t) + atan(x) + atan2(y, x)',
  'asin(clamp(x, -1, 1)) + acos(clamp(y, -1, 1))',
  'min(x, y, k) + max(x, y, m) + pow(x, 3) + sign(y)',
  'floor(x) + ceil(y) + round(t) + log10(1 + x * x) + log1p(x * x) + expm1(y)',
  'hypot(x, y, k) + step(x - y) + pos(y - 1)',
  'x > y ? x : y',
  'x < 0 || y < 0',
  'x >= 0 && !(y <= 0)',
  'x == y || x != 0',
  '(x > 0) * 2 + (y > 0)',
  'pi * k * m',
  '1e-7 * x + 123456789.123 + 0.1',
  't < 1 ? k : t < 2 ? m : 0',
];

const POINTS: [number, number, number][] = [
  [0, 0.5, -0.75],
  [1.5, -2, 3],
  [2.25, 0, 0],
  [0.1, 1e-9, -1e9],
];

describe('generateSource', () => {
  it.each(EXPRESSIONS)('gives the same value as evaluate for %s', (text) => {
    const checked = checkExpression(text, SCOPE);
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    const fn = compile(generateSource(checked.tree, NAMES));
    for (const [t, x, y] of POINTS) {
      expect(fn(t, x, y)).toBe(evaluate(checked.tree, { ...PARAMS, t, x, y }));
    }
  });

  it('writes numbers with full precision and brackets negatives', () => {
    expect(numberSource(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(numberSource(-2)).toBe('(-2)');
    expect(numberSource(-0)).toBe('(-0)');
    expect(numberSource(1e21)).toBe('1e+21');
    expect(() => numberSource(Number.POSITIVE_INFINITY)).toThrow(/non-finite/);
  });

  it('replaces names and helpers, never copying the user text', () => {
    const checked = checkExpression('exp( x )*k', SCOPE);
    expect(checked.ok && generateSource(checked.tree, NAMES)).toBe('(f_exp(s0) * (-1.25))');
  });

  it('brackets a replacement that is not self-contained', () => {
    const checked = checkExpression('-k', SCOPE);
    expect(checked.ok && generateSource(checked.tree, { k: '-1' })).toBe('(-(-1))');
  });

  it('refuses a name without a replacement', () => {
    const checked = checkExpression('x + y', SCOPE);
    expect(checked.ok).toBe(true);
    if (checked.ok)
      expect(() => generateSource(checked.tree, { x: 's0' })).toThrow(
        "no replacement given for the name 'y'",
      );
  });
});

describe('generateSource on a tree not made by checkExpression', () => {
  it.each([
    [
      'an operator',
      {
        kind: 'arithmetic',
        op: '+ globalThis.__meanderPwned',
        left: { kind: 'number', value: 1 },
        right: { kind: 'number', value: 2 },
      },
    ],
    ['a function', { kind: 'call', fn: 'constructor', args: [] }],
    ['a node kind', { kind: 'source', text: 'globalThis.__meanderPwned = 1' }],
    ['a number', { kind: 'number', value: Number.NaN }],
  ])('refuses a forged %s', (_what, root) => {
    const forged = { root, names: [] } as unknown as CheckedExpr;
    expect(() => generateSource(forged, {})).toThrow();
  });
});

describe('EXPRESSION_PRELUDE', () => {
  const helpers = compileGenerated<() => Record<string, (...args: number[]) => number>>(
    [],
    `${EXPRESSION_PRELUDE}\nreturn { ${EXPRESSION_FUNCTIONS.map((f) => `${f.name}: f_${f.name}`).join(', ')} };`,
  )();

  it('defines every function with the f_ prefix', () => {
    for (const fn of EXPRESSION_FUNCTIONS) {
      expect(EXPRESSION_PRELUDE).toMatch(new RegExp(`\\bf_${fn.name} = `));
      expect(typeof helpers[fn.name]).toBe('function');
    }
  });

  it('agrees with the evaluator’s implementations', () => {
    const samples = [-2.5, -1, -0.3, 0, 0.4, 1, 2.5, 7, Number.NaN];
    for (const fn of EXPRESSION_FUNCTIONS) {
      const count = typeof fn.arity === 'number' ? fn.arity : Math.max(2, fn.arity[0]);
      for (const a of samples) {
        for (const b of samples.slice(0, 4)) {
          const args = [a, b, b + 1].slice(0, count);
          expect(helpers[fn.name]?.(...args)).toBe(FUNCTION_IMPLEMENTATIONS[fn.name](...args));
        }
      }
    }
  });
});
