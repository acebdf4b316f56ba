import { tokenizer, tokTypes } from 'acorn';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  checkExpression,
  evaluate,
  EXPRESSION_CONSTANTS,
  EXPRESSION_FUNCTIONS,
  EXPRESSION_PRELUDE,
  generateSource,
} from '@shared/expr';
import { HELPER_PREFIX } from '@shared/expr/prelude';
import { compileGenerated } from '@shared/engine/compile-generated';

/**
 * A generated fuzz of the expression compiler (the security boundary of a shared sheet). Inputs
 * come from the expression grammar with hostile pieces mixed in (member access, calls of
 * anything, strings, assignment, `new`, names every object has), and from raw character soup.
 * Properties: the checker never throws; what it accepts compiles to source made only of
 * whitelisted tokens, and that source computes exactly what the tree evaluator computes. `npm
 * test` runs a few hundred cases; `npm run fuzz` sets FUZZ_RUNS for a long run.
 */
const RUNS = Number(process.env.FUZZ_RUNS ?? 300);
const SEED = process.env.FUZZ_SEED === undefined ? undefined : Number(process.env.FUZZ_SEED);

const SCOPE = ['t', 'x', 'y', 'k'];
const REPLACEMENTS: Record<string, string> = { t: 't', x: 's0', y: 's1', k: '(-1.25)' };
const PARAMETER_K = -1.25;

const HELPERS = new Set(EXPRESSION_FUNCTIONS.map((f) => `${HELPER_PREFIX}${f.name}`));
const ALLOWED_NAMES = new Set(['t', 's0', 's1', ...HELPERS]);
const ALLOWED_PUNCTUATION = new Set([
  '(',
  ')',
  ',',
  '?',
  ':',
  '+',
  '-',
  '*',
  '/',
  '**',
  '<',
  '<=',
  '>',
  '>=',
  '===',
  '!==',
  '&&',
  '||',
  '!',
]);

const number = fc.oneof(
  fc.integer({ min: 0, max: 1000 }).map(String),
  fc.double({ min: 0, max: 1e6, noNaN: true }).map((value) => String(value)),
  fc.constantFrom('0.5', '.25', '1e3', '2.5e-3', '0x1F', '1_000', '007'),
);
const goodName = fc.constantFrom(...SCOPE, ...EXPRESSION_CONSTANTS.map((c) => c.name));
const badName = fc.constantFrom(
  'constructor',
  '__proto__',
  'toString',
  'valueOf',
  'this',
  'globalThis',
  'window',
  'self',
  'Math',
  'Function',
  'eval',
  'process',
  'undefined',
  'NaN',
  'Infinity',
  'z',
  's0',
  'f_exp',
  'arguments',
);
const leaf = fc.oneof(
  { weight: 4, arbitrary: number },
  { weight: 6, arbitrary: goodName },
  { weight: 1, arbitrary: badName },
);

const { expression } = fc.letrec<{ expression: string }>((tie) => {
  const sub = tie('expression');
  const call = fc
    .tuple(
      fc.constantFrom(...EXPRESSION_FUNCTIONS.map((f) => f.name), 'alert', 'fetch'),
      fc.array(sub, { minLength: 0, maxLength: 4 }),
    )
    .map(([fn, args]) => `${fn}(${args.join(', ')})`);
  const binary = fc
    .tuple(sub, fc.constantFrom('+', '-', '*', '/', '**', '<', '<=', '>', '>=', '==', '!=', '&&', '||'), sub)
    .map(([a, op, b]) => `${a} ${op} ${b}`);
  const hostile = fc
    .tuple(
      sub,
      fc.constantFrom(
        '.constructor',
        '[0]',
        '()',
        ' = 1',
        ' ^ 2',
        ' % 2',
        ' ?? 1',
        ', 1',
        '`x`',
        "['a']",
        '++',
      ),
      sub,
    )
    .map(([a, piece, b]) => (piece === ', 1' ? `(${a}, ${b})` : `${a}${piece}`));
  return {
    expression: fc.oneof(
      { depthSize: 'small', withCrossShrink: true },
      { weight: 5, arbitrary: leaf },
      { weight: 3, arbitrary: binary },
      { weight: 2, arbitrary: call },
      { weight: 1, arbitrary: sub.map((a) => `(${a})`) },
      {
        weight: 1,
        arbitrary: fc
          .tuple(fc.constantFrom('-', '+', '!', 'typeof ', 'new ', 'void '), sub)
          .map(([op, a]) => `${op}${a}`),
      },
      { weight: 1, arbitrary: fc.tuple(sub, sub, sub).map(([a, b, c]) => `${a} ? ${b} : ${c}`) },
      { weight: 1, arbitrary: hostile },
    ),
  };
});

const soup = fc.string({
  unit: fc.constantFrom(...'tx yk0123456789.eE+-*/()<>=!&|?:,[]{}"\'`;^%_$\\ \n'.split('')),
  maxLength: 60,
});

const value = fc.double({ min: -10, max: 10, noNaN: true });

// Runs generated source the way the engine does, through its one compile function.
function compile(source: string): (t: number, s0: number, s1: number) => number {
  return compileGenerated(['t', 's0', 's1'], `${EXPRESSION_PRELUDE}\nreturn ${source};`);
}

/** Every token of generated source: numbers, whitelisted punctuation, our names and helpers. */
function foreignTokens(source: string): string[] {
  const foreign: string[] = [];
  for (const token of tokenizer(source, { ecmaVersion: 2022 })) {
    const text = source.slice(token.start, token.end);
    if (token.type === tokTypes.num) continue;
    if (token.type === tokTypes.name && ALLOWED_NAMES.has(text)) continue;
    if (token.type !== tokTypes.name && token.type !== tokTypes.string && ALLOWED_PUNCTUATION.has(text))
      continue;
    foreign.push(text);
  }
  return foreign;
}

function checkAccepted(text: string, t: number, x: number, y: number): void {
  const checked = checkExpression(text, SCOPE);
  if (!checked.ok) {
    for (const error of checked.errors) {
      expect(error.from).toBeGreaterThanOrEqual(0);
      expect(error.to).toBeLessThanOrEqual(Math.max(text.length, error.from + 1));
      expect(error.message.length).toBeGreaterThan(0);
    }
    return;
  }
  const source = generateSource(checked.tree, REPLACEMENTS);
  expect(foreignTokens(source)).toEqual([]);
  const compiled = compile(source)(t, x, y);
  const walked = evaluate(checked.tree, { t, x, y, k: PARAMETER_K });
  expect(Object.is(compiled, walked) || (Number.isNaN(compiled) && Number.isNaN(walked))).toBe(true);
}

describe('expression compiler fuzz', () => {
  it('accepted expressions compile to whitelisted tokens only and agree with the tree evaluator', () => {
    fc.assert(
      fc.property(expression, value, value, value, (text, t, x, y) => checkAccepted(text, t, x, y)),
      { numRuns: RUNS, seed: SEED },
    );
  });

  it('random character soup never crashes the checker, and what passes is just as safe', () => {
    fc.assert(
      fc.property(soup, value, value, value, (text, t, x, y) => checkAccepted(text, t, x, y)),
      { numRuns: RUNS, seed: SEED },
    );
  });

  it('the grammar generator reaches accepted and rejected inputs alike (the fuzz is not vacuous)', () => {
    const samples = fc.sample(expression, { numRuns: 400, seed: 7 });
    const accepted = samples.filter((text) => checkExpression(text, SCOPE).ok).length;
    expect(accepted).toBeGreaterThan(40);
    expect(samples.length - accepted).toBeGreaterThan(40);
  });
});
