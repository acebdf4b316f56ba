import type { ModelSpec, SimulationPlan, WatchSpec } from '../plan';

/**
 * Which kernel runs a chunk. 'auto' (the default) takes the wasm kernel where WebAssembly SIMD is
 * available and the plan is one it supports, else the JavaScript kernel; 'wasm' asks for wasm but
 * still falls back (and says why) when it cannot run; 'js' always runs the JavaScript kernel,
 * the reference the wasm kernel is tested against. A worker or thread sets it once.
 */
export type KernelChoice = 'js' | 'wasm' | 'auto';
export type KernelName = 'js' | 'wasm';
export const KERNEL_CHOICES: readonly KernelChoice[] = ['js', 'wasm', 'auto'];

let choice: KernelChoice = 'auto';

export function setKernelChoice(next: KernelChoice): void {
  if (!KERNEL_CHOICES.includes(next))
    throw new RangeError(`unknown kernel "${String(next)}"; use js, wasm or auto`);
  choice = next;
}

export function kernelChoice(): KernelChoice {
  return choice;
}

/**
 * The plan fields the wasm kernel knows. A plan with any other field (a feature added to the
 * plan after this list was written) runs on the JavaScript kernel, so a feature the wasm kernel
 * does not implement can never give a wrong number there.
 */
const KNOWN_PLAN_FIELDS: ReadonlySet<string> = new Set<keyof SimulationPlan>([
  'model',
  'method',
  't0',
  't1',
  'steps',
  'paths',
  'seed',
  'saveCount',
  'samplePaths',
  'boundaries',
  'blowupBound',
  'recordExtremes',
  'probeTimes',
  'watches',
]);
const KNOWN_MODEL_FIELDS: ReadonlySet<string> = new Set<keyof ModelSpec>([
  'stateNames',
  'noiseNames',
  'stateUnits',
  'initial',
  'params',
  'calculus',
  'drift',
  'diffusion',
  'correlation',
  'exact',
]);
const KNOWN_WATCH_FIELDS: ReadonlySet<string> = new Set<keyof WatchSpec>([
  'state',
  'level',
  'direction',
  'correction',
]);
const KNOWN_BOUNDARY_FIELDS: ReadonlySet<string> = new Set(['rule', 'level', 'side']);

function unknown(object: object, known: ReadonlySet<string>, where: string): string[] {
  return Object.keys(object)
    .filter((key) => !known.has(key) && (object as Record<string, unknown>)[key] !== undefined)
    .map((key) => `${where}${key}`);
}

/** Plan fields the wasm kernel does not know (empty when it knows them all). */
export function unknownPlanFields(plan: SimulationPlan): string[] {
  return [
    ...unknown(plan, KNOWN_PLAN_FIELDS, ''),
    ...unknown(plan.model, KNOWN_MODEL_FIELDS, 'model.'),
    ...plan.watches.flatMap((watch) => unknown(watch, KNOWN_WATCH_FIELDS, 'watches[].')),
    ...plan.boundaries.flatMap((rule) => unknown(rule, KNOWN_BOUNDARY_FIELDS, 'boundaries[].')),
  ];
}

let simd: boolean | null = null;

/** Whether this JavaScript engine compiles WebAssembly with SIMD (a tiny module using v128). */
export function wasmSimdAvailable(): boolean {
  if (simd === null) {
    // (module (func (result v128) i32.const 0 i32x4.splat))
    const probe = new Uint8Array([
      0, 97, 115, 109, 1, 0, 0, 0, 1, 5, 1, 96, 0, 1, 123, 3, 2, 1, 0, 10, 8, 1, 6, 0, 65, 0, 253, 17, 11,
    ]);
    try {
      simd = typeof WebAssembly === 'object' && WebAssembly.validate(probe);
    } catch {
      simd = false;
    }
  }
  return simd;
}
