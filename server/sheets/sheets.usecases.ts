// Just over 300 lines: the rules of sheets and their versions (create, read, save with its 409,
// restore, rename, delete) in one place a newcomer looks; forks, shares and comments have their own files.
import { generateIdFromEntropySize } from 'lucia';
import type {
  CreatedSheet,
  CreateSheetRequest,
  SavedVersion,
  SaveVersionRequest,
  SheetDetail,
  SheetHead,
  SheetList,
  SheetSummary,
  VersionDetail,
  VersionDigests,
  VersionMoments,
  VersionList,
} from '@shared/api/sheets';
import { ENGINE_VERSION } from '@shared/engine/version';
import { MAX_SUMMARY_CHARS, type VersionResults } from '@shared/run/version-results';
import { emptySheetDocument, type SheetDocument } from '@shared/sheet/document';
import { parseSheetDocument as upgradeAndParse } from '@shared/sheet/upgrade';
import type { CommentsRepository } from '../comments/comments.repository';
import type { Transact } from '../db/transact';
import type { SharesRepository } from '../shares/shares.repository';
import type { UsersRepository } from '../users/users.repository';
import { requireRight, roleOn, type SheetActor } from './sheet-rights';
import type { SheetRecord, SheetsRepository } from './sheets.repository';
import {
  invalidDocument,
  invalidDocumentFrom,
  restoreCurrentVersion,
  versionConflict,
  versionNotFound,
} from './sheets.errors';

export type { SheetActor };

/** Checks a document with the shared schema; the 400 names the path of the first issue. */
export function parseSheetDocument(document: unknown): SheetDocument {
  const result = upgradeAndParse(document);
  if (result.success) return result.data;
  throw invalidDocumentFrom(result.error);
}

function checkDigests(document: SheetDocument, digests: Record<string, string>, moments: VersionMoments) {
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
  // Moments describe the runs the digests name, and no others.
  for (const cellId of Object.keys(moments)) {
    if (!Object.hasOwn(digests, cellId)) {
      throw invalidDocument(`moments.${cellId}: there is no digest for this simulation`, ['moments', cellId]);
    }
  }
}

/**
 * A results summary names cells of the document, each of the kind it summarises, and stays
 * within its size limit; an empty summary is stored as none.
 */
function checkedResults(document: SheetDocument, results: VersionResults | undefined): VersionResults | null {
  if (!results || Object.keys(results).length === 0) return null;
  const kinds = new Map(document.cells.map((cell) => [cell.id, cell.kind]));
  for (const [cellId, summary] of Object.entries(results)) {
    if (kinds.get(cellId) !== summary.kind)
      throw invalidDocument(`results.${cellId}: the document has no ${summary.kind} cell with this id`, [
        'results',
        cellId,
      ]);
  }
  if (JSON.stringify(results).length > MAX_SUMMARY_CHARS)
    throw invalidDocument(`results: the summary of results is larger than ${MAX_SUMMARY_CHARS} characters`, [
      'results',
    ]);
  return results;
}

/** The engine version stored beside digests: none without digests (the table's check says so). */
function digestsEngineVersion(digests: VersionDigests, claimed: number | undefined): number | null {
  return Object.keys(digests).length === 0 ? null : (claimed ?? ENGINE_VERSION);
}

export function withTitle(document: unknown, title: string): unknown {
  return document && typeof document === 'object' ? { ...document, title } : document;
}

/** A listed row is one the caller can read, so it has a role: none would be a query's bug. */
export function toSheetSummary(row: SheetRecord, user: SheetActor): SheetSummary {
  const role = roleOn(row, user);
  if (!role) throw new Error(`sheet ${row.id} was listed for a user without a role on it`);
  return {
    id: row.id,
    title: row.title,
    role,
    owner: { id: row.ownerId, name: row.ownerName },
    version: row.currentVersion,
    forkedFrom: row.forkedFrom,
    forkedFromVersion: row.forkedFromVersion,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The repositories a sheet usecase may use inside one transaction. */
export interface SheetRepositories {
  sheets: SheetsRepository;
  shares: SharesRepository;
  comments: CommentsRepository;
  users: UsersRepository;
}

export interface SheetsUsecaseDeps {
  sheets: SheetsRepository;
  /** Runs work in a transaction with repositories bound to it (see server/db/transact.ts). */
  transact: Transact<Pick<SheetRepositories, 'sheets'>>;
  now?: () => Date;
}

export function createSheetsUsecases({ sheets, transact, now = () => new Date() }: SheetsUsecaseDeps) {
  return {
    /**
     * A new sheet with its version 1; the document's title follows the sheet's. With
     * `forkedFrom`, the caller must be able to read that sheet and version; it is stored as the
     * new sheet's lineage.
     */
    async createSheet(
      user: SheetActor,
      input: CreateSheetRequest & {
        digests?: VersionDigests;
        moments?: VersionMoments;
        engineVersion?: number | null;
        results?: VersionResults | null;
      },
    ): Promise<CreatedSheet> {
      const document = parseSheetDocument(
        input.document === undefined
          ? emptySheetDocument(input.title)
          : withTitle(input.document, input.title),
      );
      const id = generateIdFromEntropySize(10);
      await transact(async (repositories) => {
        const source = input.forkedFrom;
        if (source) {
          const { sheet } = requireRight(
            await repositories.sheets.findForUser(source.sheetId, user.id),
            user,
            'fork',
          );
          if (!(await repositories.sheets.findVersion(sheet.id, source.version))) throw versionNotFound();
        }
        const digests = input.digests ?? {};
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
          message: source ? `Forked from version ${source.version}` : 'Created',
          parentNumber: null,
          digests,
          moments: input.moments ?? {},
          engineVersion: digestsEngineVersion(digests, input.engineVersion ?? undefined),
          results: input.results ?? null,
        });
      });
      return { id, title: input.title, version: 1 };
    },

    async listSheets(user: SheetActor): Promise<SheetList> {
      const rows = await sheets.listForUser(user.id);
      return { sheets: rows.map((row) => toSheetSummary(row, user)) };
    },

    async getSheet(user: SheetActor, sheetId: string): Promise<SheetDetail> {
      const { sheet, role } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      const version = await sheets.findVersion(sheet.id, sheet.currentVersion);
      if (!version) throw versionNotFound();
      const source =
        sheet.forkedFrom && sheet.forkedFromVersion
          ? await sheets.findForkSource(sheet.forkedFrom, sheet.forkedFromVersion, user.id)
          : null;
      const forks = await sheets.listForksForUser(sheet.id, user.id);
      return {
        id: sheet.id,
        title: sheet.title,
        owner: { id: sheet.ownerId, name: sheet.ownerName },
        role,
        version: sheet.currentVersion,
        forkedFrom: sheet.forkedFrom,
        forkedFromVersion: sheet.forkedFromVersion,
        forkSource:
          source && sheet.forkedFromVersion ? { ...source, version: sheet.forkedFromVersion } : null,
        forkCount: forks.length,
        // A rename changes the sheet, not its immutable versions: the title shown is the sheet's.
        document: withTitle(version.document, sheet.title),
        digests: version.digests,
        engineVersion: version.engineVersion,
        results: version.results,
        createdAt: sheet.createdAt.toISOString(),
        updatedAt: sheet.updatedAt.toISOString(),
      };
    },

    /** What a page polls to learn that someone saved; cheap, and the same for every role. */
    async getHead(user: SheetActor, sheetId: string): Promise<SheetHead> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      return { version: sheet.currentVersion, title: sheet.title, updatedAt: sheet.updatedAt.toISOString() };
    },

    async renameSheet(
      user: SheetActor,
      sheetId: string,
      title: string,
    ): Promise<{ id: string; title: string }> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'rename');
      await sheets.rename(sheet.id, title, now());
      return { id: sheet.id, title };
    },

    /** Soft delete: forks of the sheet keep working and keep their lineage. */
    async deleteSheet(user: SheetActor, sheetId: string): Promise<void> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'delete');
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
      const moments = input.moments ?? {};
      checkDigests(document, digests, moments);
      return transact(async (repositories) => {
        const { sheet } = requireRight(
          await repositories.sheets.findForUserForUpdate(sheetId, user.id),
          user,
          'saveVersion',
        );
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
          moments,
          engineVersion: digestsEngineVersion(digests, input.engineVersion),
          results: checkedResults(document, input.results),
        });
        await repositories.sheets.advance(sheet.id, {
          currentVersion: number,
          title: document.title,
          at: now(),
        });
        return { number };
      });
    },

    /**
     * Saves an old version again as the newest (parent: the current version), with its digests
     * and their engine version; history is never rewritten.
     */
    async restoreVersion(user: SheetActor, sheetId: string, number: number): Promise<SavedVersion> {
      return transact(async (repositories) => {
        const { sheet } = requireRight(
          await repositories.sheets.findForUserForUpdate(sheetId, user.id),
          user,
          'restore',
        );
        const old = await repositories.sheets.findVersion(sheet.id, number);
        if (!old) throw versionNotFound();
        if (number === sheet.currentVersion) throw restoreCurrentVersion();
        const next = sheet.currentVersion + 1;
        const document = parseSheetDocument(old.document);
        await repositories.sheets.insertVersion({
          sheetId: sheet.id,
          number: next,
          document,
          authorId: user.id,
          message: `Restored version ${number}`,
          parentNumber: sheet.currentVersion,
          digests: old.digests,
          moments: old.moments,
          engineVersion: old.engineVersion,
          results: old.results,
        });
        await repositories.sheets.advance(sheet.id, {
          currentVersion: next,
          title: document.title,
          at: now(),
        });
        return { number: next };
      });
    },

    async listVersions(user: SheetActor, sheetId: string): Promise<VersionList> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
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
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
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
        moments: row.moments,
        engineVersion: row.engineVersion,
        results: row.results,
      };
    },
  };
}

export type SheetsUsecases = ReturnType<typeof createSheetsUsecases>;
