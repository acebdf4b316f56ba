import Papa from 'papaparse';
import { computed, ref, shallowRef } from 'vue';
import { DATASET_LIMITS } from '@shared/api/datasets';
import { decodeDatasetBytes, parseDatasetText, type TableFault } from '@shared/data/parse-table';

/** Rows shown in the preview table (paged); the whole file is still checked. */
const PREVIEW_ROWS = 500;
/** Faults listed beside the preview before anything is sent. */
const LISTED_FAULTS = 20;

/**
 * A file chosen for a data cell, read and checked in the browser with the same parser the
 * server runs (shared/data/parse-table.ts): the preview's faults are the upload's refusals.
 */
export function useDatasetPreview() {
  const file = shallowRef<File | null>(null);
  const text = ref<string | null>(null);
  const readFault = ref<TableFault | null>(null);
  const timeColumn = ref<string | undefined>(undefined);
  const groupColumn = ref<string | undefined>(undefined);

  async function choose(chosen: File): Promise<void> {
    file.value = chosen;
    text.value = null;
    readFault.value = null;
    timeColumn.value = undefined;
    groupColumn.value = undefined;
    if (chosen.size > DATASET_LIMITS.maxBytes) {
      readFault.value = {
        kind: 'too_many_rows',
        message: `the file is larger than ${DATASET_LIMITS.maxBytes / (1024 * 1024)} MB, the limit for one dataset`,
      };
      return;
    }
    const decoded = decodeDatasetBytes(new Uint8Array(await chosen.arrayBuffer()));
    if (decoded.ok) text.value = decoded.text;
    else readFault.value = decoded.fault;
  }

  const raw = computed(() =>
    text.value === null
      ? null
      : Papa.parse<string[]>(text.value, { preview: PREVIEW_ROWS + 1, skipEmptyLines: 'greedy' }),
  );
  const header = computed(() => raw.value?.data[0]?.map((name) => name.trim()) ?? []);
  const previewRows = computed(() => raw.value?.data.slice(1) ?? []);
  const checked = computed(() =>
    text.value === null
      ? null
      : parseDatasetText(text.value, {
          timeColumn: timeColumn.value,
          groupColumn: groupColumn.value,
          maxFaults: LISTED_FAULTS,
        }),
  );
  const faults = computed<TableFault[]>(() => {
    if (readFault.value) return [readFault.value];
    return checked.value && !checked.value.ok ? checked.value.faults : [];
  });
  const table = computed(() => (checked.value?.ok ? checked.value.table : null));

  return { file, choose, header, previewRows, faults, table, timeColumn, groupColumn };
}
