import { defineStore } from 'pinia';
import { ref } from 'vue';
import * as sharesApi from '@/api/shares';
import type { InvitationPreview } from '@/api/shares';
import { errorMessage } from '@/api/http';

/** The invitation page: what a link offers (no session needed), and accepting it once signed in. */
export const useInvitationStore = defineStore('invitation', () => {
  const preview = ref<InvitationPreview | null>(null);
  const loading = ref(false);
  const accepting = ref(false);
  const error = ref<string | null>(null);

  async function loadPreview(token: string): Promise<void> {
    loading.value = true;
    error.value = null;
    preview.value = null;
    try {
      preview.value = await sharesApi.previewInvitation(token);
    } catch (cause) {
      error.value = errorMessage(cause);
    } finally {
      loading.value = false;
    }
  }

  /** Returns the sheet's id to open, or null (the reason is in `error`). */
  async function accept(token: string): Promise<string | null> {
    accepting.value = true;
    error.value = null;
    try {
      return (await sharesApi.acceptInvitation(token)).sheetId;
    } catch (cause) {
      error.value = errorMessage(cause);
      return null;
    } finally {
      accepting.value = false;
    }
  }

  return { preview, loading, accepting, error, loadPreview, accept };
});
