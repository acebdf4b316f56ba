import { and, desc, eq, isNull } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { users } from '../users/users.table';
import { sheets, sheetVersions, type SheetVersionRow } from './sheets.table';

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
};

const versionSummaryColumns = {
  number: sheetVersions.number,
  message: sheetVersions.message,
  authorId: sheetVersions.authorId,
  authorName: users.name,
  parentNumber: sheetVersions.parentNumber,
  createdAt: sheetVersions.createdAt,
};

/** Queries on sheets and their versions (deleted sheets are invisible here); rules live in the usecases. */
export function createSheetsRepository({ db }: { db: DbExecutor }) {
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

    async findById(id: string) {
      const [row] = await db
        .select(sheetColumns)
        .from(sheets)
        .innerJoin(users, eq(users.id, sheets.ownerId))
        .where(and(eq(sheets.id, id), isNull(sheets.deletedAt)));
      return row ?? null;
    },

    /** Locks the sheet row until the transaction ends: saves of one sheet happen one at a time. */
    async findByIdForUpdate(id: string) {
      const [row] = await db
        .select(sheetColumns)
        .from(sheets)
        .innerJoin(users, eq(users.id, sheets.ownerId))
        .where(and(eq(sheets.id, id), isNull(sheets.deletedAt)))
        .for('update', { of: sheets });
      return row ?? null;
    },

    async listByOwner(ownerId: string) {
      return db
        .select(sheetColumns)
        .from(sheets)
        .innerJoin(users, eq(users.id, sheets.ownerId))
        .where(and(eq(sheets.ownerId, ownerId), isNull(sheets.deletedAt)))
        .orderBy(desc(sheets.updatedAt), sheets.id);
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

    async softDelete(id: string, at: Date) {
      await db.update(sheets).set({ deletedAt: at }).where(eq(sheets.id, id));
    },

    async insertVersion(version: Omit<SheetVersionRow, 'createdAt'> & { createdAt?: Date }) {
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
          engineVersion: sheetVersions.engineVersion,
        })
        .from(sheetVersions)
        .innerJoin(users, eq(users.id, sheetVersions.authorId))
        .where(and(eq(sheetVersions.sheetId, sheetId), eq(sheetVersions.number, number)));
      return row ?? null;
    },
  };
}

export type SheetsRepository = ReturnType<typeof createSheetsRepository>;
export type SheetRecord = NonNullable<Awaited<ReturnType<SheetsRepository['findById']>>>;
export type VersionRecord = NonNullable<Awaited<ReturnType<SheetsRepository['findVersion']>>>;
