import { ref, watch, type Ref } from 'vue';
import type { DatasetColumn } from '@shared/api/datasets';
import { getDataset } from '@/api/datasets';

/** The columns of a data cell's stored dataset, fetched when the cell names another one. */
export function useDatasetColumns(datasetId: () => string | null) {
  const columns: Ref<DatasetColumn[]> = ref([]);
  const loadError = ref<string | null>(null);
  watch(
    datasetId,
    async (id) => {
      loadError.value = null;
      if (id === null) {
        columns.value = [];
        return;
      }
      try {
        columns.value = (await getDataset(id)).columns;
      } catch (error) {
        loadError.value = error instanceof Error ? error.message : String(error);
      }
    },
    { immediate: true },
  );
  return { columns, loadError };
}
