import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import * as authApi from '@/api/auth';
import type { CurrentUser } from '@/api/auth';
import { errorMessage } from '@/api/http';

/** Who is signed in. Loaded once on start (the router guard waits for it). */
export const useSessionStore = defineStore('session', () => {
  const me = ref<CurrentUser | null>(null);
  const loaded = ref(false);
  /** Set when the session could not be checked (server unreachable), shown on the sign-in page. */
  const loadError = ref<string | null>(null);
  const isSignedIn = computed(() => me.value !== null);
  const isAdmin = computed(() => me.value?.role === 'admin');
  let pending: Promise<void> | null = null;

  async function load(): Promise<void> {
    try {
      me.value = await authApi.fetchCurrentUser();
      loadError.value = null;
    } catch (error) {
      me.value = null;
      loadError.value = errorMessage(error);
    } finally {
      loaded.value = true;
    }
  }

  /** Loads the session the first time it is asked for; later calls reuse that answer. */
  function ensureLoaded(): Promise<void> {
    if (loaded.value) return Promise.resolve();
    pending ??= load().finally(() => {
      pending = null;
    });
    return pending;
  }

  async function signIn(email: string, password: string): Promise<void> {
    me.value = await authApi.signIn({ email, password });
    loaded.value = true;
    loadError.value = null;
  }

  /** Starts a sign-up; resolves with the message to show (the account comes from the mailed link). */
  async function signUp(email: string, name: string, password: string): Promise<string> {
    return authApi.signUp({ email, name, password });
  }

  async function confirmSignUp(token: string): Promise<void> {
    me.value = await authApi.confirmSignUp(token);
    loaded.value = true;
    loadError.value = null;
  }

  async function signOut(): Promise<void> {
    await authApi.signOut();
    me.value = null;
  }

  async function updateName(name: string): Promise<void> {
    const updated = await authApi.updateAccount({ name });
    if (me.value) me.value = updated ?? { ...me.value, name: name.trim() };
  }

  async function changePassword(currentPassword: string, newPassword: string): Promise<void> {
    await authApi.changePassword({ currentPassword, newPassword });
  }

  /** Asks for a reset link by e-mail; the answer is the same whether the address is known or not. */
  async function requestPasswordReset(email: string): Promise<void> {
    await authApi.requestPasswordReset(email);
  }

  async function confirmPasswordReset(token: string, password: string): Promise<void> {
    await authApi.confirmPasswordReset(token, password);
  }

  /** Forgets the user locally (the server already ended the session). */
  function clear(): void {
    me.value = null;
  }

  return {
    me,
    loaded,
    loadError,
    isSignedIn,
    isAdmin,
    load,
    ensureLoaded,
    signIn,
    signUp,
    confirmSignUp,
    signOut,
    updateName,
    changePassword,
    requestPasswordReset,
    confirmPasswordReset,
    clear,
  };
});
