import type { StoredTable } from './observe';

/**
 * Where a run finds a data cell's rows: the browser fetches GET /api/datasets/:id, the
 * command-line runner reads the datasets embedded in the sheet file, tests keep them in memory.
 * The provider hands back the checksum it holds; the data cell compares it with its own.
 */
export interface DatasetProvider {
  table(datasetId: string): Promise<StoredTable & { checksum: string }>;
}

/** Tables held in memory, by dataset id (tests, and the runner once it has read a sheet file). */
export function memoryDatasetProvider(
  tables: ReadonlyMap<string, StoredTable & { checksum: string }>,
): DatasetProvider {
  return {
    async table(datasetId) {
      const table = tables.get(datasetId);
      if (!table) throw new Error(`dataset ${datasetId} is not available to this run`);
      return table;
    },
  };
}
