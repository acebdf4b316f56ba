import { defineStore } from 'pinia';
import { ref } from 'vue';
import * as devApi from '@/api/dev';
import type { CapturedMail } from '@/api/dev';
import { errorMessage } from '@/api/http';

/** The development mailbox (site admin only): mail the local fake SMTP server caught (password resets and the like). */
export const useMailboxStore = defineStore('mailbox', () => {
  const messages = ref<CapturedMail[]>([]);
  /** null until asked; false when the server has no mailbox (production). */
  const available = ref<boolean | null>(null);
  const loading = ref(false);
  const error = ref<string | null>(null);

  async function refresh(): Promise<void> {
    loading.value = true;
    try {
      const answer = await devApi.listMailbox();
      available.value = answer !== null;
      messages.value = answer ?? [];
      error.value = null;
    } catch (cause) {
      error.value = errorMessage(cause);
    } finally {
      loading.value = false;
    }
  }

  /** After sign-out: nothing of the last reader's mail stays in memory. */
  function forget(): void {
    messages.value = [];
    available.value = null;
    error.value = null;
  }

  return { messages, available, loading, error, refresh, forget };
});
