import { and, eq, isNull, or, sql } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { sheetShares } from '../shares/shares.table';
import { sheets } from '../sheets/sheets.table';
import { datasets, type DatasetRow } from './datasets.table';

/** Queries on datasets; rules live in the usecases. */
export function createDatasetsRepository({ db }: { db: DbExecutor }) {
  return {
    async insert(row: Omit<DatasetRow, 'createdAt'>) {
      const [inserted] = await db.insert(datasets).values(row).returning();
      return inserted!;
    },

    async findById(id: string) {
      const [row] = await db.select().from(datasets).where(eq(datasets.id, id));
      return row ?? null;
    },

    /**
     * Whether `userId` can read the dataset's sheet or a fork of it (forks of forks too): a fork
     * keeps reading the data its document points at. Deleted sheets give no access.
     */
    async readableBy(sheetId: string, userId: string): Promise<boolean> {
      const lineage = sql`
        with recursive lineage(id) as (
          select ${sheetId}::text
          union
          select ${sheets.id} from ${sheets} join lineage on ${sheets.forkedFrom} = lineage.id
        )
        select id from lineage`;
      const [row] = await db
        .select({ id: sheets.id })
        .from(sheets)
        .leftJoin(sheetShares, and(eq(sheetShares.sheetId, sheets.id), eq(sheetShares.userId, userId)))
        .where(
          and(
            sql`${sheets.id} in (${lineage})`,
            isNull(sheets.deletedAt),
            or(eq(sheets.ownerId, userId), eq(sheetShares.userId, userId)),
          ),
        )
        .limit(1);
      return row !== undefined;
    },
  };
}

export type DatasetsRepository = ReturnType<typeof createDatasetsRepository>;
