import { expect } from 'vitest';
import type { SimulationPlan } from '@shared/engine/plan';
import type { ChunkResult } from '@shared/engine/result';
import { simulate, simulateChunk } from '@shared/engine/simulate';
import { setKernelChoice, type KernelChoice } from '@shared/engine/wasm/kernel-choice';

/** Runs `work` with the engine's kernel set to `choice`, then back to 'auto'. */
export function withKernel<T>(choice: KernelChoice, work: () => T): T {
  setKernelChoice(choice);
  try {
    return work();
  } finally {
    setKernelChoice('auto');
  }
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

/** The first index where two arrays differ bit for bit (NaN equals NaN), or −1. */
function firstDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return i;
  return -1;
}

/**
 * Simulates the plan on both kernels (one chunk and through `simulate`) and expects every array
 * of the chunk and the run's digest to be identical; returns the wasm chunk for further checks.
 */
export function expectSameOnBothKernels(plan: SimulationPlan, firstPath = 0): ChunkResult {
  const js = withKernel('js', () => simulateChunk(plan, firstPath, plan.paths));
  const wasm = withKernel('wasm', () => simulateChunk(plan, firstPath, plan.paths));
  expect(js.kernel).toBe('js');
  expect(wasm.kernelNote).toBeUndefined();
  expect(wasm.kernel).toBe('wasm');
  for (const name of ARRAYS) {
    const at = firstDifference(js[name], wasm[name]);
    expect(at, `${name} differs at ${at}: ${js[name][at]} (js) vs ${wasm[name][at]} (wasm)`).toBe(-1);
  }
  const digestJs = withKernel('js', () => simulate(plan)).digest;
  const digestWasm = withKernel('wasm', () => simulate(plan)).digest;
  expect(digestWasm).toBe(digestJs);
  return wasm;
}
