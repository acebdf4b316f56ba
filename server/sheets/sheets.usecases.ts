import { generateIdFromEntropySize } from 'lucia';
import type {
  CreatedSheet,
  CreateSheetRequest,
  SavedVersion,
  SaveVersionRequest,
  SheetDetail,
  SheetList,
  VersionDetail,
  VersionDigests,
  VersionList,
} from '@shared/api/sheets';
import { ENGINE_VERSION } from '@shared/engine/version';
import { emptySheetDocument, sheetDocumentSchema, type SheetDocument } from '@shared/sheet/document';
import type { Transact } from '../db/transact';
import type { SheetRecord, SheetsRepository } from './sheets.repository';
import {
  invalidDocument,
  invalidDocumentFrom,
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
  const result = sheetDocumentSchema.safeParse(document);
  if (result.success) return result.data;
  throw invalidDocumentFrom(result.error);
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

/** The engine version stored beside digests: none without digests (the table's check says so). */
function digestsEngineVersion(digests: VersionDigests, claimed: number | undefined): number | null {
  return Object.keys(digests).length === 0 ? null : (claimed ?? ENGINE_VERSION);
}

function withTitle(document: unknown, title: string): unknown {
  return document && typeof document === 'object' ? { ...document, title } : document;
}

/** The repositories a sheet usecase may use inside one transaction. */
export interface SheetRepositories {
  sheets: SheetsRepository;
}

export interface SheetsUsecaseDeps {
  sheets: SheetsRepository;
  /** Runs work in a transaction with repositories bound to it (see server/db/transact.ts). */
  transact: Transact<SheetRepositories>;
  now?: () => Date;
}

export function createSheetsUsecases({ sheets, transact, now = () => new Date() }: SheetsUsecaseDeps) {
  return {
    /**
     * A new sheet with its version 1; the document's title follows the sheet's. With
     * `forkedFrom`, the caller must be able to read that sheet and version; it is stored as the
     * new sheet's lineage.
     */
    async createSheet(user: SheetActor, input: CreateSheetRequest): Promise<CreatedSheet> {
      const document = parseSheetDocument(
        input.document === undefined
          ? emptySheetDocument(input.title)
          : withTitle(input.document, input.title),
      );
      const id = generateIdFromEntropySize(10);
      await transact(async (repositories) => {
        const source = input.forkedFrom;
        if (source) {
          const sheet = requireSheetRole(await repositories.sheets.findById(source.sheetId), user, 'viewer');
          if (!(await repositories.sheets.findVersion(sheet.id, source.version))) throw versionNotFound();
        }
        await repositories.sheets.insertSheet({
          id,
          ownerId: user.id,
          title: input.title,
          forkedFrom: source?.sheetId ?? null,
          forkedFromVersion: source?.version ?? null,
        });
        await repositories.sheets.insertVersion({
          sheetId: id,
          number: 1,
          document,
          authorId: user.id,
          message: source ? 'Forked' : 'Created',
          parentNumber: null,
          digests: {},
          engineVersion: null,
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
          forkedFromVersion: row.forkedFromVersion,
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
        forkedFromVersion: sheet.forkedFromVersion,
        // A rename changes the sheet, not its immutable versions: the title shown is the sheet's.
        document: withTitle(version.document, sheet.title),
        digests: version.digests,
        engineVersion: version.engineVersion,
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
      return transact(async (repositories) => {
        const sheet = requireSheetRole(await repositories.sheets.findByIdForUpdate(sheetId), user, 'editor');
        if (input.baseVersion !== sheet.currentVersion) throw versionConflict(sheet.currentVersion);
        const number = sheet.currentVersion + 1;
        await repositories.sheets.insertVersion({
          sheetId: sheet.id,
          number,
          document,
          authorId: user.id,
          message: input.message,
          parentNumber: input.baseVersion,
          digests,
          engineVersion: digestsEngineVersion(digests, input.engineVersion),
        });
        await repositories.sheets.advance(sheet.id, {
          currentVersion: number,
          title: document.title,
          at: now(),
        });
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
        engineVersion: row.engineVersion,
      };
    },
  };
}

export type SheetsUsecases = ReturnType<typeof createSheetsUsecases>;
