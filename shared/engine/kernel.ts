import type { SimulationPlan } from './plan';
import type { PlanLayout } from './layout';
import { buildIncrementKernelSource, buildKernelSource, kernelInputs } from './codegen';
import { streamSeed } from './random/stream-seed';
import { normalSlowPath, ZIGGURAT_FAST_TABLE } from './random/ziggurat';
import { compileGenerated } from './compile-generated';

/** What a compiled kernel reads: the chunk's output arrays, the tables and the path range. */
export interface KernelContext {
  /** The ziggurat's fast-path table (wn, then kn²; see ZIGGURAT_FAST_TABLE). */
  zt: Float64Array;
  /** Scratch generator state for the ziggurat's rare branch. */
  gen: Int32Array;
  normalSlowPath: typeof normalSlowPath;
  seedState: Uint32Array;
  streamSeed: typeof streamSeed;
  saved: Float64Array;
  probeValues: Float64Array;
  runningMax: Float64Array;
  runningMin: Float64Array;
  firstPassage: Float64Array;
  absorptionTime: Float64Array;
  blowupTime: Float64Array;
  lossCause: Uint8Array;
  saveSteps: Int32Array;
  probeStepsSorted: Int32Array;
  probeOrder: Int32Array;
  /** A kernel built from the plan's input form reads these per run (see kernelInputs in codegen.ts). */
  inputs: Float64Array;
  seed: number;
  firstPath: number;
  pathCount: number;
  pStart: number;
  pEnd: number;
  /** Polled inside very long paths only (see codegen.ts). */
  shouldStop: () => boolean;
}

/** Returns the index after the last completed path. */
export type Kernel = (ctx: KernelContext) => number;

export interface IncrementContext {
  increments: Float64Array;
  out: Float64Array;
  steps: number;
  h: number;
}

export type IncrementKernel = (ctx: IncrementContext) => number;

/**
 * Compiled kernels by source: a run is split into many chunks, and compiling (and letting the
 * JIT warm up) once per run rather than once per chunk matters. Small, most recent last.
 */
const cache = new Map<string, Kernel | IncrementKernel>();
const CACHE_SIZE = 8;

/** `factory`: the source is a body that returns the kernel (buildKernelSource), else the kernel's own body. */
function compile<T>(source: string, factory: boolean): T {
  const hit = cache.get(source);
  if (hit !== undefined) {
    cache.delete(source);
    cache.set(source, hit);
    return hit as T;
  }
  // The source is built by codegen.ts from the expression compiler's checked output and literals.
  const compiled = factory
    ? compileGenerated<() => Kernel>([], source)()
    : compileGenerated<IncrementKernel>(['ctx'], source);
  cache.set(source, compiled);
  if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
  return compiled as T;
}

export function compileKernel(plan: SimulationPlan, layout: PlanLayout): Kernel {
  return compile<Kernel>(buildKernelSource(plan, layout), true);
}

export function compileIncrementKernel(plan: SimulationPlan, layout: PlanLayout): IncrementKernel {
  return compile<IncrementKernel>(buildIncrementKernelSource(plan, layout), false);
}

export const KERNEL_TABLE = ZIGGURAT_FAST_TABLE;
export { streamSeed, normalSlowPath, kernelInputs };
