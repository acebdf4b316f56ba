import {
  currentUserSchema,
  signUpAcceptedSchema,
  type ChangePasswordRequest,
  type CurrentUser,
  type SignInRequest,
  type SignUpRequest,
} from '@shared/api/auth';
import { ApiError, request } from './http';
import { parseAnswer } from './parse';

/** Accounts: sign-up, sign-in, the current user, password resets and account settings. */

export type { CurrentUser, SiteRole } from '@shared/api/auth';

/** The signed-in user, or null when there is no session (401). */
export async function fetchCurrentUser(): Promise<CurrentUser | null> {
  try {
    return parseAnswer(currentUserSchema, await request('/api/auth/me'), 'the signed-in user');
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null;
    throw error;
  }
}

/** Starts a sign-up; the answer is the same whether or not the address has an account: a message. */
export async function signUp(body: SignUpRequest): Promise<string> {
  return parseAnswer(
    signUpAcceptedSchema,
    await request('/api/auth/sign-up', { method: 'POST', body }),
    'sign-up',
  ).message;
}

/** Creates the account from the mailed link's token and signs it in. */
export async function confirmSignUp(token: string): Promise<CurrentUser> {
  return parseAnswer(
    currentUserSchema,
    await request('/api/auth/sign-up/confirm', { method: 'POST', body: { token } }),
    'sign-up confirmation',
  );
}

export async function signIn(body: SignInRequest): Promise<CurrentUser> {
  return parseAnswer(
    currentUserSchema,
    await request('/api/auth/sign-in', { method: 'POST', body }),
    'sign-in',
  );
}

export async function signOut(): Promise<void> {
  await request('/api/auth/sign-out', { method: 'POST' });
}

/** Always succeeds for a well-formed address: the server never says whether the account exists. */
export async function requestPasswordReset(email: string): Promise<void> {
  await request('/api/auth/password-reset', { method: 'POST', body: { email } });
}

export async function confirmPasswordReset(token: string, password: string): Promise<void> {
  await request('/api/auth/password-reset/confirm', { method: 'POST', body: { token, password } });
}

/** Changes the display name; answers the updated user when the server sends it. */
export async function updateAccount(body: { name: string }): Promise<CurrentUser | null> {
  const raw = await request<unknown>('/api/account', { method: 'PATCH', body });
  const parsed = currentUserSchema.safeParse(raw);
  return parsed.success ? parsed.data : null;
}

export async function changePassword(body: ChangePasswordRequest): Promise<void> {
  await request('/api/account/password', { method: 'POST', body });
}
