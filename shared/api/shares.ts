import { z } from 'zod';
import { SHARE_ROLES, SHEET_ROLES } from './rights';

/** Payloads of /api/sheets/:id/shares, /api/sheets/:id/owner and /api/invitations/*. */

export const shareRoleSchema = z.enum(SHARE_ROLES, {
  error: `a role to give is one of ${SHARE_ROLES.join(', ')}`,
});
export const sheetRoleSchema = z.enum(SHEET_ROLES);

export const shareEmailSchema = z
  .email('not an e-mail address')
  .max(254, 'an e-mail address is at most 254 characters')
  .transform((email) => email.toLowerCase());

export const shareRequestSchema = z.object({ email: shareEmailSchema, role: shareRoleSchema });
export type ShareRequest = z.infer<typeof shareRequestSchema>;

export const changeShareRequestSchema = z.object({ role: shareRoleSchema });
export type ChangeShareRequest = z.infer<typeof changeShareRequestSchema>;

export const transferOwnershipRequestSchema = z.object({ userId: z.string().min(1).max(64) });
export type TransferOwnershipRequest = z.infer<typeof transferOwnershipRequestSchema>;

export const sheetPersonSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: sheetRoleSchema,
});
export type SheetPerson = z.infer<typeof sheetPersonSchema>;

export const pendingInvitationSchema = z.object({
  email: z.string(),
  role: shareRoleSchema,
  expiresAt: z.string(),
});
export type PendingInvitation = z.infer<typeof pendingInvitationSchema>;

/** The owner first; pending invitations only for callers who may share. */
export const shareListSchema = z.object({
  people: z.array(sheetPersonSchema),
  invitations: z.array(pendingInvitationSchema),
});
export type ShareList = z.infer<typeof shareListSchema>;

/** What sharing did: a registered address got the role at once; another was invited by mail. */
export const shareResultSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('shared'), person: sheetPersonSchema }),
  z.object({ kind: z.literal('invited'), invitation: pendingInvitationSchema }),
]);
export type ShareResult = z.infer<typeof shareResultSchema>;

/** What the accept page shows before the invited person signs in or up. */
export const invitationPreviewSchema = z.object({
  sheetTitle: z.string(),
  invitedBy: z.string(),
  email: z.string(),
  role: shareRoleSchema,
  expiresAt: z.string(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

export const acceptedInvitationSchema = z.object({ sheetId: z.string(), role: sheetRoleSchema });
export type AcceptedInvitation = z.infer<typeof acceptedInvitationSchema>;

/** Error codes a client may branch on. */
export const SHARE_ERROR_CODES = {
  personNotFound: 'shares.person_not_found',
  invitationNotFound: 'shares.invitation_not_found',
  badInvitation: 'invitations.invalid',
  wrongAccount: 'invitations.wrong_account',
  cannotShareWithOwner: 'shares.owner',
  transferNeedsEditor: 'shares.transfer_needs_editor',
} as const;
