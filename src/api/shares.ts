import {
  acceptedInvitationSchema,
  invitationPreviewSchema,
  shareListSchema,
  shareResultSchema,
  type AcceptedInvitation,
  type InvitationPreview as InvitationPreviewWire,
  type PendingInvitation as PendingInvitationWire,
  type SheetPerson,
  type ShareResult as ShareResultWire,
} from '@shared/api/shares';
import type { ShareRole } from '@shared/api/rights';
import { request, toDate } from './http';
import { parseAnswer } from './parse';

/** Who a sheet is shared with, invitations, ownership. Dates leave here as `Date`s. */

export type { SheetPerson } from '@shared/api/shares';
export type PendingInvitation = Omit<PendingInvitationWire, 'expiresAt'> & { expiresAt: Date };
export type ShareResult =
  Extract<ShareResultWire, { kind: 'shared' }> | { kind: 'invited'; invitation: PendingInvitation };
export type InvitationPreview = Omit<InvitationPreviewWire, 'expiresAt'> & { expiresAt: Date };

const sharesPath = (sheetId: string) => `/api/sheets/${encodeURIComponent(sheetId)}`;
const invitation = (raw: PendingInvitationWire): PendingInvitation => ({
  ...raw,
  expiresAt: toDate(raw.expiresAt),
});

export async function listShares(
  sheetId: string,
): Promise<{ people: SheetPerson[]; invitations: PendingInvitation[] }> {
  const answer = parseAnswer(
    shareListSchema,
    await request(`${sharesPath(sheetId)}/shares`),
    'the people on the sheet',
  );
  return { people: answer.people, invitations: answer.invitations.map(invitation) };
}

/** Gives a registered address the role at once; any other address gets an invitation by mail. */
export async function shareSheet(sheetId: string, email: string, role: ShareRole): Promise<ShareResult> {
  const answer = parseAnswer(
    shareResultSchema,
    await request(`${sharesPath(sheetId)}/shares`, { method: 'POST', body: { email, role } }),
    'the share',
  );
  return answer.kind === 'shared' ? answer : { kind: 'invited', invitation: invitation(answer.invitation) };
}

export async function changeRole(sheetId: string, userId: string, role: ShareRole): Promise<void> {
  await request(`${sharesPath(sheetId)}/shares/${encodeURIComponent(userId)}`, {
    method: 'PATCH',
    body: { role },
  });
}

export async function revokeShare(sheetId: string, userId: string): Promise<void> {
  await request(`${sharesPath(sheetId)}/shares/${encodeURIComponent(userId)}`, { method: 'DELETE' });
}

export async function cancelInvitation(sheetId: string, email: string): Promise<void> {
  await request(`${sharesPath(sheetId)}/invitations/${encodeURIComponent(email)}`, { method: 'DELETE' });
}

/** Makes an editor the owner; the former owner stays on as an editor. */
export async function transferOwnership(sheetId: string, userId: string): Promise<void> {
  await request(`${sharesPath(sheetId)}/owner`, { method: 'POST', body: { userId } });
}

const invitationPath = (token: string) => `/api/invitations/${encodeURIComponent(token)}`;

/** What an invitation offers; needs no session. */
export async function previewInvitation(token: string): Promise<InvitationPreview> {
  const answer = parseAnswer(invitationPreviewSchema, await request(invitationPath(token)), 'the invitation');
  return { ...answer, expiresAt: toDate(answer.expiresAt) };
}

export async function acceptInvitation(token: string): Promise<AcceptedInvitation> {
  return parseAnswer(
    acceptedInvitationSchema,
    await request(`${invitationPath(token)}/accept`, { method: 'POST' }),
    'the accepted invitation',
  );
}
