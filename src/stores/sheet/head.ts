import { ref } from 'vue';
import { getHead } from '@/api/sheets';
import type { SheetDocumentState } from './document';

/** How often an open sheet asks whether someone saved a newer version (a 304 costs next to nothing). */
export const HEAD_POLL_MS = 20_000;

export interface NewerVersion {
  version: number;
  title: string;
  updatedAt: Date;
}

/**
 * "Someone saved while you edit": the page polls GET /api/sheets/:id/head with If-None-Match and
 * says so as soon as a version newer than the one the edits started from exists, before the
 * person tries to save (a save on a stale base still gets the 409 choice). The timer is stopped
 * by `stopHeadPolling`, which the page calls when it unmounts or leaves the sheet.
 */
export function useSheetHead(state: SheetDocumentState) {
  const newerVersion = ref<NewerVersion | null>(null);
  let timer: ReturnType<typeof setInterval> | null = null;
  let etag: string | null = null;
  let polledSheet: string | null = null;

  async function checkHead(): Promise<void> {
    const id = state.sheetId.value;
    if (!id || id !== polledSheet) return;
    try {
      const answer = await getHead(id, etag);
      if (!answer || state.sheetId.value !== id) return;
      etag = answer.etag;
      const known = Math.max(state.baseVersion.value, state.latestVersion.value);
      newerVersion.value = answer.head.version > known ? answer.head : null;
    } catch {
      // A missed poll is not worth a message: the next one tries again, and saving still checks.
    }
  }

  function startHeadPolling(): void {
    stopHeadPolling();
    polledSheet = state.sheetId.value;
    etag = null;
    newerVersion.value = null;
    timer = setInterval(() => void checkHead(), HEAD_POLL_MS);
  }

  function stopHeadPolling(): void {
    if (timer !== null) clearInterval(timer);
    timer = null;
    polledSheet = null;
  }

  function dismissNewerVersion(): void {
    newerVersion.value = null;
  }

  return { newerVersion, checkHead, startHeadPolling, stopHeadPolling, dismissNewerVersion };
}
