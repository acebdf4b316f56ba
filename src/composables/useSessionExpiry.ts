import { onScopeDispose } from 'vue';
import { useRoute, useRouter } from 'vue-router';
import { useMessage } from 'naive-ui';
import { onUnauthorized } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { useSheetsStore } from '@/stores/sheets';

/**
 * When a request answers 401 while someone is signed in, their session ended elsewhere (expired,
 * signed out in another tab): say so and send them to sign in, coming back here afterwards.
 * Unsaved sheet edits survive in the sheet page's local draft.
 */
export function useSessionExpiry(): void {
  const session = useSessionStore();
  const sheets = useSheetsStore();
  const router = useRouter();
  const route = useRoute();
  const message = useMessage();

  onUnauthorized(() => {
    if (!session.me) return;
    session.clear();
    sheets.reset();
    message.warning('Your session has ended. Sign in again to continue.');
    void router.push({ name: 'sign-in', query: { redirect: route.fullPath } });
  });
  onScopeDispose(() => onUnauthorized(null));
}
