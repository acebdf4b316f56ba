import {
  datasetSummarySchema,
  datasetTableSchema,
  type DatasetSummary,
  type DatasetTable,
  type UploadDatasetFields,
} from '@shared/api/datasets';
import type { DatasetProvider } from '@shared/data/provider';
import { request } from './http';
import { parseAnswer } from './parse';

/** Observed datasets: upload a file to a sheet, read a stored table. */

export async function uploadDataset(
  sheetId: string,
  file: Blob,
  fileName: string,
  fields: UploadDatasetFields,
): Promise<DatasetSummary> {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) if (value) form.append(key, value);
  form.append('file', file, fileName);
  const answer = await request(`/api/sheets/${encodeURIComponent(sheetId)}/datasets`, {
    method: 'POST',
    formData: form,
  });
  return parseAnswer(datasetSummarySchema, answer, 'the uploaded dataset');
}

export async function getDataset(datasetId: string): Promise<DatasetTable> {
  const answer = await request(`/api/datasets/${encodeURIComponent(datasetId)}`);
  return parseAnswer(datasetTableSchema, answer, 'a dataset');
}

/** The address of the file as uploaded, for a download link. */
export const datasetFileUrl = (datasetId: string) => `/api/datasets/${encodeURIComponent(datasetId)}/csv`;

/** The browser's dataset provider for runs: each table fetched once per page. */
export function createBrowserDatasetProvider(): DatasetProvider {
  const tables = new Map<string, Promise<DatasetTable>>();
  return {
    table(datasetId) {
      let table = tables.get(datasetId);
      if (!table) {
        table = getDataset(datasetId);
        tables.set(datasetId, table);
        table.catch(() => tables.delete(datasetId));
      }
      return table;
    },
  };
}
