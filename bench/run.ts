import { availableParallelism } from 'node:os';
import { buildSimulationPlan } from '../shared/sheet/index';
import { mergeChunks } from '../shared/engine/index';
import { simulateChunk } from '../shared/engine/simulate';
import type { SimulationPlan } from '../shared/engine/plan';
import { createThreadPool, type ThreadPool } from '../server/cli/thread-pool';
import { setKernelChoice, type KernelName } from '../shared/engine/wasm/kernel-choice';
import { benchSheets, type BenchSheet } from './cases';
import { median } from './median';
import { prepareReferences, type Reference } from './references';
import { measureSweepCase } from './sweep-case';

/**
 * `npm run bench:engine [-- --case NAME] [--rounds N] [--threads N]`: one JSON line per case and
 * reference (medians over rounds), then a ratio line. Engine cases and the reference programs
 * run alternately in every round, so a machine that slows down mid-run slows both.
 */
const CASE_NAMES = [
  'ou-scalar',
  'ou-scalar-wasm',
  'ou-scalar-pool',
  'grazing-2d',
  'grazing-2d-wasm',
  'gbm-milstein',
  'gbm-milstein-wasm',
  'sweep-20',
] as const;
type CaseName = (typeof CASE_NAMES)[number];

interface Options {
  cases: CaseName[];
  rounds: number;
  threads: number;
}

function parseOptions(argv: string[]): Options {
  const cases: CaseName[] = [];
  let rounds = 3;
  let threads = availableParallelism();
  for (let i = 0; i < argv.length; i++) {
    const [flag, inline] = argv[i]!.includes('=') ? argv[i]!.split('=', 2) : [argv[i]!, undefined];
    const value = inline ?? argv[++i];
    if (flag === '--case') {
      if (!CASE_NAMES.includes(value as CaseName))
        throw new Error(`unknown case "${value}"; cases: ${CASE_NAMES.join(', ')}`);
      cases.push(value as CaseName);
    } else if (flag === '--rounds' || flag === '--threads') {
      const n = Number(value);
      if (!Number.isInteger(n) || n < 1)
        throw new Error(`${flag} needs a positive whole number, got "${value}"`);
      if (flag === '--rounds') rounds = n;
      else threads = n;
    } else {
      throw new Error(`unknown option "${flag}"; use --case NAME, --rounds N, --threads N`);
    }
  }
  return { cases: cases.length > 0 ? cases : [...CASE_NAMES], rounds, threads };
}

interface Measurement {
  seconds: number;
  stepsPerSec: number;
  /** In-process cases: the simulation alone (seeding, the kernel, the chunk's arrays), before the merge. */
  simulationSeconds?: number;
}

interface CaseRunner {
  name: string;
  paths: number;
  steps: number;
  measure(): Promise<Measurement>;
}

function planOf(sheet: BenchSheet): SimulationPlan {
  return buildSimulationPlan(sheet.doc, sheet.simulationId);
}

async function timed(plan: SimulationPlan, work: () => Promise<unknown> | unknown): Promise<Measurement> {
  const started = performance.now();
  await work();
  const seconds = (performance.now() - started) / 1000;
  return { seconds, stepsPerSec: (plan.paths * plan.steps) / seconds };
}

/**
 * One thread, on the kernel named (the JavaScript one, or wasm: a fallback would be an error here):
 * `simulate`, timed as a whole and in its two parts, the chunk's simulation and the merge into
 * statistics and digest. The reference programs time their seeding and loop only, which is the
 * first part; the whole run is what a sheet waits for.
 */
function inProcessCase(name: string, plan: SimulationPlan, kernel: KernelName): CaseRunner {
  const measure = async (): Promise<Measurement> => {
    setKernelChoice(kernel);
    try {
      const started = performance.now();
      const chunk = simulateChunk(plan, 0, plan.paths);
      const simulated = performance.now();
      const result = mergeChunks(plan, [chunk]);
      const seconds = (performance.now() - started) / 1000;
      if (result.kernel !== kernel)
        throw new Error(`${name} ran on the ${result.kernel} kernel: ${result.kernelNote}`);
      return {
        seconds,
        stepsPerSec: (plan.paths * plan.steps) / seconds,
        simulationSeconds: (simulated - started) / 1000,
      };
    } finally {
      setKernelChoice('auto');
    }
  };
  return { name, paths: plan.paths, steps: plan.steps, measure };
}

async function poolCase(name: string, plan: SimulationPlan, threads: ThreadPool): Promise<CaseRunner> {
  // Start the threads (each loads tsx and the engine) before anything is timed.
  await threads.pool.run({ ...plan, paths: Math.min(plan.paths, 64 * threads.pool.size) });
  return {
    name,
    paths: plan.paths,
    steps: plan.steps,
    measure: () => timed(plan, async () => mergeChunks(plan, await threads.pool.run(plan))),
  };
}

function print(line: Record<string, unknown>): void {
  console.log(JSON.stringify(line));
}

function ratio(a: number | undefined, b: number | undefined): number | null {
  return a !== undefined && b !== undefined ? Number((a / b).toPrecision(4)) : null;
}

async function main(): Promise<void> {
  const options = parseOptions(process.argv.slice(2));
  const wantsOu = options.cases.includes('ou-scalar') || options.cases.includes('ou-scalar-wasm');
  const threadPool = options.cases.includes('ou-scalar-pool')
    ? createThreadPool(options.threads, { kernel: 'wasm' })
    : null;
  const setup = wantsOu ? await prepareReferences() : null;
  for (const skip of setup?.skipped ?? []) console.error(`skipping reference ${skip.name}: ${skip.reason}`);
  try {
    const runners: CaseRunner[] = [];
    for (const name of options.cases) {
      const kernel: KernelName = name.endsWith('-wasm') ? 'wasm' : 'js';
      if (name.startsWith('ou-scalar') && name !== 'ou-scalar-pool')
        runners.push(inProcessCase(name, planOf(benchSheets.ou()), kernel));
      if (name === 'ou-scalar-pool')
        runners.push(await poolCase(name, planOf(benchSheets.ou()), threadPool!));
      if (name.startsWith('grazing-2d'))
        runners.push(inProcessCase(name, planOf(benchSheets.grazing()), kernel));
      if (name.startsWith('gbm-milstein'))
        runners.push(inProcessCase(name, planOf(benchSheets.gbm()), kernel));
    }
    const references: Reference[] = setup?.references ?? [];
    const samples = new Map<string, Measurement[]>();
    const record = (name: string, m: Measurement) => samples.set(name, [...(samples.get(name) ?? []), m]);
    // One unrecorded round first: the engine's kernel is compiled and JIT-warmed once per run in
    // real use too (a sheet's run is many chunks through one compiled kernel).
    for (const runner of runners) await runner.measure();
    for (let round = 0; round < options.rounds; round++) {
      for (const runner of runners) record(runner.name, await runner.measure());
      for (const reference of references) record(reference.name, await reference.measure());
    }

    const medians = new Map<string, Measurement>();
    for (const [name, list] of samples) {
      const simulation = list.flatMap((m) =>
        m.simulationSeconds === undefined ? [] : [m.simulationSeconds],
      );
      medians.set(name, {
        seconds: median(list.map((m) => m.seconds)),
        stepsPerSec: median(list.map((m) => m.stepsPerSec)),
        ...(simulation.length > 0 ? { simulationSeconds: median(simulation) } : {}),
      });
    }
    const line = (name: string, paths: number, steps: number, extra: Record<string, unknown> = {}) => {
      const m = medians.get(name)!;
      print({
        case: name,
        paths,
        steps,
        seconds: Number(m.seconds.toFixed(4)),
        stepsPerSec: Number(m.stepsPerSec.toPrecision(4)),
        ...(m.simulationSeconds === undefined
          ? {}
          : { simulationSeconds: Number(m.simulationSeconds.toFixed(4)) }),
        ...extra,
      });
    };
    for (const runner of runners)
      line(
        runner.name,
        runner.paths,
        runner.steps,
        runner.name === 'ou-scalar-pool' ? { threads: options.threads } : {},
      );
    for (const reference of references) line(reference.name, benchOuSize().paths, benchOuSize().steps);
    const speed = (name: string) => medians.get(name)?.stepsPerSec;
    const engine = speed('ou-scalar');
    const wasm = speed('ou-scalar-wasm');
    print({
      case: 'ratio',
      ouScalarVsC: ratio(engine, speed('ref-c')),
      ouScalarVsNumpy: ratio(engine, speed('ref-numpy')),
      ouScalarVsZiggurat: ratio(engine, speed('ref-c-ziggurat')),
      ouScalarWasmVsC: ratio(wasm, speed('ref-c')),
      ouScalarWasmVsZiggurat: ratio(wasm, speed('ref-c-ziggurat')),
      // Like for like with the reference's timed region: seeding and the loop, without the merge.
      ouScalarWasmSimulationVsZiggurat: ratio(
        medians.get('ref-c-ziggurat')?.seconds,
        medians.get('ou-scalar-wasm')?.simulationSeconds,
      ),
      ouScalarWasmVsJs: ratio(wasm, engine),
      grazingWasmVsJs: ratio(speed('grazing-2d-wasm'), speed('grazing-2d')),
      gbmWasmVsJs: ratio(speed('gbm-milstein-wasm'), speed('gbm-milstein')),
      // The pool runs the wasm kernel: its throughput over one thread of the same kernel.
      poolScaling: ratio(speed('ou-scalar-pool'), wasm),
    });
    // Its own line: a sweep against separate runs of the same simulation (bench/sweep-case.ts).
    if (options.cases.includes('sweep-20'))
      for (const kernel of ['js', 'wasm'] as const) print(await measureSweepCase(options.rounds, kernel));
  } finally {
    setup?.cleanup();
    await threadPool?.close();
  }
}

function benchOuSize(): { paths: number; steps: number } {
  const plan = planOf(benchSheets.ou());
  return { paths: plan.paths, steps: plan.steps };
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : String(error));
  process.exitCode = 1;
});
