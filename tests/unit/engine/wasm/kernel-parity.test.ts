import { describe, expect, it, vi } from 'vitest';
import { exampleSheets } from '@shared/examples/index';
import { buildSimulationPlan } from '@shared/sheet/index';
import type { SimulationPlan } from '@shared/engine/plan';
import { stepSourceFor } from '@shared/engine/methods';
import { simulate, simulateChunk } from '@shared/engine/simulate';
import { makePlan } from '../plans';
import { planLayout } from '@shared/engine/layout';
import { MAX_MEMORY_BYTES, wasmChunkBytes } from '@shared/engine/wasm/simulate-wasm';
import { WEDGE_STRIDE, WEDGE_TABLE } from '@shared/engine/wasm/wedge-table';
import { expectSameOnBothKernels, withKernel } from './parity';

/**
 * The wasm kernel against the JavaScript kernel, the reference: the same bits in every chunk
 * array and the same digest (common practice for a second backend, no source: bit identity is the
 * claim). Path counts are not multiples of four, so the last SIMD group is partly empty.
 */

const METHODS: SimulationPlan['method'][] = ['euler-maruyama', 'milstein', 'heun'];

function methodFits(plan: SimulationPlan, method: SimulationPlan['method']): boolean {
  try {
    stepSourceFor(plan.model, method);
    return true;
  } catch {
    return false;
  }
}

const exampleCases = exampleSheets.flatMap((example) =>
  example.document.cells
    .filter((cell) => cell.kind === 'simulation')
    .flatMap((cell) => {
      const plan = buildSimulationPlan(example.document, cell.id);
      return METHODS.filter((method) => methodFits(plan, method)).map((method) => ({
        name: `${example.slug} / ${cell.id} / ${method}`,
        plan: { ...plan, method, paths: 37, steps: Math.min(plan.steps, 400) },
      }));
    }),
);

describe('the wasm kernel gives the JavaScript kernel’s bits', () => {
  it('covers every example sheet', () => {
    expect(exampleCases.length).toBeGreaterThanOrEqual(exampleSheets.length);
  });

  it.each(exampleCases)('$name', ({ plan }) => {
    expectSameOnBothKernels(plan);
  });

  // 2.75 % of draws fail the fast test (about 11,000 here), about half of those pass the first
  // wedge test, and about 1/128 of the failures come from the base layer (about 90 tail draws).
  const manyDraws = makePlan({
    drift: ['-s0', '0'],
    diffusion: [
      ['1', '0'],
      ['0', '1'],
    ],
    initial: [0, 0],
    t1: 1,
    steps: 50,
    paths: 4001,
    saveCount: 2,
  });

  it('over 400,000 draws: the fast test, the wedge and redraws on four lanes, the tail', () => {
    expectSameOnBothKernels(manyDraws);
  });

  it('decides the wedge test by exp as well as by the cubic (every lane forced inside its band)', () => {
    // An infinite band leaves every wedge test to the exact branch, which otherwise runs rarely.
    const bands = Array.from({ length: 128 }, (_, i) => WEDGE_TABLE[i * WEDGE_STRIDE + 5]!);
    try {
      for (let i = 1; i < 128; i++) WEDGE_TABLE[i * WEDGE_STRIDE + 5] = Infinity;
      expectSameOnBothKernels({ ...manyDraws, seed: 77 });
    } finally {
      bands.forEach((value, i) => (WEDGE_TABLE[i * WEDGE_STRIDE + 5] = value));
    }
  });

  it('for a chunk that starts at a later path (streams by path index)', () => {
    const plan = exampleCases[0]!.plan;
    expectSameOnBothKernels({ ...plan, paths: 13 }, 1001);
  });

  it('seeds as the JavaScript kernel does for seeds and path indices beyond 2^31', () => {
    // The wasm kernel seeds each group itself (seed-wasm.ts) from the header's 32-bit words.
    const plan = exampleCases[0]!.plan;
    expectSameOnBothKernels({ ...plan, paths: 9, seed: 4_123_456_789 }, 2_999_999_990);
  });

  it('with absorbing and reflecting boundaries, watches and probe times', () => {
    expectSameOnBothKernels(
      makePlan({
        drift: ['0.3 * (1 - s0)', '-0.5 * s1'],
        diffusion: [
          ['0.8 * f_sqrt(f_abs(s0))', '0'],
          ['0', '0.6'],
        ],
        initial: [0.4, 0.2],
        t1: 3,
        steps: 300,
        paths: 61,
        boundaries: [
          { rule: 'absorb', level: 0, side: 'below' },
          { rule: 'reflect', level: 0, side: 'below' },
        ],
        probeTimes: [0, 1.3, 3, 1.3],
        watches: [
          { state: 0, level: 1.2, direction: 'above' },
          { state: 1, level: 0.5, direction: 'above', correction: 'bgk' },
        ],
      }),
    );
  });

  it('with correlated noise through the Cholesky factor', () => {
    expectSameOnBothKernels(
      makePlan({
        drift: ['-s0 + 0.2 * s1', '-0.4 * s1'],
        diffusion: [
          ['0.3', '0.1'],
          ['0', '0.5 * f_exp(-0.1 * s0)'],
        ],
        initial: [1, -1],
        t1: 2,
        steps: 250,
        paths: 45,
        correlation: [
          [1, -0.6],
          [-0.6, 1],
        ],
      }),
    );
  });

  it('when paths are lost: not a number, infinite and beyond the blow-up bound', () => {
    const domain = expectSameOnBothKernels(
      makePlan({
        drift: ['-1'],
        diffusion: [['f_sqrt(s0)']],
        initial: [0.5],
        t1: 2,
        steps: 200,
        paths: 41,
      }),
    );
    expect(Array.from(domain.lossCause)).toContain(1);
    const growth = expectSameOnBothKernels(
      makePlan({
        drift: ['s0 * s0 * s0'],
        diffusion: [['s0']],
        initial: [1.5],
        t1: 2,
        steps: 100,
        paths: 23,
      }),
    );
    expect(Array.from(growth.lossCause)).toContain(2);
    const bound = expectSameOnBothKernels(
      makePlan({
        drift: ['0.5 * s0'],
        diffusion: [['s0']],
        initial: [1],
        t1: 4,
        steps: 200,
        paths: 29,
        blowupBound: 5,
      }),
    );
    expect(Array.from(bound.lossCause)).toContain(3);
  });

  it('reuses its memory: a run after one that lost every path, a larger chunk, then a smaller one', () => {
    // The thread's wasm memory and instances are kept from chunk to chunk (simulate-wasm.ts), so
    // nothing a run leaves behind may show in the next: here every path of the first is lost.
    const allLost = makePlan({
      drift: ['s0 * s0 * s0'],
      diffusion: [['1']],
      initial: [50],
      t1: 1,
      steps: 40,
      paths: 64,
    });
    const calm = makePlan({
      drift: ['-s0'],
      diffusion: [['0.2']],
      initial: [1],
      t1: 1,
      steps: 40,
      paths: 64,
    });
    const lost = expectSameOnBothKernels(allLost);
    expect(Array.from(lost.lossCause).every((cause) => cause !== 0)).toBe(true);
    const after = expectSameOnBothKernels(calm);
    expect(Array.from(after.lossCause).every((cause) => cause === 0)).toBe(true);
    expect(Array.from(after.blowupTime).every(Number.isNaN)).toBe(true);
    expectSameOnBothKernels({ ...calm, paths: 3001 });
    expectSameOnBothKernels({ ...allLost, paths: 7 });
    expectSameOnBothKernels({ ...calm, paths: 5 });
  });

  it('when every path of a group is lost early (saves after the loss are NaN)', () => {
    const chunk = expectSameOnBothKernels(
      makePlan({ drift: ['-5'], diffusion: [['f_log(s0)']], initial: [1], t1: 1, steps: 50, paths: 8 }),
    );
    expect(chunk.lossCause.every((cause) => cause === 1)).toBe(true);
  });

  it('with functions called out to JavaScript and the inline ones', () => {
    expectSameOnBothKernels(
      makePlan({
        drift: [
          'f_sin(s0) + f_cos(t) * f_tanh(s0) - f_atan2(s0, 1 + t) + f_pow(f_abs(s0), 1.5) * 0.01 + f_round(s0 * 3) * 0.01',
        ],
        diffusion: [['0.2 + 0.1 * f_sign(s0) * f_step(s0) + f_clamp(s0, -1, 1) * 0.05 + f_pos(-s0) * 0.01']],
        initial: [0.3],
        t1: 1,
        steps: 200,
        paths: 21,
        method: 'euler-maruyama',
      }),
    );
  });

  it('without running extremes when the plan does not record them', () => {
    const plan: SimulationPlan = {
      ...makePlan({
        drift: ['1.1 * (0.8 - s0)'],
        diffusion: [['0.3']],
        initial: [2],
        t1: 5,
        steps: 500,
        paths: 33,
      }),
      recordExtremes: false,
    };
    const chunk = expectSameOnBothKernels(plan);
    expect(chunk.runningMax.every(Number.isNaN)).toBe(true);
  });

  it('for plans that differ only in their numbers (one compiled module, each its own constants)', () => {
    for (const theta of [0.5, 2.5, 0.5]) {
      expectSameOnBothKernels(
        makePlan({
          drift: [`${theta} * (1 - s0)`],
          diffusion: [[`${theta / 4}`]],
          initial: [0],
          t1: 1,
          steps: 50,
          paths: 9,
        }),
      );
    }
  });

  it('falls back to the JavaScript kernel, and says so, for a plan field it does not know', () => {
    const plan = {
      ...makePlan({ drift: ['-s0'], diffusion: [['1']], initial: [0], t1: 1, steps: 10, paths: 5 }),
      inputForm: {},
    };
    const chunk = withKernel('wasm', () => simulateChunk(plan, 0, plan.paths));
    expect(chunk.kernel).toBe('js');
    expect(chunk.kernelNote).toMatch(/inputForm/);
    expect(withKernel('auto', () => simulate(plan)).kernel).toBe('js');
  });

  it('sizes its memory per chunk and has a limit above what the worker pool asks for', () => {
    // The pool's chunks hold at most 2,000 paths (shared/run/chunks.ts); a sheet's default keeps
    // 101 saved times. A chunk beyond MAX_MEMORY_BYTES runs on JavaScript (simulate-wasm.ts).
    const plan = makePlan({
      drift: ['-s0', '-s1'],
      diffusion: [
        ['1', '0'],
        ['0', '1'],
      ],
      initial: [0, 0],
      t1: 1,
      steps: 100,
      paths: 2000,
      saveCount: 101,
    });
    const layout = planLayout(plan);
    const bytes = wasmChunkBytes(plan, layout, 2000);
    expect(bytes).toBeGreaterThan(8 * 101 * 2 * 2000);
    expect(bytes).toBeLessThan(MAX_MEMORY_BYTES / 100);
    expect(wasmChunkBytes(plan, layout, 1_000_000)).toBeGreaterThan(MAX_MEMORY_BYTES);
  });

  it('falls back, and says so, when the engine refuses to compile the module (a strict policy)', () => {
    const refuse = vi.spyOn(WebAssembly, 'Module').mockImplementation(function refused() {
      throw new WebAssembly.CompileError('refused by the content security policy');
    });
    try {
      // A shape no other test builds, so the module is not in the cache.
      const plan = makePlan({
        drift: ['-s0 * s0 * s0 * s0 * s0 * 0.001'],
        diffusion: [['0.5']],
        initial: [0],
        t1: 1,
        steps: 10,
        paths: 5,
      });
      const result = withKernel('auto', () => simulate(plan));
      expect(result.kernel).toBe('js');
      expect(result.kernelNote).toMatch(
        /^this JavaScript engine did not compile the wasm kernel.*refused by the content security policy/,
      );
    } finally {
      refuse.mockRestore();
    }
  });

  it('falls back for a source it cannot read (a member call)', () => {
    const plan = makePlan({
      drift: ['-Math.sin(s0)'],
      diffusion: [['1']],
      initial: [0],
      t1: 1,
      steps: 10,
      paths: 5,
    });
    const result = withKernel('auto', () => simulate(plan));
    expect(result.kernel).toBe('js');
    expect(result.kernelNote).toMatch(/does not support/);
  });
});
