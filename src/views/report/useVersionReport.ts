import { onScopeDispose, ref, shallowRef } from 'vue';
import type { VersionDigests } from '@shared/api/sheets';
import type { CellOutput } from '@shared/run/outputs';
import { runSheet } from '@shared/run/run-sheet';
import type { SheetDocument } from '@shared/sheet/document';
import { createBrowserDatasetProvider } from '@/api/datasets';
import { errorMessage } from '@/api/http';
import { getVersion, type VersionDetail } from '@/api/sheets';
import { createBrowserExecutor, type BrowserExecutor } from '@/stores/sheet/browser-executor';

/**
 * A version for its printable report: the saved document, run once on this page through the one
 * orchestrator (worker pool, stored datasets), so every chart, probe and study shows its numbers
 * beside the digests saved with the version.
 */
export function useVersionReport(sheetId: string, number: number) {
  const version = shallowRef<VersionDetail | null>(null);
  const document = shallowRef<SheetDocument | null>(null);
  const outputs = shallowRef<Record<string, CellOutput | undefined>>({});
  const runDigests = ref<VersionDigests>({});
  const engineVersion = ref<number | null>(null);
  const error = ref<string | null>(null);
  const state = ref<'loading' | 'running' | 'ready' | 'failed'>('loading');
  let executor: BrowserExecutor | null = null;

  async function load(): Promise<void> {
    try {
      const detail = await getVersion(sheetId, number);
      version.value = detail;
      document.value = detail.document;
      state.value = 'running';
      executor = await createBrowserExecutor();
      const run = await runSheet(detail.document, { executor, datasets: createBrowserDatasetProvider() });
      const next: Record<string, CellOutput | undefined> = {};
      const digests: VersionDigests = {};
      for (const [cellId, kept] of run.outputs) {
        next[cellId] = kept.output;
        if (kept.output.kind === 'simulation') digests[cellId] = kept.output.result.digest;
      }
      outputs.value = next;
      runDigests.value = digests;
      engineVersion.value = run.engineVersion;
      state.value = 'ready';
    } catch (cause) {
      error.value = errorMessage(cause);
      state.value = 'failed';
    }
  }

  onScopeDispose(() => executor?.cancel());
  void load();
  return { version, document, outputs, runDigests, engineVersion, error, state };
}
