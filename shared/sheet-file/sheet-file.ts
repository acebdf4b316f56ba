import { z } from 'zod';
import { checksumSchema, datasetIdSchema, DATASET_LIMITS } from '../api/datasets';
import { versionDigestsSchema, versionMomentsSchema } from '../api/sheets';
import { sha256Hex } from '../data/checksum';
import { parseDatasetText, type ParsedTable } from '../data/parse-table';
import { memoryDatasetProvider, type DatasetProvider } from '../data/provider';
import { ENGINE_VERSION } from '../engine/version';
import type { DataCell, SheetDocument } from '../sheet/document';
import { parseSheetDocument } from '../sheet/upgrade';

/**
 * Meander's sheet file: one JSON object holding a version's document (with its schema number),
 * the files of the datasets its data cells use, the digests and moments saved with the version,
 * and the engine version. Exported from a version, imported as a new sheet, and read by the
 * command-line runner. The document inside is checked by the same schema as everywhere else.
 */

export const SHEET_FILE_FORMAT = 'meander.sheet';
export const SHEET_FILE_VERSION = 1;

export const sheetFileDatasetSchema = z.object({
  id: datasetIdSchema,
  name: z.string().max(DATASET_LIMITS.maxNameLength),
  originalName: z.string().max(255),
  checksum: checksumSchema,
  /** The file as uploaded (UTF-8 text). */
  content: z.string().max(DATASET_LIMITS.maxBytes, 'a dataset is at most 10 MB'),
});
export type SheetFileDataset = z.infer<typeof sheetFileDatasetSchema>;

/** Everything but the document, which parseSheetFile checks on its own (with upgrades). */
export const sheetFileSchema = z.object({
  format: z.literal(SHEET_FILE_FORMAT, `not a Meander sheet file (format must be "${SHEET_FILE_FORMAT}")`),
  formatVersion: z
    .number()
    .int()
    .min(1)
    .max(SHEET_FILE_VERSION, `this Meander reads sheet files up to format version ${SHEET_FILE_VERSION}`),
  exportedAt: z.string().max(40),
  /** The engine version of the Meander that wrote the file. */
  engineVersion: z.number().int().min(1),
  source: z
    .object({ sheetId: z.string().max(64), version: z.number().int().min(1), title: z.string().max(200) })
    .optional(),
  document: z.unknown(),
  /** The version's saved digests, and the engine version that made them (null when none). */
  digests: versionDigestsSchema.default({}),
  moments: versionMomentsSchema.default({}),
  digestsEngineVersion: z.number().int().min(1).nullable().default(null),
  datasets: z.array(sheetFileDatasetSchema).max(50, 'a sheet file holds at most 50 datasets').default([]),
});

export type SheetFile = Omit<z.infer<typeof sheetFileSchema>, 'document'> & { document: SheetDocument };

export interface SheetFileFault {
  /** Where in the file, e.g. ["document", "cells", 3, "drift"]. */
  path: (string | number)[];
  message: string;
}

export type SheetFileResult = { ok: true; file: SheetFile } | { ok: false; fault: SheetFileFault };

const pathOf = (path: readonly PropertyKey[]) =>
  path.map((key) => (typeof key === 'symbol' ? String(key) : key));

/** The data cells of a document that name a dataset. */
export function dataCellsWithFiles(
  doc: SheetDocument,
): (DataCell & { dataset: NonNullable<DataCell['dataset']> })[] {
  return doc.cells.filter(
    (cell): cell is DataCell & { dataset: NonNullable<DataCell['dataset']> } =>
      cell.kind === 'data' && cell.dataset !== null,
  );
}

/**
 * Checks a parsed JSON value as a sheet file: its envelope, the document (upgraded, then the
 * document schema), each dataset's checksum against its content, and that every data cell's
 * dataset is in the file with the checksum the cell expects. The first fault comes back with its
 * path in the file.
 */
export async function parseSheetFile(raw: unknown): Promise<SheetFileResult> {
  const envelope = sheetFileSchema.safeParse(raw);
  if (!envelope.success) {
    const issue = envelope.error.issues[0]!;
    return { ok: false, fault: { path: pathOf(issue.path), message: issue.message } };
  }
  const document = parseSheetDocument(envelope.data.document);
  if (!document.success) {
    const issue = document.error.issues[0]!;
    return { ok: false, fault: { path: ['document', ...pathOf(issue.path)], message: issue.message } };
  }
  const datasets = envelope.data.datasets;
  for (const [i, dataset] of datasets.entries()) {
    const actual = await sha256Hex(new TextEncoder().encode(dataset.content));
    if (actual !== dataset.checksum)
      return {
        ok: false,
        fault: {
          path: ['datasets', i, 'checksum'],
          message: `the content of dataset '${dataset.name}' does not match its checksum: the file was changed after export`,
        },
      };
  }
  for (const cell of dataCellsWithFiles(document.data)) {
    const index = document.data.cells.indexOf(cell);
    const embedded = datasets.find((dataset) => dataset.id === cell.dataset.id);
    if (!embedded || embedded.checksum !== cell.dataset.checksum)
      return {
        ok: false,
        fault: {
          path: ['document', 'cells', index, 'dataset'],
          message: `data cell '${cell.id}' uses dataset '${cell.dataset.name}', which the file ${embedded ? 'holds with another checksum' : 'does not hold'}`,
        },
      };
  }
  return { ok: true, file: { ...envelope.data, document: document.data } };
}

export function buildSheetFile(input: {
  document: SheetDocument;
  datasets: SheetFileDataset[];
  digests: SheetFile['digests'];
  moments: SheetFile['moments'];
  digestsEngineVersion: number | null;
  source?: SheetFile['source'];
  exportedAt: Date;
}): SheetFile {
  return {
    format: SHEET_FILE_FORMAT,
    formatVersion: SHEET_FILE_VERSION,
    exportedAt: input.exportedAt.toISOString(),
    engineVersion: ENGINE_VERSION,
    ...(input.source ? { source: input.source } : {}),
    document: input.document,
    digests: input.digests,
    moments: input.moments,
    digestsEngineVersion: input.digestsEngineVersion,
    datasets: input.datasets,
  };
}

/**
 * The embedded datasets parsed as the data cells that use them read them (their time and group
 * columns), for a run from the file. A dataset no cell can read is an error naming the cell.
 */
export function sheetFileTables(file: SheetFile): Map<string, ParsedTable & { checksum: string }> {
  const tables = new Map<string, ParsedTable & { checksum: string }>();
  for (const cell of dataCellsWithFiles(file.document)) {
    if (tables.has(cell.dataset.id)) continue;
    const dataset = file.datasets.find((entry) => entry.id === cell.dataset.id)!;
    const parsed = parseDatasetText(dataset.content, {
      timeColumn: cell.timeColumn,
      groupColumn: cell.groupColumn,
    });
    if (!parsed.ok)
      throw new Error(`data cell '${cell.id}': dataset '${dataset.name}': ${parsed.faults[0]!.message}`);
    tables.set(dataset.id, { ...parsed.table, checksum: dataset.checksum });
  }
  return tables;
}

/** A run's dataset provider from the file's embedded datasets. */
export function sheetFileDatasets(file: SheetFile): DatasetProvider {
  return memoryDatasetProvider(sheetFileTables(file));
}
