import { simulate } from '../shared/engine/index';
import { evaluateProbe } from '../shared/engine/probes';
import { probeRequest } from '../shared/cells/probe';
import { axisValues } from '../shared/cells/sweep';
import { inProcessExecutor } from '../shared/run/environments';
import { runSheet } from '../shared/run/run-sheet';
import { buildSimulationPlan, sheetDocumentSchema, type SheetDocument } from '../shared/sheet/index';
import { median } from './median';
import { setKernelChoice, type KernelName } from '../shared/engine/wasm/kernel-choice';

/**
 * `sweep-20`: a 20-point sweep of θ of an Ornstein–Uhlenbeck model (one kernel with θ as an
 * input, every point through runSheet) against 20 separate runs of the same simulation with θ
 * overridden (a literal kernel each, compiled per run), both on the calling thread, each point
 * read by the same probe. Every round changes σ slightly, so that each round compiles afresh as a
 * new sheet would: the sweep once, the separate runs twenty times.
 *
 * Measured once per kernel. On the JavaScript kernel the ratio shows the compile the sweep saves.
 * The wasm kernel reuses one compiled module for plans that differ only in numbers, so separate
 * runs there compile once too; the ratio then shows what the sweep's own work costs (the base
 * simulation and probe it reads, the per-path values for paired differences).
 */
export const SWEEP_POINTS = 20;
const PATHS = 2000;
const STEPS = 500;

function sweepSheet(round: number): SheetDocument {
  return sheetDocumentSchema.parse({
    schemaVersion: 1,
    title: 'Benchmark: a 20-point sweep',
    cells: [
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'theta', value: 1 },
          { name: 'sigma', value: 0.3 + round * 1e-4 },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'X', initial: '1', drift: '-theta * X', diffusion: { W: 'sigma' } }],
        noises: [{ name: 'W' }],
      },
      {
        id: 'sim',
        kind: 'simulation',
        model: 'm',
        t1: 2,
        steps: STEPS,
        paths: PATHS,
        seed: 42,
        saveCount: 11,
        samplePaths: 0,
      },
      { id: 'var', kind: 'probe', simulation: 'sim', quantity: 'variance', state: 'X' },
      {
        id: 'sw',
        kind: 'sweep',
        probe: 'var',
        axes: [{ parameter: 'theta', spacing: 'linear', from: 0.2, to: 4, count: SWEEP_POINTS, values: [] }],
      },
    ],
  });
}

async function sweepSeconds(doc: SheetDocument): Promise<number> {
  const started = performance.now();
  const run = await runSheet(doc, { executor: inProcessExecutor(), target: 'sw' });
  if (run.outputs.get('sw')?.output.kind !== 'sweep') throw new Error('the benchmark sweep failed');
  return (performance.now() - started) / 1000;
}

function separateSeconds(doc: SheetDocument): number {
  const sweep = doc.cells.find((cell) => cell.kind === 'sweep')!;
  const probe = doc.cells.find((cell) => cell.kind === 'probe')!;
  if (sweep.kind !== 'sweep' || probe.kind !== 'probe') throw new Error('unexpected benchmark sheet');
  const started = performance.now();
  for (const theta of axisValues(sweep.axes[0]!)) {
    const plan = buildSimulationPlan(doc, 'sim', { overrides: { theta } });
    evaluateProbe(simulate(plan), probeRequest(probe, plan.model.stateNames));
  }
  return (performance.now() - started) / 1000;
}

/** Median seconds of both over `rounds` (after one unrecorded round each), and their ratio. */
export async function measureSweepCase(rounds: number, kernel: KernelName): Promise<Record<string, unknown>> {
  setKernelChoice(kernel);
  try {
    return await measureBoth(rounds, kernel);
  } finally {
    setKernelChoice('auto');
  }
}

async function measureBoth(rounds: number, kernel: KernelName): Promise<Record<string, unknown>> {
  await sweepSeconds(sweepSheet(0));
  separateSeconds(sweepSheet(0));
  const sweep: number[] = [];
  const separate: number[] = [];
  for (let round = 1; round <= rounds; round++) {
    sweep.push(await sweepSeconds(sweepSheet(round)));
    separate.push(separateSeconds(sweepSheet(round)));
  }
  const sweepMedian = median(sweep);
  const separateMedian = median(separate);
  return {
    case: 'sweep-20',
    kernel,
    points: SWEEP_POINTS,
    paths: PATHS,
    steps: STEPS,
    sweepSeconds: Number(sweepMedian.toFixed(4)),
    separateSeconds: Number(separateMedian.toFixed(4)),
    ratio: Number((sweepMedian / separateMedian).toPrecision(4)),
  };
}
