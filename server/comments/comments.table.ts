import { type AnyPgColumn, boolean, index, integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { sheets } from '../sheets/sheets.table';
import { users } from '../users/users.table';

/**
 * A comment on a cell of a sheet, written on a version. A comment with a parent is a reply; replies
 * have no replies of their own, so a thread is one level deep. Comments outlive their cell: a
 * cell deleted in a later version keeps its threads readable.
 */
export const comments = pgTable(
  'comments',
  {
    id: text('id').primaryKey(),
    sheetId: text('sheet_id')
      .notNull()
      .references(() => sheets.id, { onDelete: 'cascade' }),
    cellId: text('cell_id').notNull(),
    versionNumber: integer('version_number').notNull(),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    parentId: text('parent_id').references((): AnyPgColumn => comments.id, { onDelete: 'cascade' }),
    /** Markdown source; the client renders it (markdown-it, then DOMPurify). */
    body: text('body').notNull(),
    /** Meaningful on a thread's first comment. */
    resolved: boolean('resolved').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    editedAt: timestamp('edited_at', { withTimezone: true }),
  },
  (table) => [
    index('comments_sheet_created_idx').on(table.sheetId, table.createdAt),
    index('comments_parent_idx').on(table.parentId),
  ],
);

export type CommentRow = typeof comments.$inferSelect;
