import type { SimulationPlan } from '../plan';
import type { PlanLayout } from '../layout';
import type { ChunkResult, SimulationHooks } from '../result';
import { ZIGGURAT_FAST_TABLE, ZIGGURAT_TABLES } from '../random/ziggurat';
import { PORTABLE_MATH } from '../../expr/portable-math';
import { buildWasmKernel, type WasmKernelModule } from './kernel-module';
import { Refused, Unsupported } from './source-tree';
import {
  MASK_OFFSET,
  FN_OFFSET,
  FN_PAIRS_OFFSET,
  HEADER_FIELDS,
  HEADER_OFFSET,
  type HeaderField,
  memoryLayout,
  POOL_OFFSET,
  TABLE_OFFSET,
  WEDGE_OFFSET,
} from './memory-layout';
import { WEDGE_TABLE } from './wedge-table';

/**
 * Runs a chunk on the wasm kernel (kernel-module.ts): writes the tables and step lists into the
 * thread's wasm memory (reused from chunk to chunk, see instanceFor), calls `run` on batches of
 * groups (hooks between batches, as simulateChunk does), then copies the outputs into the chunk's
 * own arrays.
 */

export interface Compiled {
  module: WebAssembly.Module;
  callOuts: WasmKernelModule['callOuts'];
  constants: number[];
}

/** Compiled modules by a hash of their bytes, each with the bytes it was compiled from (compared in full). */
const modules = new Map<number, { bytes: Uint8Array; module: WebAssembly.Module }[]>();
const built = new Map<string, Compiled | Unsupported>();
const CACHE_SIZE = 8;

/** Small caches, most recent last. */
function remember<K, T>(cache: Map<K, T>, key: K, value: T): void {
  cache.delete(key);
  cache.set(key, value);
  if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
}

/** FNV-1a 32 of the bytes: the modules cache's key (a hit is then checked byte for byte). */
function hashOf(bytes: Uint8Array): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < bytes.length; i++) hash = Math.imul(hash ^ bytes[i]!, 0x01000193);
  return hash >>> 0;
}

function sameBytes(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Builds and compiles the wasm kernel of a plan (cached by its bytes). Synchronous
 * `new WebAssembly.Module` is allowed in workers and Node, the only places the engine runs.
 */
export function compileWasmKernel(plan: SimulationPlan, layout: PlanLayout): Compiled {
  // A run is many chunks of one plan (each posted to a worker as a copy): build once per plan.
  const planKey = JSON.stringify({ ...plan, paths: 0, seed: 0, samplePaths: 0 });
  const known = built.get(planKey);
  if (known !== undefined) {
    if (known instanceof Unsupported) throw known;
    return known;
  }
  let kernel: WasmKernelModule;
  try {
    kernel = buildWasmKernel(plan, layout);
  } catch (error) {
    if (error instanceof Unsupported) remember(built, planKey, error);
    throw error;
  }
  // The constants live in memory, not in the bytes: plans that differ only in their numbers (a
  // sweep over a parameter) share one compiled module, each with its own constant pool.
  const key = hashOf(kernel.bytes);
  const sameHash = modules.get(key) ?? [];
  let module = sameHash.find((entry) => sameBytes(entry.bytes, kernel.bytes))?.module;
  if (module === undefined) {
    try {
      module = new WebAssembly.Module(kernel.bytes);
    } catch (error) {
      // A browser whose policy or engine refuses the module: run on JavaScript, and say why.
      const refused = new Refused(
        `this JavaScript engine did not compile the wasm kernel (${String(error)})`,
      );
      remember(built, planKey, refused);
      throw refused;
    }
  }
  if (!sameHash.some((entry) => entry.module === module)) sameHash.push({ bytes: kernel.bytes, module });
  remember(modules, key, sameHash);
  const compiled = { module, callOuts: kernel.callOuts, constants: kernel.constants };
  remember(built, planKey, compiled);
  return compiled;
}

const BATCH_TARGET_MS = 15;
/** The wasm kernel's memory for one chunk at most (the worker pool's chunks need a few MiB). */
export const MAX_MEMORY_BYTES = 2 ** 30;

/** Bytes of wasm memory a chunk of `pathCount` paths of the plan needs. */
export function wasmChunkBytes(plan: SimulationPlan, layout: PlanLayout, pathCount: number): number {
  return memoryLayout({
    paddedPaths: Math.ceil(pathCount / 4) * 4,
    stateCount: layout.stateCount,
    saveCount: plan.saveCount,
    probeCount: layout.probeSteps.length,
    watchCount: plan.watches.length,
  }).bytes;
}
const FIRST_BATCH_PATH_STEPS = 100_000;

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

/**
 * Runs the chunk on the wasm kernel; throws Refused, before touching the chunk, when its
 * memory cannot be had (the caller then runs the JavaScript kernel).
 */
export function simulateChunkWasm(
  plan: SimulationPlan,
  layout: PlanLayout,
  chunk: ChunkResult,
  hooks?: SimulationHooks,
  compiled: Compiled = compileWasmKernel(plan, layout),
): void {
  const d = layout.stateCount;
  const pathCount = chunk.pathCount;
  const groups = Math.ceil(pathCount / 4);
  const padded = groups * 4;
  const probeCount = layout.probeSteps.length;
  const mem = memoryLayout({
    paddedPaths: padded,
    stateCount: d,
    saveCount: plan.saveCount,
    probeCount,
    watchCount: plan.watches.length,
  });
  if (mem.bytes > MAX_MEMORY_BYTES)
    throw new Refused(
      `the chunk needs ${Math.ceil(mem.bytes / 2 ** 20)} MiB, more than the wasm kernel takes`,
    );
  const { memory, instance } = instanceFor(compiled, mem.bytes);
  const buffer = memory.buffer;
  // The fast table as pairs (wn[i], kn²[i]), one 16-byte load per lane.
  const table = new Float64Array(buffer, TABLE_OFFSET, 256);
  for (let i = 0; i < 128; i++) {
    table[2 * i] = ZIGGURAT_FAST_TABLE[i]!;
    table[2 * i + 1] = ZIGGURAT_FAST_TABLE[128 + i]!;
  }
  new Float64Array(buffer, FN_OFFSET, 128).set(ZIGGURAT_TABLES.fn);
  const fnPairs = new Float64Array(buffer, FN_PAIRS_OFFSET, 256);
  for (let i = 1; i < 128; i++) {
    fnPairs[2 * i] = ZIGGURAT_TABLES.fn[i]!;
    fnPairs[2 * i + 1] = ZIGGURAT_TABLES.fn[i - 1]!;
  }
  new Float64Array(buffer, WEDGE_OFFSET, WEDGE_TABLE.length).set(WEDGE_TABLE);
  const pool = new Float64Array(buffer, POOL_OFFSET, 2 * compiled.constants.length);
  compiled.constants.forEach((value, i) => pool.fill(value, 2 * i, 2 * i + 2));
  // The ziggurat's layer mask 127 in every i32 lane, after the alive mask.
  new Int32Array(buffer, MASK_OFFSET, 4).fill(127);
  const header = new Int32Array(buffer, HEADER_OFFSET, HEADER_FIELDS.length);
  const values: Record<HeaderField, number> = { ...mem.offsets, seed: plan.seed, firstPath: chunk.firstPath };
  HEADER_FIELDS.forEach((field, w) => (header[w] = values[field]));
  new Int32Array(buffer, mem.offsets.saveSteps, plan.saveCount + 1).set(layout.saveSteps);
  const probeSteps = new Int32Array(buffer, mem.offsets.probeSteps, probeCount + 1);
  layout.probeOrder.forEach((j, q) => (probeSteps[q] = j < 0 ? -1 : layout.probeSteps[j]!));
  new Int32Array(buffer, mem.offsets.probeOrder, probeCount + 1).set(layout.probeOrder);
  // Outputs the kernel leaves as they are for paths never lost: zero, as in a fresh chunk.
  new Uint8Array(buffer, mem.offsets.lossCause, padded).fill(0);
  const run = instance.exports.run as (g0: number, g1: number) => number;

  const checksHooks = hooks?.shouldStop !== undefined || hooks?.onProgress !== undefined;
  let batch = checksHooks ? Math.max(1, Math.floor(FIRST_BATCH_PATH_STEPS / plan.steps / 4)) : groups;
  let done = 0;
  currentStop = hooks?.shouldStop;
  try {
    while (done < groups) {
      if (hooks?.shouldStop?.() === true) {
        chunk.cancelled = true;
        break;
      }
      const target = Math.min(groups, done + batch);
      const started = now();
      const reached = run(done, target);
      const elapsed = now() - started;
      const from = done;
      done = reached;
      chunk.pathsDone = Math.min(pathCount, done * 4);
      if (reached < target) {
        chunk.cancelled = true;
        break;
      }
      hooks?.onProgress?.(chunk.pathsDone);
      if (checksHooks) {
        const perGroup = Math.max(elapsed, 0.01) / (target - from);
        batch = Math.max(1, Math.min(batch * 4, Math.floor(BATCH_TARGET_MS / perGroup)));
      }
    }
  } finally {
    currentStop = undefined;
  }
  copyOut(buffer, mem.offsets, padded, chunk);
}

/** The hooks' stop test of the chunk being run, which every instance's `shouldStop` import reads. */
let currentStop: (() => boolean | void) | undefined;

/**
 * One memory per thread, kept for the next chunk and grown when a chunk needs more, with one
 * instance per module on it. A new memory per chunk cost about 60 µs in V8 (it reserves address
 * space and guard pages) and pressed the garbage collector: a sweep's 480 chunks spent more there
 * than in the kernel's setup. Chunks over REUSED_BYTES get a memory of their own, dropped after.
 */
const REUSED_BYTES = 64 * 2 ** 20;
let reused: { memory: WebAssembly.Memory; instances: Map<WebAssembly.Module, WebAssembly.Instance> } | null =
  null;

function newMemory(bytes: number): WebAssembly.Memory {
  try {
    return new WebAssembly.Memory({ initial: Math.max(1, Math.ceil(bytes / 65536)) });
  } catch (error) {
    throw new Refused(`no memory for the wasm kernel (${String(error)})`);
  }
}

function instanceFor(
  compiled: Compiled,
  bytes: number,
): { memory: WebAssembly.Memory; instance: WebAssembly.Instance } {
  if (bytes > REUSED_BYTES) {
    const memory = newMemory(bytes);
    return { memory, instance: instantiate(compiled, memory) };
  }
  reused ??= { memory: newMemory(bytes), instances: new Map() };
  const { memory, instances } = reused;
  const missing = bytes - memory.buffer.byteLength;
  if (missing > 0) {
    try {
      memory.grow(Math.ceil(missing / 65536));
    } catch (error) {
      throw new Refused(`no memory for the wasm kernel (${String(error)})`);
    }
  }
  let instance = instances.get(compiled.module);
  if (instance === undefined) {
    instance = instantiate(compiled, memory);
    remember(instances, compiled.module, instance);
  }
  return { memory, instance };
}

function instantiate(compiled: Compiled, memory: WebAssembly.Memory): WebAssembly.Instance {
  const lib: Record<string, (...args: number[]) => number> = {};
  for (const { fn, arity } of compiled.callOuts) {
    lib[`${fn}/${arity}`] = PORTABLE_MATH[fn as keyof typeof PORTABLE_MATH] as (...args: number[]) => number;
  }
  const imports = {
    env: { memory },
    engine: { shouldStop: () => (currentStop !== undefined && currentStop() === true ? 1 : 0) },
    lib,
  };
  try {
    return new WebAssembly.Instance(compiled.module, imports);
  } catch (error) {
    throw new Refused(`this JavaScript engine did not instantiate the wasm kernel (${String(error)})`);
  }
}

function copyOut(
  buffer: ArrayBuffer,
  offsets: ReturnType<typeof memoryLayout>['offsets'],
  padded: number,
  chunk: ChunkResult,
): void {
  const n = chunk.pathCount;
  const rows = (target: Float64Array, offset: number): void => {
    const count = target.length / Math.max(n, 1);
    const source = new Float64Array(buffer, offset, count * padded);
    for (let row = 0; row < count; row++)
      target.set(source.subarray(row * padded, row * padded + n), row * n);
  };
  if (n === 0) return;
  rows(chunk.saved, offsets.saved);
  rows(chunk.probeValues, offsets.probeValues);
  rows(chunk.runningMax, offsets.runningMax);
  rows(chunk.runningMin, offsets.runningMin);
  rows(chunk.firstPassage, offsets.firstPassage);
  rows(chunk.absorptionTime, offsets.absorptionTime);
  rows(chunk.blowupTime, offsets.lossTime);
  chunk.lossCause.set(new Uint8Array(buffer, offsets.lossCause, n));
}
