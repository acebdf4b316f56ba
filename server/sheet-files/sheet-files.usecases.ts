import { generateIdFromEntropySize } from 'lucia';
import type { CreatedSheet } from '@shared/api/sheets';
import { ENGINE_VERSION } from '@shared/engine/version';
import {
  buildSheetFile,
  dataCellsWithFiles,
  parseSheetFile,
  sheetFileTables,
  type SheetFile,
} from '@shared/sheet-file/sheet-file';
import type { SheetDocument } from '@shared/sheet/document';
import { parseSheetDocument } from '@shared/sheet/upgrade';
import type { Transact } from '../db/transact';
import type { DatasetsRepository } from '../datasets/datasets.repository';
import { requireRight, type SheetActor } from '../sheets/sheet-rights';
import type { SheetsRepository } from '../sheets/sheets.repository';
import { invalidDocumentFrom, versionNotFound } from '../sheets/sheets.errors';
import { datasetMissing, invalidSheetFile } from './sheet-files.errors';

interface Repositories {
  sheets: SheetsRepository;
  datasets: DatasetsRepository;
}

/** Sheet files: a version out as one JSON file with its datasets; such a file in as a new sheet. */
export function createSheetFilesUsecases({
  repositories,
  transact,
  now = () => new Date(),
}: {
  repositories: Repositories;
  transact: Transact<Repositories>;
  now?: () => Date;
}) {
  const { sheets, datasets } = repositories;

  return {
    async exportVersion(user: SheetActor, sheetId: string, number: number): Promise<SheetFile> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      const version = await sheets.findVersion(sheet.id, number);
      if (!version) throw versionNotFound();
      const parsed = parseSheetDocument(version.document);
      if (!parsed.success) throw invalidDocumentFrom(parsed.error);
      const embedded: SheetFile['datasets'] = [];
      for (const cell of dataCellsWithFiles(parsed.data)) {
        if (embedded.some((entry) => entry.id === cell.dataset.id)) continue;
        const row = await datasets.findById(cell.dataset.id);
        const readable = row !== null && (await datasets.readableBy(row.sheetId, user.id));
        if (!row || !readable || row.checksum !== cell.dataset.checksum) throw datasetMissing(cell.id);
        embedded.push({
          id: row.id,
          name: row.name,
          originalName: row.originalName,
          checksum: row.checksum,
          content: row.content,
        });
      }
      return buildSheetFile({
        document: parsed.data,
        datasets: embedded,
        digests: version.digests,
        moments: version.moments,
        digestsEngineVersion: version.engineVersion,
        source: { sheetId: sheet.id, version: number, title: parsed.data.title },
        exportedAt: now(),
      });
    },

    /** A new sheet owned by the caller, with fresh copies of the file's datasets; all or nothing. */
    async importFile(user: SheetActor, bytes: Uint8Array): Promise<CreatedSheet> {
      let raw: unknown;
      try {
        raw = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(bytes));
      } catch {
        throw invalidSheetFile([], 'the file is not UTF-8 JSON: choose a sheet file exported from Meander');
      }
      const parsed = await parseSheetFile(raw);
      if (!parsed.ok) throw invalidSheetFile(parsed.fault.path, parsed.fault.message);
      const file = parsed.file;
      let tables: ReturnType<typeof sheetFileTables>;
      try {
        tables = sheetFileTables(file);
      } catch (error) {
        throw invalidSheetFile(['datasets'], error instanceof Error ? error.message : String(error));
      }
      const usable = file.digestsEngineVersion !== null && file.digestsEngineVersion <= ENGINE_VERSION;
      const digests = usable ? file.digests : {};
      const newIds = new Map([...tables.keys()].map((id) => [id, generateIdFromEntropySize(10)]));
      const document: SheetDocument = {
        ...file.document,
        cells: file.document.cells.map((cell) =>
          cell.kind === 'data' && cell.dataset
            ? { ...cell, dataset: { ...cell.dataset, id: newIds.get(cell.dataset.id)! } }
            : cell,
        ),
      };
      const id = generateIdFromEntropySize(10);
      await transact(async (tx) => {
        await tx.sheets.insertSheet({ id, ownerId: user.id, title: document.title });
        await tx.sheets.insertVersion({
          sheetId: id,
          number: 1,
          document,
          authorId: user.id,
          message: `Imported from a sheet file${file.source ? ` (version ${file.source.version} of "${file.source.title}")` : ''}`,
          parentNumber: null,
          digests,
          moments: usable ? file.moments : {},
          engineVersion: Object.keys(digests).length > 0 ? file.digestsEngineVersion : null,
        });
        for (const [oldId, table] of tables) {
          const entry = file.datasets.find((dataset) => dataset.id === oldId)!;
          await tx.datasets.insert({
            id: newIds.get(oldId)!,
            sheetId: id,
            uploaderId: user.id,
            name: entry.name,
            originalName: entry.originalName,
            columns: table.columns,
            rows: table.rows,
            rowCount: table.rows.length,
            checksum: entry.checksum,
            content: entry.content,
          });
        }
      });
      return { id, title: document.title, version: 1 };
    },
  };
}

export type SheetFilesUsecases = ReturnType<typeof createSheetFilesUsecases>;
