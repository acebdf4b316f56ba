import { generateIdFromEntropySize } from 'lucia';
import type {
  CreatedSheet,
  CreateSheetRequest,
  SavedVersion,
  SaveVersionRequest,
  SheetDetail,
  SheetList,
  VersionDetail,
  VersionList,
} from '@shared/api/sheets';
import { emptySheetDocument, type SheetDocument } from '@shared/sheet/document';
import { parseSheetDocument as upgradeAndParse } from '@shared/sheet/upgrade';
import type { Db } from '../db/client';
import { zodIssueToBadRequest } from '../http/validate';
import { createSheetsRepository, type SheetRecord, type SheetsRepository } from './sheets.repository';
import {
  invalidDocument,
  sheetForbidden,
  sheetNotFound,
  versionConflict,
  versionNotFound,
} from './sheets.errors';

/** Roles on a sheet, weakest first. */
export const SHEET_ROLES = ['viewer', 'commenter', 'editor', 'owner'] as const;
export type SheetRole = (typeof SHEET_ROLES)[number];

export interface SheetActor {
  id: string;
}

/** The caller's role on a sheet, or null. Owner only for now; shares add the other roles. */
export function sheetRoleOf(sheet: Pick<SheetRecord, 'ownerId'>, user: SheetActor): SheetRole | null {
  return sheet.ownerId === user.id ? 'owner' : null;
}

/**
 * The one place that decides who may do what with a sheet. A caller without any role gets 404,
 * as if the sheet did not exist; one who may see it but needs a stronger role gets 403.
 */
export function requireSheetRole(
  sheet: SheetRecord | null,
  user: SheetActor,
  needed: SheetRole,
): SheetRecord {
  if (!sheet) throw sheetNotFound();
  const role = sheetRoleOf(sheet, user);
  if (!role) throw sheetNotFound();
  if (SHEET_ROLES.indexOf(role) < SHEET_ROLES.indexOf(needed)) throw sheetForbidden(needed);
  return sheet;
}

/** Checks a document with the shared schema; the 400 names the path of the first issue. */
export function parseSheetDocument(document: unknown): SheetDocument {
  const result = upgradeAndParse(document);
  if (result.success) return result.data;
  const generic = zodIssueToBadRequest(result.error, 'document');
  const path = ['document', ...((generic.details.path as (string | number)[] | undefined) ?? [])];
  throw invalidDocument(
    `${path.join('.')}: ${result.error.issues[0]?.message ?? 'not a valid sheet document'}`,
    path,
  );
}

function checkDigests(document: SheetDocument, digests: Record<string, string>) {
  const simulationIds = new Set(
    document.cells.filter((cell) => cell.kind === 'simulation').map((cell) => cell.id),
  );
  for (const cellId of Object.keys(digests)) {
    if (!simulationIds.has(cellId)) {
      throw invalidDocument(`digests.${cellId}: there is no simulation cell with this id`, [
        'digests',
        cellId,
      ]);
    }
  }
}

function withTitle(document: unknown, title: string): unknown {
  return document && typeof document === 'object' ? { ...document, title } : document;
}

export interface SheetsUsecaseDeps {
  db: Db;
  sheets: SheetsRepository;
  now?: () => Date;
}

export function createSheetsUsecases({ db, sheets, now = () => new Date() }: SheetsUsecaseDeps) {
  return {
    /** A new sheet with its version 1; the document's title follows the sheet's. */
    async createSheet(
      user: SheetActor,
      input: CreateSheetRequest & { forkedFrom?: string },
    ): Promise<CreatedSheet> {
      const document = parseSheetDocument(
        input.document === undefined
          ? emptySheetDocument(input.title)
          : withTitle(input.document, input.title),
      );
      const id = generateIdFromEntropySize(10);
      await db.transaction(async (tx) => {
        const txSheets = createSheetsRepository({ db: tx });
        await txSheets.insertSheet({
          id,
          ownerId: user.id,
          title: input.title,
          forkedFrom: input.forkedFrom ?? null,
        });
        await txSheets.insertVersion({
          sheetId: id,
          number: 1,
          document,
          authorId: user.id,
          message: input.forkedFrom ? 'Forked' : 'Created',
          parentNumber: null,
          digests: {},
        });
      });
      return { id, title: input.title, version: 1 };
    },

    async listSheets(user: SheetActor): Promise<SheetList> {
      const rows = await sheets.listByOwner(user.id);
      return {
        sheets: rows.map((row) => ({
          id: row.id,
          title: row.title,
          version: row.currentVersion,
          forkedFrom: row.forkedFrom,
          createdAt: row.createdAt.toISOString(),
          updatedAt: row.updatedAt.toISOString(),
        })),
      };
    },

    async getSheet(user: SheetActor, sheetId: string): Promise<SheetDetail> {
      const sheet = requireSheetRole(await sheets.findById(sheetId), user, 'viewer');
      const version = await sheets.findVersion(sheet.id, sheet.currentVersion);
      if (!version) throw versionNotFound();
      return {
        id: sheet.id,
        title: sheet.title,
        owner: { id: sheet.ownerId, name: sheet.ownerName },
        version: sheet.currentVersion,
        forkedFrom: sheet.forkedFrom,
        // A rename changes the sheet, not its immutable versions: the title shown is the sheet's.
        document: withTitle(version.document, sheet.title),
        digests: version.digests,
        createdAt: sheet.createdAt.toISOString(),
        updatedAt: sheet.updatedAt.toISOString(),
      };
    },

    async renameSheet(
      user: SheetActor,
      sheetId: string,
      title: string,
    ): Promise<{ id: string; title: string }> {
      const sheet = requireSheetRole(await sheets.findById(sheetId), user, 'editor');
      await sheets.rename(sheet.id, title, now());
      return { id: sheet.id, title };
    },

    async deleteSheet(user: SheetActor, sheetId: string): Promise<void> {
      const sheet = requireSheetRole(await sheets.findById(sheetId), user, 'owner');
      await sheets.softDelete(sheet.id, now());
    },

    /**
     * Saves a new version on top of `baseVersion`. The sheet row is locked while the base is
     * compared with the current version, so of two saves on the same base exactly one wins and
     * the other gets 409 having written nothing.
     */
    async saveVersion(user: SheetActor, sheetId: string, input: SaveVersionRequest): Promise<SavedVersion> {
      const document = parseSheetDocument(input.document);
      const digests = input.digests ?? {};
      checkDigests(document, digests);
      return db.transaction(async (tx) => {
        const txSheets = createSheetsRepository({ db: tx });
        const sheet = requireSheetRole(await txSheets.findByIdForUpdate(sheetId), user, 'editor');
        if (input.baseVersion !== sheet.currentVersion) throw versionConflict(sheet.currentVersion);
        const number = sheet.currentVersion + 1;
        await txSheets.insertVersion({
          sheetId: sheet.id,
          number,
          document,
          authorId: user.id,
          message: input.message,
          parentNumber: input.baseVersion,
          digests,
        });
        await txSheets.advance(sheet.id, { currentVersion: number, title: document.title, at: now() });
        return { number };
      });
    },

    async listVersions(user: SheetActor, sheetId: string): Promise<VersionList> {
      const sheet = requireSheetRole(await sheets.findById(sheetId), user, 'viewer');
      const rows = await sheets.listVersions(sheet.id);
      return {
        versions: rows.map((row) => ({
          number: row.number,
          message: row.message,
          author: { id: row.authorId, name: row.authorName },
          parent: row.parentNumber,
          createdAt: row.createdAt.toISOString(),
        })),
      };
    },

    async getVersion(user: SheetActor, sheetId: string, number: number): Promise<VersionDetail> {
      const sheet = requireSheetRole(await sheets.findById(sheetId), user, 'viewer');
      const row = await sheets.findVersion(sheet.id, number);
      if (!row) throw versionNotFound();
      return {
        number: row.number,
        message: row.message,
        author: { id: row.authorId, name: row.authorName },
        parent: row.parentNumber,
        createdAt: row.createdAt.toISOString(),
        document: row.document,
        digests: row.digests,
      };
    },
  };
}

export type SheetsUsecases = ReturnType<typeof createSheetsUsecases>;
