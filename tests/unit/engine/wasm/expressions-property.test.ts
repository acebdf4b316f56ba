import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkExpression, EXPRESSION_FUNCTIONS, generateSource } from '@shared/expr';
import type { SimulationPlan } from '@shared/engine/plan';
import { simulateChunk } from '@shared/engine/simulate';
import { makePlan } from '../plans';
import { withKernel } from './parity';

/**
 * A property over generated whitelisted expressions (the checked grammar, every helper): as drift
 * and diffusion of a short two-state run, the wasm kernel gives the JavaScript kernel's bits in
 * every output, or it says it does not support the model and the run falls back to JavaScript
 * (common practice for a second backend, no source). `FUZZ_RUNS` raises the count.
 */
const RUNS = Number(process.env.FUZZ_RUNS ?? 60);
const SCOPE = ['t', 'x', 'y'];
const NAMES: Record<string, string> = { t: 't', x: 's0', y: 's1' };

const leaf = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom('0', '0.5', '1', '2', '1.5', '0.001', '3', '10', 'pi') },
  { weight: 4, arbitrary: fc.constantFrom(...SCOPE) },
);

const { expression } = fc.letrec<{ expression: string }>((tie) => {
  const sub = tie('expression');
  const call = fc.constantFrom(...EXPRESSION_FUNCTIONS).chain((fn) => {
    const [lo, hi] =
      typeof fn.arity === 'number' ? [fn.arity, fn.arity] : [fn.arity[0], Math.min(3, fn.arity[1])];
    return fc.array(sub, { minLength: lo, maxLength: hi }).map((args) => `${fn.name}(${args.join(', ')})`);
  });
  const binary = fc
    .tuple(sub, fc.constantFrom('+', '-', '*', '/', '**', '<', '<=', '>', '>=', '==', '!=', '&&', '||'), sub)
    .map(([a, op, b]) => `(${a} ${op} ${b})`);
  return {
    expression: fc.oneof(
      { depthSize: 'small', withCrossShrink: true },
      { weight: 5, arbitrary: leaf },
      { weight: 3, arbitrary: binary },
      { weight: 3, arbitrary: call },
      { weight: 1, arbitrary: fc.tuple(fc.constantFrom('-', '!'), sub).map(([op, a]) => `(${op}(${a}))`) },
      { weight: 1, arbitrary: fc.tuple(sub, sub, sub).map(([a, b, c]) => `(${a} ? ${b} : ${c})`) },
    ),
  };
});

function source(text: string): string {
  const checked = checkExpression(text, SCOPE);
  if (!checked.ok) throw new Error(`the generator made an expression the checker refuses: ${text}`);
  return generateSource(checked.tree, NAMES);
}

function planOf(drift: string, diffusion: string, boundary: boolean): SimulationPlan {
  return makePlan({
    drift: [source(drift), '-0.5 * s1'],
    diffusion: [
      [source(diffusion), '0'],
      ['0', '0.4'],
    ],
    initial: [0.7, -0.3],
    t1: 1,
    steps: 24,
    paths: 7,
    saveCount: 5,
    probeTimes: [0.5],
    watches: [{ state: 0, level: 1, direction: 'above' }],
    boundaries: boundary
      ? [
          { rule: 'reflect', level: 0, side: 'below' },
          { rule: 'absorb', level: -1, side: 'below' },
        ]
      : undefined,
  });
}

const ARRAYS = [
  'saved',
  'probeValues',
  'runningMax',
  'runningMin',
  'firstPassage',
  'absorptionTime',
  'blowupTime',
  'lossCause',
] as const;

describe('generated expressions on both kernels', () => {
  it('give the same bits, or the wasm kernel says it does not support them', () => {
    let ranOnWasm = 0;
    fc.assert(
      fc.property(expression, expression, fc.boolean(), (drift, diffusion, boundary) => {
        const plan = planOf(drift, diffusion, boundary);
        const js = withKernel('js', () => simulateChunk(plan, 0, plan.paths));
        const wasm = withKernel('wasm', () => simulateChunk(plan, 0, plan.paths));
        if (wasm.kernel === 'js') {
          expect(wasm.kernelNote).toMatch(/wasm kernel/);
        } else {
          ranOnWasm++;
        }
        for (const name of ARRAYS) {
          const a = js[name];
          const b = wasm[name];
          for (let i = 0; i < a.length; i++) {
            if (!Object.is(a[i], b[i]))
              throw new Error(
                `${name}[${i}]: ${a[i]} (js) vs ${b[i]} (${wasm.kernel}) for ${drift} / ${diffusion}`,
              );
          }
        }
      }),
      { numRuns: RUNS },
    );
    // Every whitelisted construct is supported today, so the property is about wasm, not fallback.
    expect(ranOnWasm).toBe(RUNS);
  });
});
