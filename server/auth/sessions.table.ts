import { index, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { users } from '../users/users.table';

/** Lucia's session table (the columns its Drizzle adapter expects). */
export const sessions = pgTable(
  'sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  },
  (table) => [index('sessions_user_id_idx').on(table.userId)],
);
