import { index, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { users } from '../users/users.table';

/** One row per reset mail. Only the SHA-256 of the token is kept, so a leaked table opens nothing. */
export const passwordResets = pgTable(
  'password_resets',
  {
    tokenHash: text('token_hash').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('password_resets_user_id_idx').on(table.userId)],
);

export type PasswordResetRow = typeof passwordResets.$inferSelect;
