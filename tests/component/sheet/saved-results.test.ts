import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as sheetsApi from '@/api/sheets';
import type { SimulationPlan } from '@shared/engine/plan';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheet } from '@shared/run/run-sheet';
import { summariseResults, type VersionResults } from '@shared/run/version-results';
import { sheetCellDependencies, sheetFingerprints } from '@shared/sheet';
import { useSheetEditorStore } from '@/stores/sheet-editor';
import { createResultCache, MAX_ENTRIES } from '@/stores/sheet/result-cache';
import { buttonNamed, cardOf, click, mountSheet, pondSheet, settle } from './harness';

/**
 * Results that come back without a run: after a reload from the browser's cache (IndexedDB, here
 * fake-indexeddb), and with an old version from the summary saved with it.
 */

const pool = vi.hoisted(() => ({
  stabilityBeforeRun: vi.fn(),
  simulate: vi.fn(),
  runStudy: vi.fn(),
  cancel: vi.fn(),
}));

vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
  getVersion: vi.fn(),
  saveVersion: vi.fn(),
}));
// The pool runs the real engine on this thread: the cache must hold real results.
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

function sheetDetail(results: VersionResults | null) {
  return {
    id: 's1',
    title: 'Pond algae',
    owner: { id: 'u1', name: 'Mira Okafor' },
    version: 3,
    role: 'owner' as const,
    forkSource: null,
    forkCount: 0,
    forkedFrom: null,
    forkedFromVersion: null,
    engineVersion: null,
    results,
    document: pondSheet(),
    digests: {},
    createdAt: new Date('2026-11-01T08:00:00Z'),
    updatedAt: new Date('2026-11-02T08:00:00Z'),
  };
}

/** The summary a save of the pond sheet's results would carry. */
async function pondSummary(): Promise<{ results: VersionResults; digest: string }> {
  const doc = pondSheet();
  const run = await runSheet(doc, { executor: inProcessExecutor() });
  const fingerprints = sheetFingerprints(doc, sheetCellDependencies(doc));
  const output = run.outputs.get('simulation-season')!.output;
  if (output.kind !== 'simulation') throw new Error('the pond simulation did not run');
  return {
    results: summariseResults(doc, (id) => run.outputs.get(id), fingerprints),
    digest: output.result.digest,
  };
}

async function reload(path = '/sheets/s1') {
  wrapper?.unmount();
  document.body.innerHTML = '';
  ({ wrapper } = await mountSheet(path));
  // The cache answers over several tasks.
  await settle();
  return useSheetEditorStore();
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  // A fresh, empty browser database per test.
  globalThis.indexedDB = new IDBFactory();
  const executor = inProcessExecutor();
  pool.simulate.mockImplementation((plan: SimulationPlan) => executor.runSimulation(plan));
  api.getSheet.mockResolvedValue(sheetDetail(null));
});
afterEach(() => {
  wrapper?.unmount();
  wrapper = undefined;
  document.body.innerHTML = '';
});

describe('results after a reload', () => {
  it('come back from the browser cache, as current, without a run', async () => {
    let store = await reload();
    await click(buttonNamed('Run all'));
    const output = store.outputs['simulation-season'];
    expect(output?.kind).toBe('simulation');
    const digest = output?.kind === 'simulation' ? output.result.digest : '';
    expect(pool.simulate).toHaveBeenCalledTimes(1);

    store = await reload();
    const back = store.outputs['simulation-season'];
    expect(back?.kind === 'simulation' && back.result.digest).toBe(digest);
    expect(store.outputs['probe-bloom']?.kind).toBe('probe');
    expect(store.staleCellIds.has('simulation-season')).toBe(false);
    expect(store.savedWith).toEqual({});
    expect(cardOf('simulation-season').textContent).not.toContain('as saved with version');
    expect(pool.simulate).toHaveBeenCalledTimes(1);
  });

  it('are not taken from the cache when an input changed in between', async () => {
    await reload();
    await click(buttonNamed('Run all'));
    const changed = pondSheet();
    const params = changed.cells.find((cell) => cell.kind === 'params')!;
    if (params.kind === 'params') params.params[0]!.value = 0.5;
    api.getSheet.mockResolvedValue({ ...sheetDetail(null), document: changed });
    const store = await reload();
    expect(store.outputs['simulation-season']).toBeUndefined();
  });
});

describe('results saved with a version', () => {
  it('open with the old version, labelled with its number', async () => {
    const { results, digest } = await pondSummary();
    api.getVersion.mockResolvedValue({
      number: 2,
      message: 'more paths',
      author: { id: 'u1', name: 'Mira Okafor' },
      parent: 1,
      createdAt: new Date('2026-11-02T07:00:00Z'),
      document: pondSheet(),
      digests: {},
      moments: {},
      engineVersion: null,
      results,
    });
    const store = await reload('/sheets/s1?version=2');
    const shown = store.outputs['simulation-season'];
    expect(shown?.kind === 'simulation' && shown.result.digest).toBe(digest);
    expect(store.savedWith).toMatchObject({ 'simulation-season': 2, 'probe-bloom': 2 });
    expect(cardOf('simulation-season').textContent).toContain('as saved with version 2');
    expect(cardOf('probe-bloom').textContent).toContain('as saved with version 2');
    expect(pool.simulate).not.toHaveBeenCalled();
  });

  it('are shown on the current version but never reused by a run', async () => {
    const { results } = await pondSummary();
    api.getSheet.mockResolvedValue(sheetDetail(results));
    const store = await reload();
    expect(store.savedWith['simulation-season']).toBe(3);
    // Running the probe needs every path's values: the simulation runs again rather than
    // feeding the probe a summary.
    await click(buttonNamed('Run probe cell'));
    expect(pool.simulate).toHaveBeenCalledTimes(1);
    expect(store.savedWith['simulation-season']).toBeUndefined();
    expect(store.savedWith['probe-bloom']).toBeUndefined();
  });
});

describe('the result cache', () => {
  const probeOutput = (estimate: number) => ({
    kind: 'probe' as const,
    estimate: {
      estimate,
      standardError: 0.01,
      ci: [estimate - 0.02, estimate + 0.02] as [number, number],
      paths: 100,
    },
    finishedAt: new Date(),
  });

  it('drops the oldest entries beyond its size, and never keeps a failure', async () => {
    let clock = 1_000;
    const now = vi.spyOn(Date, 'now').mockImplementation(() => clock++);
    const cache = createResultCache();
    for (let i = 0; i < MAX_ENTRIES + 5; i++) await cache.put(`fp-${i}`, probeOutput(i));
    await cache.put('fp-failed', { kind: 'error', message: 'the model failed', finishedAt: new Date() });
    now.mockRestore();

    for (let i = 0; i < 5; i++) expect(await cache.get(`fp-${i}`)).toBeUndefined();
    const newest = await cache.get(`fp-${MAX_ENTRIES + 4}`);
    expect(newest?.kind === 'probe' && newest.estimate.estimate).toBe(MAX_ENTRIES + 4);
    expect(await cache.get('fp-failed')).toBeUndefined();
  });

  it('answers "not cached" where the browser has no IndexedDB', async () => {
    const saved = globalThis.indexedDB;
    // @ts-expect-error: a browser without IndexedDB (storage turned off)
    delete globalThis.indexedDB;
    try {
      const cache = createResultCache();
      await cache.put('fp', probeOutput(1));
      expect(await cache.get('fp')).toBeUndefined();
    } finally {
      globalThis.indexedDB = saved;
    }
  });
});
