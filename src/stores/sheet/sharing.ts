import { ref } from 'vue';
import type { ShareRole } from '@shared/api/rights';
import * as sharesApi from '@/api/shares';
import type { PendingInvitation, SheetPerson } from '@/api/shares';
import { errorMessage } from '@/api/http';
import type { SheetDocumentState } from './document';

/**
 * The people on the sheet and its pending invitations, for the sharing dialog: invite by e-mail,
 * change a role, revoke, cancel an invitation, transfer ownership. Each action reloads the list,
 * so the dialog always shows what the server holds. Errors are kept as a message to show.
 */
export function useSheetSharing(state: SheetDocumentState, reloadSheet: () => Promise<void>) {
  const people = ref<SheetPerson[]>([]);
  const invitations = ref<PendingInvitation[]>([]);
  const sharesLoading = ref(false);
  const sharingError = ref<string | null>(null);
  /** What the last invitation did, in words ("Invited … by e-mail"). */
  const sharingNotice = ref<string | null>(null);

  async function loadShares(): Promise<void> {
    const id = state.sheetId.value;
    if (!id) return;
    sharesLoading.value = true;
    sharingError.value = null;
    try {
      const answer = await sharesApi.listShares(id);
      people.value = answer.people;
      invitations.value = answer.invitations;
    } catch (error) {
      sharingError.value = errorMessage(error);
    } finally {
      sharesLoading.value = false;
    }
  }

  /** Runs one change, then reloads; false (with the message kept) when the server refused. */
  async function change(action: (sheetId: string) => Promise<void>): Promise<boolean> {
    const id = state.sheetId.value;
    if (!id) return false;
    sharingError.value = null;
    sharingNotice.value = null;
    try {
      await action(id);
      await loadShares();
      return true;
    } catch (error) {
      sharingError.value = errorMessage(error);
      return false;
    }
  }

  const invite = (email: string, role: ShareRole) =>
    change(async (id) => {
      const result = await sharesApi.shareSheet(id, email, role);
      sharingNotice.value =
        result.kind === 'shared'
          ? `${result.person.name} can now open the sheet as ${result.person.role}.`
          : `Invited ${result.invitation.email} by e-mail as ${result.invitation.role}.`;
    });
  const changeRole = (userId: string, role: ShareRole) =>
    change((id) => sharesApi.changeRole(id, userId, role));
  const revoke = (userId: string) => change((id) => sharesApi.revokeShare(id, userId));
  const cancelInvitation = (email: string) => change((id) => sharesApi.cancelInvitation(id, email));

  /** After a transfer the caller is an editor: the sheet is reloaded so the page shows that. */
  async function transferOwnership(userId: string): Promise<boolean> {
    const done = await change((id) => sharesApi.transferOwnership(id, userId));
    if (done) await reloadSheet();
    return done;
  }

  function resetSharing(): void {
    people.value = [];
    invitations.value = [];
    sharingError.value = null;
    sharingNotice.value = null;
  }

  return {
    people,
    invitations,
    sharesLoading,
    sharingError,
    sharingNotice,
    loadShares,
    invite,
    changeRole,
    revoke,
    cancelInvitation,
    transferOwnership,
    resetSharing,
  };
}
