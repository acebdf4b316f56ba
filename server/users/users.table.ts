import { sql } from 'drizzle-orm';
import { pgEnum, pgTable, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';

export const siteRole = pgEnum('site_role', ['member', 'admin']);

export const users = pgTable(
  'users',
  {
    /** Random text id (lucia's generateIdFromEntropySize), never a sequence: ids appear in URLs. */
    id: text('id').primaryKey(),
    /** Stored lower-cased; the unique index on lower(email) guards against any write that is not. */
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash').notNull(),
    role: siteRole('role').notNull().default('member'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex('users_email_lower_unique').on(sql`lower(${table.email})`)],
);

export type UserRow = typeof users.$inferSelect;
export type NewUserRow = typeof users.$inferInsert;
