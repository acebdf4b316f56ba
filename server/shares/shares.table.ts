import { index, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
import { SHARE_ROLES } from '@shared/api/rights';
import { sheets } from '../sheets/sheets.table';
import { users } from '../users/users.table';

/** Roles an owner gives; the owner is `sheets.owner_id`, never a share. */
export const shareRole = pgEnum('share_role', SHARE_ROLES);

export const sheetShares = pgTable(
  'sheet_shares',
  {
    sheetId: text('sheet_id')
      .notNull()
      .references(() => sheets.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: shareRole('role').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    primaryKey({ name: 'sheet_shares_sheet_user_pk', columns: [table.sheetId, table.userId] }),
    index('sheet_shares_user_idx').on(table.userId),
  ],
);

/** A pending invitation of an address with no account yet; deleted when accepted. */
export const sheetInvitations = pgTable(
  'sheet_invitations',
  {
    sheetId: text('sheet_id')
      .notNull()
      .references(() => sheets.id, { onDelete: 'cascade' }),
    /** Lower-cased. One pending invitation per sheet and address. */
    email: text('email').notNull(),
    role: shareRole('role').notNull(),
    /** SHA-256 of the random token in the mailed link; the token itself is never stored. */
    tokenHash: text('token_hash').notNull(),
    invitedBy: text('invited_by')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    primaryKey({ name: 'sheet_invitations_sheet_email_pk', columns: [table.sheetId, table.email] }),
    uniqueIndex('sheet_invitations_token_unique').on(table.tokenHash),
  ],
);

export type SheetShareRow = typeof sheetShares.$inferSelect;
export type SheetInvitationRow = typeof sheetInvitations.$inferSelect;
