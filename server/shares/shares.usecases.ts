import { createHash, randomBytes } from 'node:crypto';
import { mayDo, SHARE_ROLES, type ShareRole } from '@shared/api/rights';
import type {
  AcceptedInvitation,
  ChangeShareRequest,
  InvitationPreview,
  SheetPerson,
  ShareList,
  ShareRequest,
  ShareResult,
} from '@shared/api/shares';
import type { Transact } from '../db/transact';
import type { OutgoingMail } from '../mail/mailer';
import { invitationMail, shareNoticeMail } from '../mail/sheet-mail';
import { invitationLink, type Notify, sheetLink } from '../sheets/notify';
import { requireRight, type SheetActor } from '../sheets/sheet-rights';
import type { SheetRepositories } from '../sheets/sheets.usecases';
import {
  badInvitation,
  cannotShareWithOwner,
  expiredInvitation,
  invitationNotFound,
  personNotFound,
  transferNeedsEditor,
  wrongAccount,
} from './shares.errors';

export const INVITATION_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;

export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export interface SharesUsecaseDeps {
  repositories: SheetRepositories;
  transact: Transact<SheetRepositories>;
  notify: Notify;
  now?: () => Date;
}

/** Sharing a sheet with people, inviting addresses by mail, transferring ownership. */
export function createSharesUsecases({
  repositories,
  transact,
  notify,
  now = () => new Date(),
}: SharesUsecaseDeps) {
  const { sheets, shares, users } = repositories;

  return {
    /** The owner, then the people the sheet is shared with; invitations for those who may share. */
    async listShares(user: SheetActor, sheetId: string): Promise<ShareList> {
      const { sheet, role } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'read');
      const owner = await users.findById(sheet.ownerId);
      const people: SheetPerson[] = [
        ...(owner
          ? [{ userId: owner.id, name: owner.name, email: owner.email, role: 'owner' as const }]
          : []),
        ...(await shares.listShares(sheet.id)),
      ];
      const invitations = mayDo(role, 'share')
        ? (await shares.listInvitations(sheet.id)).map((row) => ({
            email: row.email,
            role: row.role,
            expiresAt: row.expiresAt.toISOString(),
          }))
        : [];
      return { people, invitations };
    },

    /**
     * A registered address gets the role at once and a notice; another address gets an
     * invitation by mail (a random token, stored hashed, single use, 7 days). Inviting an
     * address again replaces its pending invitation.
     */
    async share(
      user: SheetActor,
      sheetId: string,
      input: ShareRequest,
      origin: string,
    ): Promise<ShareResult> {
      const { result, mail } = await transact(async (tx) => {
        const { sheet } = requireRight(await tx.sheets.findForUserForUpdate(sheetId, user.id), user, 'share');
        const sharer = await tx.users.findById(user.id);
        const invitee = await tx.users.findByEmail(input.email);
        if (invitee?.id === sheet.ownerId) throw cannotShareWithOwner();
        if (invitee) {
          await tx.shares.upsertShare(sheet.id, invitee.id, input.role);
          await tx.shares.deleteInvitation(sheet.id, input.email);
          const person = { userId: invitee.id, name: invitee.name, email: invitee.email, role: input.role };
          const notice = shareNoticeMail({
            to: invitee.email,
            name: invitee.name,
            sharedBy: sharer?.name ?? 'Someone',
            sheetTitle: sheet.title,
            role: input.role,
            link: sheetLink(origin, sheet.id),
          });
          return { result: { kind: 'shared' as const, person }, mail: notice };
        }
        const token = randomBytes(32).toString('base64url');
        const expiresAt = new Date(now().getTime() + INVITATION_LIFETIME_MS);
        await tx.shares.upsertInvitation({
          sheetId: sheet.id,
          email: input.email,
          role: input.role,
          tokenHash: hashInvitationToken(token),
          invitedBy: user.id,
          expiresAt,
          createdAt: now(),
        });
        const invitation: OutgoingMail = invitationMail({
          to: input.email,
          invitedBy: sharer?.name ?? 'Someone',
          sheetTitle: sheet.title,
          role: input.role,
          link: invitationLink(origin, token),
          expiresAt,
        });
        return {
          result: {
            kind: 'invited' as const,
            invitation: { email: input.email, role: input.role, expiresAt: expiresAt.toISOString() },
          },
          mail: invitation,
        };
      });
      notify([mail]);
      return result;
    },

    async changeRole(user: SheetActor, sheetId: string, targetId: string, input: ChangeShareRequest) {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'share');
      if (!(await shares.findShare(sheet.id, targetId))) throw personNotFound();
      await shares.upsertShare(sheet.id, targetId, input.role);
      return { userId: targetId, role: input.role };
    },

    /** Takes effect on the target's next request: every request reads the role afresh. */
    async revoke(user: SheetActor, sheetId: string, targetId: string): Promise<void> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'share');
      if (!(await shares.deleteShare(sheet.id, targetId))) throw personNotFound();
    },

    async cancelInvitation(user: SheetActor, sheetId: string, email: string): Promise<void> {
      const { sheet } = requireRight(await sheets.findForUser(sheetId, user.id), user, 'share');
      if (!(await shares.deleteInvitation(sheet.id, email))) throw invitationNotFound();
    },

    /** Ownership goes to an editor; the old owner stays on as an editor. */
    async transferOwnership(user: SheetActor, sheetId: string, targetId: string) {
      return transact(async (tx) => {
        const { sheet } = requireRight(
          await tx.sheets.findForUserForUpdate(sheetId, user.id),
          user,
          'transfer',
        );
        const target = await tx.shares.findShare(sheet.id, targetId);
        if (!target) throw personNotFound();
        if (target.role !== 'editor') throw transferNeedsEditor();
        await tx.sheets.setOwner(sheet.id, targetId, now());
        await tx.shares.deleteShare(sheet.id, targetId);
        await tx.shares.upsertShare(sheet.id, sheet.ownerId, 'editor');
        return { ownerId: targetId };
      });
    },

    /** What the accept page shows; the token is the only credential. */
    async previewInvitation(token: string): Promise<InvitationPreview> {
      const invitation = await shares.findInvitationByTokenHash(hashInvitationToken(token));
      if (!invitation || invitation.sheetDeletedAt) throw badInvitation();
      if (invitation.expiresAt.getTime() <= now().getTime()) throw expiredInvitation();
      return {
        sheetTitle: invitation.sheetTitle,
        invitedBy: invitation.invitedByName,
        email: invitation.email,
        role: invitation.role,
        expiresAt: invitation.expiresAt.toISOString(),
      };
    },

    /** The signed-in user must hold the invited address; the invitation is then used up. */
    async acceptInvitation(user: SheetActor & { email: string }, token: string): Promise<AcceptedInvitation> {
      return transact(async (tx) => {
        const invitation = await tx.shares.findInvitationByTokenHash(hashInvitationToken(token));
        if (!invitation || invitation.sheetDeletedAt) throw badInvitation();
        if (invitation.expiresAt.getTime() <= now().getTime()) throw expiredInvitation();
        if (invitation.email !== user.email.toLowerCase()) throw wrongAccount(invitation.email);
        await tx.shares.deleteInvitation(invitation.sheetId, invitation.email);
        if (invitation.sheetOwnerId === user.id) return { sheetId: invitation.sheetId, role: 'owner' };
        const existing = await tx.shares.findShare(invitation.sheetId, user.id);
        const role = strongerRole(existing?.role, invitation.role);
        await tx.shares.upsertShare(invitation.sheetId, user.id, role);
        return { sheetId: invitation.sheetId, role };
      });
    },
  };
}

/** Accepting an invitation never lowers a role the person already has. */
function strongerRole(current: ShareRole | undefined, offered: ShareRole): ShareRole {
  return current && SHARE_ROLES.indexOf(current) > SHARE_ROLES.indexOf(offered) ? current : offered;
}

export type SharesUsecases = ReturnType<typeof createSharesUsecases>;
