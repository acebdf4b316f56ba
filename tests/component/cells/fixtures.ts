import type { SimulationPlan, SimulationResult, SavedStats } from '@shared/engine';
import type { Cell, SheetDocument } from '@shared/sheet/document';
import type { CellEditorProps, CellOutput } from '@/components/cells/contract';

/** An invented sheet: a mean-reverting reservoir level with one noise source. */
export function reservoirSheet(): SheetDocument {
  return {
    schemaVersion: 1,
    title: 'Reservoir level',
    cells: [
      { id: 'intro', kind: 'note', text: '# Reservoir\n\nA *mean-reverting* level.' },
      {
        id: 'pars',
        kind: 'params',
        params: [
          {
            name: 'kappa',
            value: 0.8,
            unit: '1/day',
            min: 0,
            max: 5,
            description: 'Pull towards the target level',
          },
          { name: 'target', value: 3.2, unit: 'm' },
          { name: 'sigma', value: 0.45, unit: 'm/sqrt(day)' },
          { name: 'L0', value: 2.1, unit: 'm' },
        ],
      },
      {
        id: 'level-model',
        kind: 'model',
        name: 'Reservoir level',
        states: [
          { name: 'L', initial: 'L0', unit: 'm', drift: 'kappa * (target - L)', diffusion: { R: 'sigma' } },
        ],
        noises: [{ name: 'R', description: 'Rain and release' }],
        calculus: 'ito',
      },
      {
        id: 'level-run',
        kind: 'simulation',
        name: 'Thirty days',
        model: 'level-model',
        method: 'euler-maruyama',
        t0: 0,
        t1: 30,
        steps: 3000,
        paths: 20000,
        seed: 8812,
        saveCount: 61,
        samplePaths: 30,
        boundaries: {},
        overrides: {},
      },
      { id: 'level-chart', kind: 'chart', simulation: 'level-run', view: 'paths', state: 'L', pathCount: 20 },
      {
        id: 'level-probe',
        kind: 'probe',
        simulation: 'level-run',
        quantity: 'exceedance',
        state: 'L',
        level: 4,
      },
      {
        id: 'level-study',
        kind: 'study',
        simulation: 'level-run',
        levels: 5,
        coarsestSteps: 8,
        paths: 2000,
        reference: 'auto',
      },
    ],
  };
}

export function cellOf<K extends Cell['kind']>(
  document: SheetDocument,
  id: string,
  kind: K,
): Extract<Cell, { kind: K }> {
  const cell = document.cells.find((c) => c.id === id);
  if (!cell || cell.kind !== kind) throw new Error(`fixture has no ${kind} cell ${id}`);
  return cell as Extract<Cell, { kind: K }>;
}

export function editorProps<C extends Cell>(
  document: SheetDocument,
  cell: C,
  outputs: Record<string, CellOutput | undefined> = {},
): CellEditorProps<C> {
  return { cell, document, issues: [], outputs, stale: false, readonly: false };
}

function stats(saveCount: number, value: (k: number) => number): SavedStats {
  const column = (shift: number) => Float64Array.from({ length: saveCount }, (_, k) => value(k) + shift);
  return {
    mean: column(0),
    variance: Float64Array.from({ length: saveCount }, () => 0.1),
    q05: column(-0.5),
    q25: column(-0.2),
    q50: column(0),
    q75: column(0.2),
    q95: column(0.5),
    min: column(-1),
    max: column(1),
    live: Int32Array.from({ length: saveCount }, () => 100),
  };
}

/**
 * A small hand-made run of one state: saved values are chosen so tests can predict what a chart
 * shows (it is not an engine output and does not claim to be one).
 */
export function fakeRun(options: { paths?: number; samplePaths?: number; saveCount?: number } = {}): {
  plan: SimulationPlan;
  result: SimulationResult;
} {
  const paths = options.paths ?? 100;
  const saveCount = options.saveCount ?? 11;
  const sampleCount = options.samplePaths ?? 30;
  const savedTimes = Float64Array.from({ length: saveCount }, (_, k) => (30 * k) / (saveCount - 1));
  const savedValues = new Float64Array(saveCount * paths);
  for (let k = 0; k < saveCount; k += 1)
    for (let p = 0; p < paths; p += 1) savedValues[k * paths + p] = 2 + (p % 10) * 0.1 + k * 0.01;
  const samplePaths = Array.from({ length: sampleCount }, (_, p) =>
    Float64Array.from({ length: saveCount }, (_, k) => savedValues[k * paths + p]!),
  );
  const plan: SimulationPlan = {
    model: {
      stateNames: ['L'],
      noiseNames: ['R'],
      stateUnits: ['m'],
      initial: [2.1],
      params: { kappa: 0.8, target: 3.2, sigma: 0.45, L0: 2.1 },
      calculus: 'ito',
      drift: ['0.8 * (3.2 - s0)'],
      diffusion: [['0.45']],
      correlation: null,
      exact: [null],
    },
    method: 'euler-maruyama',
    t0: 0,
    t1: 30,
    steps: 3000,
    paths,
    seed: 8812,
    saveCount,
    samplePaths: sampleCount,
    boundaries: [{ rule: 'none' }],
    blowupBound: null,
    probeTimes: [],
    watches: [],
  };
  const result: SimulationResult = {
    stateNames: ['L'],
    method: 'euler-maruyama',
    paths,
    cancelled: false,
    steps: 3000,
    h: 0.01,
    t0: 0,
    t1: 30,
    seed: 8812,
    savedTimes,
    savedSteps: Int32Array.from({ length: saveCount }, (_, k) => k * 300),
    stats: [stats(saveCount, (k) => 2.5 + k * 0.01)],
    savedValues: [savedValues],
    covariance: null,
    samplePaths: [samplePaths],
    finalValues: [savedValues.slice((saveCount - 1) * paths)],
    probes: [],
    runningMax: [new Float64Array(paths)],
    runningMin: [new Float64Array(paths)],
    watches: [],
    watchLevels: new Float64Array(0),
    firstPassage: [],
    absorptionTime: [new Float64Array(paths).fill(Number.NaN)],
    blowupTime: new Float64Array(paths).fill(Number.NaN),
    lossCause: new Uint8Array(paths),
    losses: {
      count: 0,
      paths,
      share: 0,
      byCause: { domain: 0, infinite: 0, bound: 0 },
      firstTime: null,
      conditional: false,
      allLost: false,
      message: null,
      advice: [],
    },
    blowups: { count: 0, firstTime: null, suggestion: null },
    extinctions: [],
    stability: null,
    digest: '0123456789abcdef',
    kernel: 'js',
  };
  return { plan, result };
}
