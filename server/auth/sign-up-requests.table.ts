import { index, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/**
 * A sign-up waiting for its address to be confirmed: the account is created only from the link
 * mailed to that address, so the sign-up answer never has to say whether the address was free.
 * Only the SHA-256 of the token is kept; the password is kept as its argon2id hash.
 */
export const signUpRequests = pgTable(
  'sign_up_requests',
  {
    tokenHash: text('token_hash').primaryKey(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('sign_up_requests_email_idx').on(table.email)],
);
