import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import type { SimulationPlan } from '@shared/engine/plan';
import type { SimulationResult } from '@shared/engine/result';
import type { ParamsCell } from '@shared/sheet';
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
// The worker pool is replaced: these tests are about the page, not the numbers.
vi.mock('@/workers/pool', () => ({
  SimulationPool: class {
    simulate = pool.simulate;
    runStudy = pool.runStudy;
    cancel = pool.cancel;
    stabilityBeforeRun = pool.stabilityBeforeRun;
  },
}));

const api = vi.mocked(sheetsApi);

/** A later task (a run starts over a few, see the store's run()). */
const nextTask = () => new Promise((resolve) => setTimeout(resolve, 0));
const cancelButton = () =>
  [...document.querySelectorAll('button')].find((button) => button.textContent?.trim() === 'Cancel run');
let wrapper: VueWrapper | undefined;

/** A stand-in result: only the fields the page itself reads (the digest) matter here. */
function fakeResult(digest: string): SimulationResult {
  return { digest, paths: 400 } as unknown as SimulationResult;
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  api.getSheet.mockResolvedValue({
    id: 's1',
    title: 'Pond algae',
    owner: { id: 'u1', name: 'Mira Okafor' },
    version: 3,
    role: 'owner',
    forkSource: null,
    forkCount: 0,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results: null,
    document: pondSheet(),
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  });
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  document.body.innerHTML = '';
});

describe('running cells', () => {
  it('runs a simulation cell in the pool with the plan built from the sheet', async () => {
    pool.simulate.mockResolvedValue(fakeResult('aa11bb22cc33dd44'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run simulation cell'));
    expect(pool.simulate).toHaveBeenCalledTimes(1);
    const plan = pool.simulate.mock.calls[0]![0] as SimulationPlan;
    expect(plan.paths).toBe(400);
    expect(plan.steps).toBe(300);
    expect(plan.model.stateNames).toEqual(['A']);
    // The probe's level is watched only for hit-before/first-passage; an exceedance at t1 needs none.
    expect(plan.watches).toEqual([]);
    const output = useSheetEditorStore().outputs['simulation-season'];
    expect(output?.kind).toBe('simulation');
  });

  it('puts a failed run on the cell that caused it, in words', async () => {
    pool.simulate.mockRejectedValue(new Error('12 of 400 paths blew up before t = 3.1'));
    // Without a simulation editor the card itself shows the error (the real editor shows it in place).
    const { simulation: _simulationEditor, ...editors } = stubEditors();
    ({ wrapper } = await mountSheet('/sheets/s1', editors));
    await click(buttonNamed('Run simulation cell'));
    expect(cardOf('simulation-season').querySelector('[role="alert"]')?.textContent).toContain(
      '12 of 400 paths blew up before t = 3.1',
    );
    expect(useSheetEditorStore().outputs['simulation-season']).toMatchObject({
      kind: 'error',
      message: '12 of 400 paths blew up before t = 3.1',
    });
  });

  it('marks the simulation and its probe stale after a parameter changes, and not before', async () => {
    ({ wrapper } = await mountSheet());
    const store = useSheetEditorStore();
    // Fake outputs computed from the sheet as it is now.
    const estimate = {
      estimate: 0.25,
      standardError: 0.02,
      ci: [0.21, 0.29] as [number, number],
      paths: 400,
    };
    store.outputs = {
      'simulation-season': {
        kind: 'simulation',
        plan: {} as SimulationPlan,
        result: fakeResult('ff'),
        engineVersion: 1,
        finishedAt: new Date(),
        seconds: 1,
      },
      'probe-bloom': { kind: 'probe', estimate, finishedAt: new Date() },
    };
    store.outputFingerprints = {
      'simulation-season': store.fingerprints['simulation-season']!,
      'probe-bloom': store.fingerprints['probe-bloom']!,
    };
    await settle();
    expect(document.body.textContent).not.toContain('stale: inputs changed');

    const params = store.document!.cells[1] as ParamsCell;
    store.updateCell({ ...params, params: [{ ...params.params[0]!, value: 0.5 }, params.params[1]!] });
    await settle();
    expect(cardOf('simulation-season').textContent).toContain('stale: inputs changed');
    expect(cardOf('probe-bloom').textContent).toContain('stale: inputs changed');
    expect(cardOf('params-main').textContent).not.toContain('stale');
    expect(cardOf('model-algae').textContent).not.toContain('stale');

    // Putting the value back makes the output current again.
    store.updateCell(params);
    await settle();
    expect(cardOf('simulation-season').textContent).not.toContain('stale: inputs changed');
    expect(cardOf('probe-bloom').textContent).not.toContain('stale: inputs changed');
  });

  it('marks only the probe stale when only the probe changes', async () => {
    ({ wrapper } = await mountSheet());
    const store = useSheetEditorStore();
    const estimate = {
      estimate: 0.25,
      standardError: 0.02,
      ci: [0.21, 0.29] as [number, number],
      paths: 400,
    };
    store.outputs = {
      'simulation-season': {
        kind: 'simulation',
        plan: {} as SimulationPlan,
        result: fakeResult('ff'),
        engineVersion: 1,
        finishedAt: new Date(),
        seconds: 1,
      },
      'probe-bloom': { kind: 'probe', estimate, finishedAt: new Date() },
    };
    store.outputFingerprints = { ...store.fingerprints };
    const probe = store.document!.cells[4]!;
    if (probe.kind !== 'probe') throw new Error('fixture changed');
    store.updateCell({ ...probe, level: 55 });
    await settle();
    expect(cardOf('probe-bloom').textContent).toContain('stale: inputs changed');
    expect(cardOf('simulation-season').textContent).not.toContain('stale: inputs changed');
  });

  it('"Run all" runs simulations before the probes that read them and shows progress while running', async () => {
    let finish: (result: SimulationResult) => void = () => undefined;
    pool.evaluateProbe.mockReturnValue({ estimate: 0.25, standardError: 0.02, ci: [0.21, 0.29], paths: 400 });
    pool.simulate.mockImplementation((_plan: SimulationPlan, onProgress: (p: object) => void) => {
      onProgress({ pathsDone: 100, paths: 400, elapsedMs: 500, etaMs: 1500 });
      return new Promise<SimulationResult>((resolve) => (finish = resolve));
    });
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run all'));
    const bar = document.querySelector('[role="progressbar"]');
    expect(bar?.getAttribute('aria-valuenow')).toBe('25');
    expect(document.body.textContent).toContain('100 of 400 paths');
    expect(document.body.textContent).toContain('about 1.5 s left');
    expect(buttonNamed('Cancel run')).toBeTruthy();
    finish(fakeResult('0011223344556677'));
    await settle();
    expect(document.querySelector('[role="progressbar"]')).toBeNull();
    // Then the probe was read from that result: state A is index 0 of the plan, level as in the cell.
    expect(pool.evaluateProbe).toHaveBeenCalledTimes(1);
    const [result, request] = pool.evaluateProbe.mock.calls[0]!;
    expect((result as SimulationResult).digest).toBe('0011223344556677');
    expect(request).toEqual({ quantity: 'exceedance', state: 0, level: 50 });
    const store = useSheetEditorStore();
    expect(store.outputs['probe-bloom']).toMatchObject({ kind: 'probe', estimate: { estimate: 0.25 } });
    expect(store.outputs['simulation-season']?.kind).toBe('simulation');
  });

  it('starts a run in short tasks: the click, then the page shows the run, then the pool starts', async () => {
    pool.simulate.mockResolvedValue(fakeResult('8899aabbccddeeff'));
    ({ wrapper } = await mountSheet());
    await click(buttonNamed('Run all'));
    expect(pool.simulate).toHaveBeenCalledTimes(1);
    // A rerun (the pool exists now). The click's own task changes nothing on the page.
    buttonNamed('Run all').click();
    for (let i = 0; i < 10; i += 1) await Promise.resolve();
    await nextTick();
    expect(cancelButton()).toBeUndefined();
    // The next task shows the run as started, and still posts nothing.
    await nextTask();
    await nextTick();
    expect(cancelButton()).toBeDefined();
    expect(pool.simulate).toHaveBeenCalledTimes(1);
    // The one after builds the plan and starts the pool.
    await settle();
    expect(pool.simulate).toHaveBeenCalledTimes(2);
    expect(useSheetEditorStore().outputs['simulation-season']?.kind).toBe('simulation');
  });

  it('a cancel before the pool starts runs nothing and says the run was cancelled', async () => {
    ({ wrapper } = await mountSheet());
    buttonNamed('Run all').click();
    await nextTask();
    await nextTick();
    cancelButton()!.click();
    await settle();
    expect(pool.simulate).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('Run cancelled');
  });

  it('"Cancel run" stops the pool, says so, and keeps the earlier outputs', async () => {
    let reject: (error: Error) => void = () => undefined;
    pool.simulate.mockImplementation(() => new Promise((_resolve, fail) => (reject = fail)));
    pool.cancel.mockImplementation(() => reject(new Error('the run was cancelled')));
    ({ wrapper } = await mountSheet());
    const store = useSheetEditorStore();
    const earlier = { kind: 'error' as const, message: 'an earlier output', finishedAt: new Date() };
    store.outputs = { 'simulation-season': earlier };
    await click(buttonNamed('Run all'));
    await click(buttonNamed('Cancel run'));
    expect(pool.cancel).toHaveBeenCalledTimes(1);
    expect(store.running).toBe(false);
    expect(store.outputs['simulation-season']).toBe(earlier);
    expect(document.body.textContent).toContain('Run cancelled');
    expect(pool.evaluateProbe).not.toHaveBeenCalled();
  });
});
