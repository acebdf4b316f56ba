import { ref } from 'vue';
import { errorMessage } from '@/api/http';

/**
 * Runs one user action at a time (a form submit, a save) with a busy flag and the server's
 * message on failure, so forms never send twice and never swallow an error.
 */
export function useAsyncAction() {
  const busy = ref(false);
  const error = ref<string | null>(null);

  async function run<T>(
    action: () => Promise<T>,
  ): Promise<{ ok: true; value: T } | { ok: false; error: unknown }> {
    if (busy.value) return { ok: false, error: new Error('busy') };
    busy.value = true;
    error.value = null;
    try {
      return { ok: true, value: await action() };
    } catch (cause) {
      error.value = errorMessage(cause);
      return { ok: false, error: cause };
    } finally {
      busy.value = false;
    }
  }

  return { busy, error, run };
}
