import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import type { SimulationResult } from '@shared/engine/result';
import type { ModelCell, ParamsCell, SimulationCell } from '@shared/sheet';
import type { SimulationPlan } from '@shared/engine/plan';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { buttonNamed, cardOf, click, mountSheet, pondSheet, settle, stubEditors } from './harness';

const pool = vi.hoisted(() => ({
  stabilityBeforeRun: vi.fn(),
  simulate: vi.fn(),
  runStudy: vi.fn(),
  cancel: vi.fn(),
  evaluateProbe: vi.fn(),
}));

// Probes are read on the main thread by the engine; here only the wiring is under test.
vi.mock('@shared/engine/probes', () => ({ evaluateProbe: pool.evaluateProbe }));
vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
  saveVersion: vi.fn(),
}));
vi.mock('@/workers/pool', () => ({
  SimulationPool: class {
    simulate = pool.simulate;
    runStudy = pool.runStudy;
    cancel = pool.cancel;
    stabilityBeforeRun = pool.stabilityBeforeRun;
  },
}));

const api = vi.mocked(sheetsApi);
let wrapper: VueWrapper | undefined;

function fakeResult(digest: string): SimulationResult {
  return { digest, paths: 400 } as unknown as SimulationResult;
}

function sheetWith(change: (cells: ReturnType<typeof pondSheet>['cells']) => void) {
  const doc = pondSheet();
  change(doc.cells);
  return doc;
}

function serve(document = pondSheet()) {
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: document.title,
    owner: { id: 'u1', name: 'Mira Okafor' },
    version: 3,
    role: 'owner',
    forkSource: null,
    forkCount: 0,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results: null,
    document,
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  });
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  pool.evaluateProbe.mockReturnValue({ estimate: 0.2, standardError: 0.02, ci: [0.16, 0.24], paths: 400 });
  serve();
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  document.body.innerHTML = '';
});

/** The text of the element a control's aria-describedby points at. */
function description(control: HTMLElement): string {
  const ids = control.getAttribute('aria-describedby')?.split(/\s+/) ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent ?? '').join(' ');
}

describe('an invalid sheet does not run', () => {
  it('disables Run all and Run cell and says why, naming the cell and field by their labels', async () => {
    serve(
      sheetWith((cells) => {
        const model = cells[2] as ModelCell;
        model.states[0]!.drift = 'growth * A * (1 - A / capcity)';
      }),
    );
    ({ wrapper } = await mountSheet());
    const runAll = buttonNamed('Run all');
    const runCell = buttonNamed('Run simulation cell');
    expect(runAll.disabled).toBe(true);
    expect(runCell.disabled).toBe(true);
    for (const control of [runAll, runCell]) {
      expect(description(control)).toMatch(/Model 'Algae', drift of A: .*capcity/);
      expect(description(control)).not.toContain('model-algae');
    }
    // The reason is on the page, not only for assistive technology.
    expect(document.body.textContent).toMatch(/Model 'Algae', drift of A:/);
    runAll.click();
    await settle();
    expect(pool.simulate).not.toHaveBeenCalled();
  });
});

describe('a failed run does not wipe results', () => {
  it('keeps the previous result, marked stale, beside the failure', async () => {
    pool.simulate.mockResolvedValueOnce(fakeResult('aa11bb22cc33dd44'));
    const { simulation: _simulationEditor, ...editors } = stubEditors();
    ({ wrapper } = await mountSheet('/sheets/s1', editors));
    const store = useSheetEditorStore();
    await click(buttonNamed('Run simulation cell'));
    expect(store.outputs['simulation-season']?.kind).toBe('simulation');

    pool.simulate.mockRejectedValueOnce(new Error('the worker stopped answering'));
    const simulation = store.document!.cells[3] as SimulationCell;
    store.updateCell({ ...simulation, seed: 98 });
    await settle();
    await click(buttonNamed('Run simulation cell'));
    const output = store.outputs['simulation-season'];
    expect(output?.kind).toBe('simulation');
    expect(output?.kind === 'simulation' && output.result.digest).toBe('aa11bb22cc33dd44');
    const card = cardOf('simulation-season');
    expect(card.textContent).toContain('stale');
    expect(card.querySelector('[role="alert"]')?.textContent).toContain('the worker stopped answering');
  });

  it('marks the kept result stale even when the inputs did not change', async () => {
    pool.simulate.mockResolvedValueOnce(fakeResult('aa11bb22cc33dd44'));
    ({ wrapper } = await mountSheet());
    const store = useSheetEditorStore();
    await click(buttonNamed('Run simulation cell'));
    pool.simulate.mockRejectedValueOnce(new Error('out of memory'));
    await click(buttonNamed('Run simulation cell'));
    expect(store.outputs['simulation-season']?.kind).toBe('simulation');
    expect(store.staleCellIds.has('simulation-season')).toBe(true);
  });
});

describe('a run far beyond minutes asks first', () => {
  it('shows the estimate and runs only after a confirmation', async () => {
    serve(
      sheetWith((cells) => {
        const simulation = cells[3] as SimulationCell;
        simulation.paths = 5_000_000;
        simulation.steps = 5_000_000;
      }),
    );
    pool.simulate.mockResolvedValue(fakeResult('aa11bb22cc33dd44'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run all'));
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(document.body.textContent).toMatch(/Simulation '.*': this run is 2\.50e\+13 path-steps, roughly/);
    await click(buttonNamed('Run anyway'));
    expect(pool.simulate).toHaveBeenCalledTimes(1);
  });

  it('counts every point of a sweep: a simulation of minutes swept over 200 values asks first', async () => {
    serve(
      sheetWith((cells) => {
        const simulation = cells[3] as SimulationCell;
        simulation.paths = 100_000;
        simulation.steps = 10_000;
        cells.push({
          id: 'sweep-growth',
          kind: 'sweep',
          probe: 'probe-bloom',
          axes: [{ parameter: 'growth', spacing: 'linear', from: 0.1, to: 1, count: 200, values: [] }],
          independent: false,
        });
      }),
    );
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run sweep cell'));
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(document.body.textContent).toMatch(
      /Sweep '.*': every point together: this run is 2\.00e\+11 path-steps/,
    );
    await click(buttonNamed('Do not run'));
  });

  it('does not run when the person declines', async () => {
    serve(
      sheetWith((cells) => {
        const simulation = cells[3] as SimulationCell;
        simulation.paths = 5_000_000;
        simulation.steps = 5_000_000;
      }),
    );
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run simulation cell'));
    await click(buttonNamed('Do not run'));
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(useSheetEditorStore().heavyRun).toBeNull();
  });
});

describe('a step that is unstable for its model asks first', () => {
  /**
   * A stiff linear decay dA = -λ A dt + 0.1 dW with λ = 100 over 30 days in 300 steps: h = 0.1,
   * hλ = -10, so one Euler–Maruyama step multiplies the mean by 1 + hλ = -9 (the step is stable
   * only for |1 + hλ| ≤ 1, i.e. h ≤ 2/λ = 0.02; Higham 2000, §2, linear test equation).
   */
  const stiffSheet = () =>
    sheetWith((cells) => {
      const params = cells[1] as ParamsCell;
      params.params[0]!.value = 100;
      const model = cells[2] as ModelCell;
      model.states[0]!.drift = '-growth * A';
      model.states[0]!.diffusion = { weather: '0.1' };
    });

  beforeEach(async () => {
    const { stabilityReport } = await import('@shared/engine/stability');
    pool.stabilityBeforeRun.mockImplementation(async (plan: SimulationPlan) => stabilityReport(plan));
    pool.simulate.mockResolvedValue(fakeResult('aa11bb22cc33dd44'));
  });

  it('names the simulation and the largest stable step, and runs only after a confirmation', async () => {
    serve(stiffSheet());
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run all'));
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('The step is too large for this model');
    expect(document.body.textContent).toMatch(/Simulation '[^']+'/);
    // The largest stable step is 2/λ = 0.02 (Higham 2000, §2).
    expect(document.body.textContent).toMatch(/A step below 0\.02\d* is stable here/);
    await click(buttonNamed('Run with this step anyway'));
    expect(pool.simulate).toHaveBeenCalledTimes(1);
  });

  it('does not run when the person declines, and does not ask for a stable step', async () => {
    serve(stiffSheet());
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run simulation cell'));
    await click(buttonNamed('Do not run'));
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(useSheetEditorStore().unstableRun).toBeNull();

    wrapper.unmount();
    document.body.innerHTML = '';
    serve();
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run all'));
    expect(document.body.textContent).not.toContain('The step is too large for this model');
    expect(pool.simulate).toHaveBeenCalledTimes(1);
  });
});
