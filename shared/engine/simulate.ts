import type { SimulationPlan } from './plan';
import type { ChunkResult, SimulationHooks, SimulationResult } from './result';
import { planLayout, type PlanLayout } from './layout';
import {
  compileKernel,
  kernelInputs,
  KERNEL_TABLE,
  normalSlowPath,
  streamSeed,
  type KernelContext,
} from './kernel';
import { mergeChunks } from './merge';
import { kernelChoice, unknownPlanFields, wasmSimdAvailable } from './wasm/kernel-choice';
import { compileWasmKernel, simulateChunkWasm, type Compiled } from './wasm/simulate-wasm';
import { Refused, Unsupported } from './wasm/source-tree';

/** Aim for batches of about this much wall time between hook checks (cancel lands within 200 ms). */
const BATCH_TARGET_MS = 15;
/** First batch: about this many path-steps, before the timing is known. */
const FIRST_BATCH_PATH_STEPS = 100_000;

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

/**
 * Bytes a chunk of `pathCount` paths holds: 8 · pathCount · ((saveCount + probeCount) · d + 3d +
 * watches + 1) + pathCount (loss causes, one byte each). It grows with paths × saved times,
 * never with steps.
 */
export function chunkBytes(plan: SimulationPlan, pathCount: number): number {
  const d = plan.model.stateNames.length;
  return (
    8 * pathCount * ((plan.saveCount + plan.probeTimes.length) * d + 3 * d + plan.watches.length + 1) +
    pathCount
  );
}

/** Allocates the chunk's arrays (memory: pathCount · (saveCount + probeCount) · d doubles, plus per-path records). */
export function allocateChunk(
  plan: SimulationPlan,
  layout: PlanLayout,
  firstPath: number,
  pathCount: number,
): ChunkResult {
  const d = layout.stateCount;
  const probeCount = layout.probeSteps.length;
  const watchCount = plan.watches.length;
  return {
    firstPath,
    pathCount,
    pathsDone: 0,
    cancelled: false,
    stateCount: d,
    saveCount: plan.saveCount,
    probeCount,
    watchCount,
    saved: new Float64Array(plan.saveCount * d * pathCount),
    probeValues: new Float64Array(probeCount * d * pathCount),
    runningMax: new Float64Array(d * pathCount),
    runningMin: new Float64Array(d * pathCount),
    firstPassage: new Float64Array(watchCount * pathCount),
    absorptionTime: new Float64Array(d * pathCount),
    blowupTime: new Float64Array(pathCount),
    lossCause: new Uint8Array(pathCount),
    kernel: 'js',
  };
}

/**
 * The plan without its input form (ModelSpec.inputForm, a sweep's or scenario's parameters as
 * kernel inputs): its drift and diffusion already hold this point's values as literals, which
 * give the same bits (tests/unit/sweep/kernel-inputs.test.ts), and the wasm kernel reuses one
 * compiled module for plans that differ only in numbers, so it needs no input form of its own.
 */
function literalForm(plan: SimulationPlan): SimulationPlan {
  if (plan.model.inputForm === undefined) return plan;
  const { inputForm: _inputs, ...model } = plan.model;
  return { ...plan, model };
}

/**
 * The compiled wasm kernel of this plan, or why it cannot run on it here (kernel-choice.ts).
 * Anything the wasm kernel does not support runs on the JavaScript kernel instead.
 */
function wasmKernelOrReason(plan: SimulationPlan, layout: PlanLayout): Compiled | string {
  if (!wasmSimdAvailable()) return 'this browser has no WebAssembly SIMD';
  const fields = unknownPlanFields(plan);
  if (fields.length > 0) return `the wasm kernel does not know ${fields.join(', ')}`;
  try {
    return compileWasmKernel(plan, layout);
  } catch (error) {
    if (error instanceof Refused) return error.message;
    if (error instanceof Unsupported) return `the wasm kernel does not support this model: ${error.message}`;
    throw error;
  }
}

/**
 * Simulates paths firstPath … firstPath + pathCount − 1 of the plan. Each path draws from its own
 * stream (seed, path index), so any split into chunks gives the same numbers. Hooks are checked
 * between batches of paths sized to about 15 ms of work; a stop leaves `pathsDone` < pathCount
 * and `cancelled` true.
 */
export function simulateChunk(
  plan: SimulationPlan,
  firstPath: number,
  pathCount: number,
  hooks?: SimulationHooks,
): ChunkResult {
  if (!Number.isInteger(firstPath) || firstPath < 0)
    throw new RangeError(`firstPath must be a non-negative integer, got ${firstPath}`);
  if (!Number.isInteger(pathCount) || pathCount < 0)
    throw new RangeError(`pathCount must be a non-negative integer, got ${pathCount}`);
  const layout = planLayout(plan);
  const chunk = allocateChunk(plan, layout, firstPath, pathCount);
  if (kernelChoice() !== 'js') {
    const wasmPlan = literalForm(plan);
    const wasm = wasmKernelOrReason(wasmPlan, layout);
    try {
      if (typeof wasm !== 'string') {
        simulateChunkWasm(wasmPlan, layout, chunk, hooks, wasm);
        chunk.kernel = 'wasm';
        return chunk;
      }
      chunk.kernelNote = wasm;
    } catch (error) {
      if (!(error instanceof Unsupported)) throw error;
      chunk.kernelNote = error.message;
    }
  }
  const kernel = compileKernel(plan, layout);
  const probeStepsSorted = new Int32Array(layout.probeOrder.length);
  layout.probeOrder.forEach((j, q) => (probeStepsSorted[q] = j < 0 ? -1 : layout.probeSteps[j]!));
  const ctx: KernelContext = {
    zt: KERNEL_TABLE,
    gen: new Int32Array(4),
    normalSlowPath,
    seedState: new Uint32Array(4),
    streamSeed,
    saved: chunk.saved,
    probeValues: chunk.probeValues,
    runningMax: chunk.runningMax,
    runningMin: chunk.runningMin,
    firstPassage: chunk.firstPassage,
    absorptionTime: chunk.absorptionTime,
    blowupTime: chunk.blowupTime,
    lossCause: chunk.lossCause,
    saveSteps: layout.saveSteps,
    probeStepsSorted,
    probeOrder: layout.probeOrder,
    inputs: kernelInputs(plan, layout),
    seed: plan.seed,
    firstPath,
    pathCount,
    pStart: 0,
    pEnd: 0,
    shouldStop: hooks?.shouldStop === undefined ? () => false : () => hooks.shouldStop!() === true,
  };
  const checksHooks = hooks?.shouldStop !== undefined || hooks?.onProgress !== undefined;
  let batch = checksHooks ? Math.max(1, Math.floor(FIRST_BATCH_PATH_STEPS / plan.steps)) : pathCount;
  while (ctx.pEnd < pathCount) {
    if (hooks?.shouldStop?.() === true) {
      chunk.cancelled = true;
      break;
    }
    ctx.pStart = ctx.pEnd;
    ctx.pEnd = Math.min(pathCount, ctx.pStart + batch);
    const started = now();
    const reached = kernel(ctx);
    const elapsed = now() - started;
    chunk.pathsDone = reached;
    if (reached < ctx.pEnd) {
      chunk.cancelled = true;
      break;
    }
    hooks?.onProgress?.(chunk.pathsDone);
    if (checksHooks) {
      // Resize the next batch toward the target time, changing by at most 4× at a time.
      const perPath = Math.max(elapsed, 0.01) / (ctx.pEnd - ctx.pStart);
      batch = Math.max(1, Math.min(batch * 4, Math.floor(BATCH_TARGET_MS / perPath)));
    }
  }
  return chunk;
}

/** The whole run in one chunk: mergeChunks(plan, [simulateChunk(plan, 0, plan.paths, hooks)]). */
export function simulate(plan: SimulationPlan, hooks?: SimulationHooks): SimulationResult {
  return mergeChunks(plan, [simulateChunk(plan, 0, plan.paths, hooks)]);
}
