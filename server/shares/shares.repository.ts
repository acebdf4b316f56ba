import { and, asc, eq, inArray } from 'drizzle-orm';
import type { ShareRole } from '@shared/api/rights';
import type { DbExecutor } from '../db/client';
import { sheets } from '../sheets/sheets.table';
import { users } from '../users/users.table';
import { sheetInvitations, sheetShares, type SheetInvitationRow } from './shares.table';

/** Queries on shares and pending invitations; rules live in the usecases. */
export function createSharesRepository({ db }: { db: DbExecutor }) {
  return {
    async listShares(sheetId: string) {
      return db
        .select({ userId: users.id, name: users.name, email: users.email, role: sheetShares.role })
        .from(sheetShares)
        .innerJoin(users, eq(users.id, sheetShares.userId))
        .where(eq(sheetShares.sheetId, sheetId))
        .orderBy(asc(sheetShares.createdAt), users.id);
    },

    async findShare(sheetId: string, userId: string) {
      const [row] = await db
        .select()
        .from(sheetShares)
        .where(and(eq(sheetShares.sheetId, sheetId), eq(sheetShares.userId, userId)));
      return row ?? null;
    },

    /** Gives the role, or changes the role already given. */
    async upsertShare(sheetId: string, userId: string, role: ShareRole) {
      await db
        .insert(sheetShares)
        .values({ sheetId, userId, role })
        .onConflictDoUpdate({ target: [sheetShares.sheetId, sheetShares.userId], set: { role } });
    },

    /** True when there was a share to delete. */
    async deleteShare(sheetId: string, userId: string): Promise<boolean> {
      const deleted = await db
        .delete(sheetShares)
        .where(and(eq(sheetShares.sheetId, sheetId), eq(sheetShares.userId, userId)))
        .returning({ userId: sheetShares.userId });
      return deleted.length > 0;
    },

    /** Users with one of these roles (the owner is not a share: the caller adds them). */
    async listUsersWithRoles(sheetId: string, roles: readonly ShareRole[]) {
      return db
        .select({ id: users.id, name: users.name, email: users.email })
        .from(sheetShares)
        .innerJoin(users, eq(users.id, sheetShares.userId))
        .where(and(eq(sheetShares.sheetId, sheetId), inArray(sheetShares.role, [...roles])));
    },

    async listInvitations(sheetId: string) {
      return db
        .select()
        .from(sheetInvitations)
        .where(eq(sheetInvitations.sheetId, sheetId))
        .orderBy(asc(sheetInvitations.createdAt), sheetInvitations.email);
    },

    /** One pending invitation per sheet and address: inviting again replaces role, token and expiry. */
    async upsertInvitation(invitation: Omit<SheetInvitationRow, 'createdAt'> & { createdAt: Date }) {
      const { sheetId, email, ...changes } = invitation;
      await db
        .insert(sheetInvitations)
        .values(invitation)
        .onConflictDoUpdate({ target: [sheetInvitations.sheetId, sheetInvitations.email], set: changes });
    },

    /** The invitation with its sheet (deleted sheets excluded) and who sent it. */
    async findInvitationByTokenHash(tokenHash: string) {
      const [row] = await db
        .select({
          sheetId: sheetInvitations.sheetId,
          email: sheetInvitations.email,
          role: sheetInvitations.role,
          expiresAt: sheetInvitations.expiresAt,
          sheetTitle: sheets.title,
          sheetOwnerId: sheets.ownerId,
          sheetDeletedAt: sheets.deletedAt,
          invitedByName: users.name,
        })
        .from(sheetInvitations)
        .innerJoin(sheets, eq(sheets.id, sheetInvitations.sheetId))
        .innerJoin(users, eq(users.id, sheetInvitations.invitedBy))
        .where(eq(sheetInvitations.tokenHash, tokenHash))
        .for('update', { of: sheetInvitations });
      return row ?? null;
    },

    /** True when there was an invitation to delete. */
    async deleteInvitation(sheetId: string, email: string): Promise<boolean> {
      const deleted = await db
        .delete(sheetInvitations)
        .where(and(eq(sheetInvitations.sheetId, sheetId), eq(sheetInvitations.email, email)))
        .returning({ email: sheetInvitations.email });
      return deleted.length > 0;
    },
  };
}

export type SharesRepository = ReturnType<typeof createSharesRepository>;
