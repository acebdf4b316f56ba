import { describe, expect, it } from 'vitest';
import { simulate } from '@shared/engine/simulate';
import { setKernelChoice, wasmSimdAvailable } from '@shared/engine/wasm/kernel-choice';
import { buildSimulationPlan, varyingParameters } from '@shared/sheet/plan';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { sheet } from './sheets';

/** A logistic stock with absorption and a watched level: every per-run input of the kernel in use. */
const doc = sheet({
  params: { r: 0.5, K: 100, h: 0.1, s: 0.3, N0: 40, half: 'K / 2' },
  drift: 'r * X * (1 - X / K) - h * X',
  diffusion: 's * X',
  initial: 'N0',
  t1: 5,
  steps: 200,
  paths: 400,
  boundaries: { X: { rule: 'absorb', level: 2, side: 'below' } },
  probes: [{ id: 'dip', quantity: 'hit-before', level: 20, direction: 'below' }],
});

describe('kernel inputs (ModelSpec.inputForm)', () => {
  it('leaves the plan without an input form when nothing varies', () => {
    expect(buildSimulationPlan(doc, 'sim').model.inputForm).toBeUndefined();
    expect(buildSimulationPlan(doc, 'sim', { inputNames: [] }).model.inputForm).toBeUndefined();
  });

  it('lists the swept parameters and those defined from them as varying', () => {
    expect(varyingParameters(doc, 'sim', [{ K: 80 }, { K: 120 }])).toEqual(['K', 'half']);
    expect(varyingParameters(doc, 'sim', [{ h: 0.1 }, { h: 0.1 }])).toEqual([]);
  });

  it('gives the same digest as the literal kernel at every point (same bits, one source)', () => {
    const points = [
      { h: 0.05, N0: 30 },
      { h: 0.2, N0: 50 },
    ];
    const inputNames = varyingParameters(doc, 'sim', points);
    const sources = new Set<string>();
    for (const overrides of points) {
      const withInputs = buildSimulationPlan(doc, 'sim', { overrides, inputNames });
      const plain = buildSimulationPlan(doc, 'sim', { overrides });
      expect(withInputs.model.inputForm?.names).toEqual(['h', 'N0']);
      expect(plain.model.inputForm).toBeUndefined();
      sources.add(JSON.stringify(withInputs.model.inputForm!.drift));
      expect(simulate(withInputs).digest).toBe(simulate(plain).digest);
    }
    // Both points share one input-form source, so one compiled kernel serves both.
    expect(sources.size).toBe(1);
  });

  it("runs a point with kernel inputs on the wasm kernel, with the JavaScript kernel's bits", () => {
    // Node 20 has WebAssembly SIMD; without it this test would have nothing to compare.
    expect(wasmSimdAvailable()).toBe(true);
    const overrides = { h: 0.2, N0: 50 };
    const plan = buildSimulationPlan(doc, 'sim', { overrides, inputNames: ['h', 'N0'] });
    try {
      setKernelChoice('js');
      const js = simulate(plan);
      setKernelChoice('wasm');
      const wasm = simulate(plan);
      expect(js.kernel).toBe('js');
      expect(wasm.kernel).toBe('wasm');
      expect(wasm.digest).toBe(js.digest);
    } finally {
      setKernelChoice('auto');
    }
  });

  it('runs a sweep point as the same run as a simulation with that override', async () => {
    const sweepDoc = { ...doc, cells: [...doc.cells, sweepCell()] };
    const run = await runSheet(sweepDoc, { executor: inProcessExecutor(), target: 'sw' });
    const output = run.outputs.get('sw')!.output;
    if (output.kind !== 'sweep') throw new Error(JSON.stringify(output));
    const alone = simulate(buildSimulationPlan(doc, 'sim', { overrides: { h: 0.3 } }));
    expect(output.result.points[2]!.digest).toBe(alone.digest);
    expect(output.result.kernelInputs).toEqual(['h']);
  });
});

function sweepCell() {
  return {
    id: 'sw',
    kind: 'sweep' as const,
    probe: 'dip',
    axes: [{ parameter: 'h', spacing: 'linear' as const, from: 0.1, to: 0.3, count: 3, values: [] }],
    independent: false,
  };
}
