import { and, desc, eq, isNull, or, sql } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { sheetShares } from '../shares/shares.table';
import { users } from '../users/users.table';
import { sheets, sheetVersions, type SheetVersionRow } from './sheets.table';

/** A sheet as its usecases see it, with the role shared with the asking user (null: none). */
const sheetColumns = {
  id: sheets.id,
  ownerId: sheets.ownerId,
  ownerName: users.name,
  title: sheets.title,
  currentVersion: sheets.currentVersion,
  forkedFrom: sheets.forkedFrom,
  forkedFromVersion: sheets.forkedFromVersion,
  createdAt: sheets.createdAt,
  updatedAt: sheets.updatedAt,
  sharedRole: sheetShares.role,
};

const versionSummaryColumns = {
  number: sheetVersions.number,
  message: sheetVersions.message,
  authorId: sheetVersions.authorId,
  authorName: users.name,
  parentNumber: sheetVersions.parentNumber,
  createdAt: sheetVersions.createdAt,
};

/** Sheets the user owns or has a share on. */
const visibleTo = (userId: string) => or(eq(sheets.ownerId, userId), eq(sheetShares.userId, userId));

/** Queries on sheets and their versions (deleted sheets are invisible here); rules live in the usecases. */
export function createSheetsRepository({ db }: { db: DbExecutor }) {
  const selectForUser = (userId: string) =>
    db
      .select(sheetColumns)
      .from(sheets)
      .innerJoin(users, eq(users.id, sheets.ownerId))
      .leftJoin(sheetShares, and(eq(sheetShares.sheetId, sheets.id), eq(sheetShares.userId, userId)));

  return {
    async insertSheet(sheet: {
      id: string;
      ownerId: string;
      title: string;
      forkedFrom?: string | null;
      forkedFromVersion?: number | null;
    }) {
      const [row] = await db
        .insert(sheets)
        .values({ ...sheet, currentVersion: 1 })
        .returning();
      return row!;
    },

    /** The sheet with the role shared with `userId` (the caller decides what it allows). */
    async findForUser(id: string, userId: string) {
      const [row] = await selectForUser(userId).where(and(eq(sheets.id, id), isNull(sheets.deletedAt)));
      return row ?? null;
    },

    /** Locks the sheet row until the transaction ends: saves of one sheet happen one at a time. */
    async findForUserForUpdate(id: string, userId: string) {
      const [row] = await selectForUser(userId)
        .where(and(eq(sheets.id, id), isNull(sheets.deletedAt)))
        .for('update', { of: sheets });
      return row ?? null;
    },

    /** The user's own sheets and those shared with them, newest change first. */
    async listForUser(userId: string) {
      return selectForUser(userId)
        .where(and(visibleTo(userId), isNull(sheets.deletedAt)))
        .orderBy(desc(sheets.updatedAt), sheets.id);
    },

    /** Forks of a sheet that the user can read. */
    async listForksForUser(sourceId: string, userId: string) {
      return selectForUser(userId)
        .where(and(eq(sheets.forkedFrom, sourceId), visibleTo(userId), isNull(sheets.deletedAt)))
        .orderBy(desc(sheets.createdAt), sheets.id);
    },

    /**
     * Where a fork came from, even when the source is deleted: its id, the title of the version
     * forked (the fork holds a copy of that document anyway) and whether `userId` can read it.
     */
    async findForkSource(sourceId: string, version: number, userId: string) {
      const [row] = await db
        .select({
          sheetId: sheets.id,
          title: sql<string>`${sheetVersions.document} ->> 'title'`,
          canRead: sql<boolean>`${sheets.deletedAt} is null and (${sheets.ownerId} = ${userId} or ${sheetShares.userId} is not null)`,
        })
        .from(sheets)
        .innerJoin(
          sheetVersions,
          and(eq(sheetVersions.sheetId, sheets.id), eq(sheetVersions.number, version)),
        )
        .leftJoin(sheetShares, and(eq(sheetShares.sheetId, sheets.id), eq(sheetShares.userId, userId)))
        .where(eq(sheets.id, sourceId));
      return row ?? null;
    },

    async rename(id: string, title: string, at: Date) {
      await db.update(sheets).set({ title, updatedAt: at }).where(eq(sheets.id, id));
    },

    async advance(id: string, change: { currentVersion: number; title: string; at: Date }) {
      await db
        .update(sheets)
        .set({ currentVersion: change.currentVersion, title: change.title, updatedAt: change.at })
        .where(eq(sheets.id, id));
    },

    async setOwner(id: string, ownerId: string, at: Date) {
      await db.update(sheets).set({ ownerId, updatedAt: at }).where(eq(sheets.id, id));
    },

    async softDelete(id: string, at: Date) {
      await db.update(sheets).set({ deletedAt: at }).where(eq(sheets.id, id));
    },

    async insertVersion(
      version: Omit<SheetVersionRow, 'createdAt' | 'results'> & {
        createdAt?: Date;
        results?: SheetVersionRow['results'];
      },
    ) {
      await db.insert(sheetVersions).values(version);
    },

    async listVersions(sheetId: string) {
      return db
        .select(versionSummaryColumns)
        .from(sheetVersions)
        .innerJoin(users, eq(users.id, sheetVersions.authorId))
        .where(eq(sheetVersions.sheetId, sheetId))
        .orderBy(desc(sheetVersions.number));
    },

    async findVersion(sheetId: string, number: number) {
      const [row] = await db
        .select({
          ...versionSummaryColumns,
          document: sheetVersions.document,
          digests: sheetVersions.digests,
          moments: sheetVersions.moments,
          engineVersion: sheetVersions.engineVersion,
          results: sheetVersions.results,
        })
        .from(sheetVersions)
        .innerJoin(users, eq(users.id, sheetVersions.authorId))
        .where(and(eq(sheetVersions.sheetId, sheetId), eq(sheetVersions.number, number)));
      return row ?? null;
    },
  };
}

export type SheetsRepository = ReturnType<typeof createSheetsRepository>;
export type SheetRecord = NonNullable<Awaited<ReturnType<SheetsRepository['findForUser']>>>;
export type VersionRecord = NonNullable<Awaited<ReturnType<SheetsRepository['findVersion']>>>;
