import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import { ApiError } from '@/api/http';
import * as authApi from '@/api/auth';
import { buttonByText, click, fillByLabel, mountAt } from './harness';

vi.mock('@/api/auth', () => ({
  fetchCurrentUser: vi.fn(),
  signIn: vi.fn(),
  signUp: vi.fn(),
  confirmSignUp: vi.fn(),
  signOut: vi.fn(),
  requestPasswordReset: vi.fn(),
  confirmPasswordReset: vi.fn(),
  updateAccount: vi.fn(),
  changePassword: vi.fn(),
}));
vi.mock('@/api/sheets', () => ({ listSheets: vi.fn(async () => []) }));

const api = vi.mocked(authApi);
const member = { id: 'u1', email: 'lena.brook@example.test', name: 'Lena Brook', role: 'member' as const };
let wrapper: VueWrapper | undefined;

beforeEach(() => {
  vi.clearAllMocks();
  api.fetchCurrentUser.mockResolvedValue(null);
});
afterEach(() => {
  wrapper?.unmount();
  document.body.innerHTML = '';
});

describe('sign-in page', () => {
  it('sends a signed-out visitor of /sheets to sign in, keeping where they wanted to go', async () => {
    const mounted = await mountAt('/sheets');
    wrapper = mounted.wrapper;
    expect(mounted.router.currentRoute.value.name).toBe('sign-in');
    expect(mounted.router.currentRoute.value.query.redirect).toBe('/sheets');
  });

  it('refuses a password shorter than 10 characters on sign-up without calling the server', async () => {
    ({ wrapper } = await mountAt('/sign-in'));
    await click(document.querySelector<HTMLElement>('[role="tab"]#auth-tab-sign-up')!);
    await fillByLabel('Email', 'lena.brook@example.test');
    await fillByLabel('Display name', 'Lena Brook');
    await fillByLabel('Password', 'short-pw'); // 8 characters
    await click(buttonByText('Sign up'));
    expect(document.body.textContent).toContain('A password has at least 10 characters.');
    expect(api.signUp).not.toHaveBeenCalled();
  });

  it('after a sign-up, says to open the mailed link and stays signed out', async () => {
    api.signUp.mockResolvedValue('Check your mail: we sent a link to finish signing up.');
    const mounted = await mountAt('/sign-up');
    wrapper = mounted.wrapper;
    await fillByLabel('Email', 'lena.brook@example.test');
    await fillByLabel('Display name', 'Lena Brook');
    await fillByLabel('Password', 'a-long-enough-password');
    await click(buttonByText('Sign up'));
    expect(api.signUp).toHaveBeenCalledWith({
      email: 'lena.brook@example.test',
      name: 'Lena Brook',
      password: 'a-long-enough-password',
    });
    await vi.waitFor(() => expect(document.body.textContent).toContain('Check your mail'));
    expect(mounted.router.currentRoute.value.name).toBe('sign-up');
  });

  it('finishes a sign-up from the mailed link: signs in and opens the sheets', async () => {
    api.confirmSignUp.mockResolvedValue(member);
    const mounted = await mountAt('/confirm-sign-up?token=mailed-token');
    wrapper = mounted.wrapper;
    await vi.waitFor(() => expect(mounted.router.currentRoute.value.name).toBe('sheets'), {
      timeout: 10_000,
    });
    expect(api.confirmSignUp).toHaveBeenCalledWith('mailed-token');
  });

  it('shows the server refusal of a sign-in and stays on the page', async () => {
    api.signIn.mockRejectedValue(
      new ApiError({
        status: 401,
        code: 'auth.bad_credentials',
        message: 'That e-mail and password do not match an account.',
      }),
    );
    const mounted = await mountAt('/sign-in');
    wrapper = mounted.wrapper;
    await fillByLabel('Email', 'lena.brook@example.test');
    await fillByLabel('Password', 'not-the-password');
    await click(buttonByText('Sign in'));
    expect(api.signIn).toHaveBeenCalledWith({
      email: 'lena.brook@example.test',
      password: 'not-the-password',
    });
    expect(document.querySelector('[role="alert"]')?.textContent).toContain(
      'That e-mail and password do not match an account.',
    );
    expect(mounted.router.currentRoute.value.name).toBe('sign-in');
  });

  it('signs in and goes on to the page in ?redirect', async () => {
    api.signIn.mockResolvedValue(member);
    const mounted = await mountAt('/sign-in?redirect=/account');
    wrapper = mounted.wrapper;
    await fillByLabel('Email', 'Lena.Brook@Example.test');
    await fillByLabel('Password', 'a-long-enough-password');
    await click(buttonByText('Sign in'));
    // The shared schema lower-cases the address before it is sent.
    expect(api.signIn).toHaveBeenCalledWith({
      email: 'lena.brook@example.test',
      password: 'a-long-enough-password',
    });
    await vi.waitFor(() => expect(mounted.router.currentRoute.value.fullPath).toBe('/account'), {
      timeout: 10_000,
    });
  });

  it('does not follow a redirect that leaves the site', async () => {
    api.signIn.mockResolvedValue(member);
    const mounted = await mountAt('/sign-in?redirect=//elsewhere.example.test/x');
    wrapper = mounted.wrapper;
    await fillByLabel('Email', 'lena.brook@example.test');
    await fillByLabel('Password', 'a-long-enough-password');
    await click(buttonByText('Sign in'));
    await vi.waitFor(() => expect(mounted.router.currentRoute.value.fullPath).toBe('/sheets'), {
      timeout: 10_000,
    });
  });
});
