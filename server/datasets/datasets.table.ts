import { index, integer, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import type { DatasetColumn, DatasetValue } from '@shared/api/datasets';
import { sheets } from '../sheets/sheets.table';
import { users } from '../users/users.table';

/**
 * An uploaded observed series. Immutable: rows are only ever inserted, so a data cell's id and
 * checksum always name exactly the data a version was made with. The parsed table is kept for
 * runs and charts, the file as uploaded for GET /api/datasets/:id/csv.
 */
export const datasets = pgTable(
  'datasets',
  {
    id: text('id').primaryKey(),
    sheetId: text('sheet_id')
      .notNull()
      .references(() => sheets.id, { onDelete: 'cascade' }),
    /** Null once the uploader's account is deleted; the data stays for the sheet and its forks. */
    uploaderId: text('uploader_id').references(() => users.id, { onDelete: 'set null' }),
    name: text('name').notNull(),
    originalName: text('original_name').notNull(),
    columns: jsonb('columns').$type<DatasetColumn[]>().notNull(),
    rows: jsonb('rows').$type<DatasetValue[][]>().notNull(),
    rowCount: integer('row_count').notNull(),
    /** SHA-256 of the uploaded bytes, hex. */
    checksum: text('checksum').notNull(),
    /** The file as uploaded (UTF-8 text; other encodings are refused). */
    content: text('content').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('datasets_sheet_idx').on(table.sheetId)],
);

export type DatasetRow = typeof datasets.$inferSelect;
