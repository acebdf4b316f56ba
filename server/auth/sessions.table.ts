import { index, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { users } from '../users/users.table';

/**
 * Lucia's session table (the columns its Drizzle adapter expects). `id` is the SHA-256 of the
 * token in the cookie, never the token; `created_at` bounds a session's whole life.
 */
export const sessions = pgTable(
  'sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  },
  (table) => [index('sessions_user_id_idx').on(table.userId)],
);
