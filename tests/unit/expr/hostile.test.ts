import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { checkExpression } from '@shared/expr';

// The compiler is a security boundary: a shared sheet is someone else's code. Every input here
// must be rejected, and checking it must run nothing. Payloads that could run would set
// globalThis.__meanderPwned.
const SCOPE = ['x', 'y', 't'];
const MARK = 'globalThis.__meanderPwned = 1';

const HOSTILE: readonly string[] = [
  // property access and the prototype chain
  'x.constructor',
  'x["constructor"]',
  'exp.constructor',
  `exp.constructor("${MARK}")()`,
  `constructor.constructor("${MARK}")()`,
  'x.__proto__',
  '__proto__',
  'constructor',
  'pi.constructor',
  'toString()',
  'valueOf',
  'hasOwnProperty("x")',
  'x[0]',
  'exp.call(null, 1)',
  'exp.apply(null, [1])',
  'exp.bind(null)(1)',
  'exp.name',
  // globals and non-whitelisted calls
  'this',
  'globalThis',
  'window',
  'self',
  'process',
  'require("fs")',
  `Function("${MARK}")()`,
  `eval("${MARK}")`,
  'setTimeout(exp, 0)',
  'fetch("https://example.test")',
  'alert(1)',
  'x(1)',
  '(1)(2)',
  'exp(1)(2)',
  'undefined',
  'NaN',
  'Infinity',
  // assignments, updates, sequences
  'x = 1',
  `globalThis.__meanderPwned = 1`,
  'x += 1',
  'x ||= 1',
  'x++',
  '--x',
  'x, y',
  '(x, 1)',
  'exp(1), exp(2)',
  // templates, regexes, strings, literals
  '`a${x}`',
  'exp`1`',
  '/x/',
  '/x/.test("x")',
  '"s"',
  "'s'",
  '[1]',
  '[1, 2][0]',
  '{}',
  '({ a: 1 })',
  'exp(...[1])',
  'true',
  'null',
  '1n',
  '0x41',
  '0o17',
  '0b11',
  '017',
  '1_000',
  '1e999',
  // constructs that create or reach code
  'new Date()',
  'new exp(1)',
  '() => 1',
  'x => x',
  'async () => 1',
  'function () { return 1 }',
  'class {}',
  'import("x")',
  'import.meta',
  'new.target',
  'super.x',
  'await x',
  'yield x',
  'x?.y',
  'exp?.(1)',
  '#x in y',
  // operators outside the whitelist
  'typeof x',
  'void 0',
  'delete x',
  'x in y',
  'x instanceof y',
  'x | 1',
  'x & 1',
  'x ^ 2',
  '~x',
  'x << 1',
  'x >>> 1',
  'x % 2',
  'x ?? 1',
  // unicode escapes and comments hiding code
  '\\u0065xp(1)',
  'e\\u0078p(1)',
  'x\\u002econstructor',
  `1 /* ${MARK} */ + 2`,
  `1 // ${MARK}`,
  `x\n// ${MARK}`,
  `1 <!-- ${MARK}`,
  `x\n--> ${MARK}`,
  // statements and trailing text
  `x; ${MARK}`,
  `x\n${MARK}`,
  'if (x) 1',
  'let',
  // empty, long and deep input
  '',
  '   ',
  'x + '.repeat(600) + 'x',
  '('.repeat(10_000) + 'x' + ')'.repeat(10_000),
  '('.repeat(999) + 'x' + ')'.repeat(999),
  '['.repeat(999) + ']'.repeat(999),
  '- '.repeat(999) + 'x',
  '!'.repeat(1999) + 'x',
  'x ? 1 : '.repeat(240) + '0',
  '1 + '.repeat(400) + '1',
];

describe('checkExpression as a security boundary', () => {
  let functionSpy: ReturnType<typeof vi.spyOn>;
  let evalSpy: ReturnType<typeof vi.spyOn>;

  beforeEach(() => {
    delete (globalThis as Record<string, unknown>).__meanderPwned;
    functionSpy = vi.spyOn(globalThis, 'Function');
    evalSpy = vi.spyOn(globalThis, 'eval');
  });

  afterEach(() => {
    vi.restoreAllMocks();
  });

  it('lists at least 50 hostile inputs', () => {
    expect(HOSTILE.length).toBeGreaterThanOrEqual(50);
  });

  it.each(
    HOSTILE.map((text) => [text.length > 60 ? `${text.slice(0, 40)}… (${text.length} chars)` : text, text]),
  )('rejects %s with a positioned message and runs nothing', (_label, text) => {
    const result = checkExpression(text, SCOPE);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.length).toBeGreaterThan(0);
    for (const error of result.errors) {
      expect(error.message.length).toBeGreaterThan(5);
      expect(error.from).toBeGreaterThanOrEqual(0);
      expect(error.to).toBeGreaterThanOrEqual(error.from);
      expect(error.to).toBeLessThanOrEqual(Math.max(text.length, 1));
    }
    expect(functionSpy).not.toHaveBeenCalled();
    expect(evalSpy).not.toHaveBeenCalled();
    expect((globalThis as Record<string, unknown>).__meanderPwned).toBeUndefined();
  });

  it('handles 10 000 nested brackets without overflowing the stack', () => {
    const within = '('.repeat(10_000) + 'x' + ')'.repeat(10_000);
    expect(() => checkExpression(within, SCOPE)).not.toThrow();
    // Within the length limit too: the bracket depth is checked before parsing.
    const deep = checkExpression('('.repeat(999) + 'x' + ')'.repeat(999), SCOPE);
    expect(deep.ok).toBe(false);
    if (!deep.ok) expect(deep.errors[0]?.message).toMatch(/nested more than 64 levels/);
  });

  it('accepts the deepest allowed nesting', () => {
    expect(checkExpression('('.repeat(63) + 'x' + ')'.repeat(63), SCOPE).ok).toBe(true);
  });
});
