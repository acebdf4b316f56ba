import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import * as sheetsApi from '@/api/sheets';
import { exampleSheets } from '@shared/examples/index';
import { inProcessExecutor } from '@shared/run/environments';
import { runSheetToJson } from '@shared/run/run-sheet';
import { scaleSheetPaths } from '@shared/run/scale';
import { useSheetEditorStore } from '@/stores/sheet-editor';

/**
 * The sheet page's run path (the store, the orchestrator, its hooks and kept outputs) against the
 * command-line runner's (the orchestrator's JSON view): the same digests for every example. The
 * page's worker pool is replaced by the engine on this thread, as in the runner's tests.
 */
vi.mock('@/api/sheets', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/api/sheets')>()),
  getSheet: vi.fn(),
}));
vi.mock('@/workers/pool', async () => {
  const { inProcessExecutor: inProcess } = await import('@shared/run/environments');
  const { stabilityReport } = await import('@shared/engine/stability');
  return {
    SimulationPool: class {
      private readonly executor = inProcess();
      simulate = this.executor.runSimulation;
      runStudy = this.executor.runStudy;
      cancel = () => {};
      stabilityBeforeRun = async (plan: Parameters<typeof stabilityReport>[0]) => stabilityReport(plan);
    },
  };
});

const api = vi.mocked(sheetsApi);

beforeEach(() => {
  setActivePinia(createPinia());
  localStorage.clear();
});

describe('the page and the runner', () => {
  it.each(exampleSheets.map((example) => [example.slug, example] as const))(
    'give the same digest for every simulation of %s',
    async (_slug, example) => {
      const doc = scaleSheetPaths(example.document, 0.02);
      api.getSheet.mockResolvedValue({
        id: 's1',
        title: doc.title,
        owner: { id: 'u1', name: 'Mira Okafor' },
        version: 1,
        role: 'owner',
        forkSource: null,
        forkCount: 0,
        forkedFrom: null,
        forkedFromVersion: null,
        engineVersion: null,
        results: null,
        document: doc,
        digests: {},
        createdAt: new Date('2026-11-01T08:00:00Z'),
        updatedAt: new Date('2026-11-01T08:00:00Z'),
      });
      const store = useSheetEditorStore();
      await store.load('s1', { userId: 'u1' });
      await store.run(null);
      expect(store.runNotice).toBeNull();

      const runner = await runSheetToJson(doc, inProcessExecutor());
      const runnerDigests = Object.fromEntries(
        runner.cells.flatMap((cell) => ('digest' in cell ? [[cell.id, cell.digest]] : [])),
      );
      const pageDigests: Record<string, string> = {};
      for (const [id, output] of Object.entries(store.outputs)) {
        if (output?.kind === 'simulation') pageDigests[id] = output.result.digest;
      }
      expect(Object.keys(runnerDigests).length).toBeGreaterThan(0);
      expect(pageDigests).toEqual(runnerDigests);
    },
  );
});
