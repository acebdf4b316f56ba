import { createHash } from 'node:crypto';
import { generateIdFromEntropySize } from 'lucia';
import type { DatasetSummary, DatasetTable, UploadDatasetFields } from '@shared/api/datasets';
import { parseDatasetBytes } from '@shared/data/parse-table';
import type { SheetsRepository } from '../sheets/sheets.repository';
import { requireRight, type SheetActor } from '../sheets/sheet-rights';
import type { DatasetsRepository } from './datasets.repository';
import type { DatasetRow } from './datasets.table';
import { badFile, datasetNotFound } from './datasets.errors';

export interface UploadedFile {
  bytes: Uint8Array;
  originalName: string;
}

export function toSummary(
  row: Pick<DatasetRow, 'id' | 'name' | 'columns' | 'rowCount' | 'checksum'>,
): DatasetSummary {
  return { id: row.id, name: row.name, columns: row.columns, rowCount: row.rowCount, checksum: row.checksum };
}

/** The name shown for a dataset: the one given, else the file's name without its extension. */
function displayName(given: string | undefined, originalName: string): string {
  const fromFile = originalName.replace(/\.[^.]*$/, '').trim();
  return (given && given.length > 0 ? given : fromFile || 'observations').slice(0, 120);
}

/** Observed data: editors upload files to a sheet; whoever reads the sheet or a fork of it reads them. */
export function createDatasetsUsecases({
  datasets,
  sheets,
}: {
  datasets: DatasetsRepository;
  sheets: SheetsRepository;
}) {
  /**
   * Parses and stores one file for a sheet, or refuses it whole (nothing stored). Also used by
   * the sheet-file import, whose caller has checked its own rights on the new sheet.
   */
  async function store(
    user: SheetActor,
    sheetId: string,
    file: UploadedFile,
    fields: UploadDatasetFields,
  ): Promise<DatasetSummary> {
    const parsed = parseDatasetBytes(file.bytes, {
      timeColumn: fields.timeColumn,
      groupColumn: fields.groupColumn,
    });
    if (!parsed.ok) throw badFile(parsed.faults[0]!);
    const row = await datasets.insert({
      id: generateIdFromEntropySize(10),
      sheetId,
      uploaderId: user.id,
      name: displayName(fields.name, file.originalName),
      originalName: file.originalName.slice(0, 255),
      columns: parsed.table.columns,
      rows: parsed.table.rows,
      rowCount: parsed.table.rows.length,
      checksum: createHash('sha256').update(file.bytes).digest('hex'),
      content: new TextDecoder('utf-8').decode(file.bytes),
    });
    return toSummary(row);
  }

  async function readable(user: SheetActor, datasetId: string): Promise<DatasetRow> {
    const row = await datasets.findById(datasetId);
    if (!row || !(await datasets.readableBy(row.sheetId, user.id))) throw datasetNotFound();
    return row;
  }

  return {
    store,

    async mayUpload(user: SheetActor, sheetId: string): Promise<void> {
      requireRight(await sheets.findForUser(sheetId, user.id), user, 'uploadData');
    },

    async upload(
      user: SheetActor,
      sheetId: string,
      file: UploadedFile,
      fields: UploadDatasetFields,
    ): Promise<DatasetSummary> {
      requireRight(await sheets.findForUser(sheetId, user.id), user, 'uploadData');
      return store(user, sheetId, file, fields);
    },

    async getTable(user: SheetActor, datasetId: string): Promise<DatasetTable> {
      const row = await readable(user, datasetId);
      return {
        ...toSummary(row),
        sheetId: row.sheetId,
        originalName: row.originalName,
        rows: row.rows,
        createdAt: row.createdAt.toISOString(),
      };
    },

    async getFile(user: SheetActor, datasetId: string) {
      const row = await readable(user, datasetId);
      return { originalName: row.originalName, content: row.content };
    },
  };
}

export type DatasetsUsecases = ReturnType<typeof createDatasetsUsecases>;
