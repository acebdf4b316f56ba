import { describe, expect, it } from 'vitest';
import type { RouteLocationNormalized } from 'vue-router';
import { accessDecision, pageTitle, safeRedirect } from '@/router/guards';
import { linkifyText } from '@/components/common/linkify';
import { asSentence } from '@/composables/useFormValidation';

const route = (
  fullPath: string,
  meta: RouteLocationNormalized['meta'] = {},
  query = {},
): RouteLocationNormalized =>
  ({
    fullPath,
    path: fullPath,
    meta,
    query,
    params: {},
    hash: '',
    name: undefined,
    matched: [],
    redirectedFrom: undefined,
  }) as RouteLocationNormalized;
const member = { id: 'u1', email: 'ravi.marsh@example.test', name: 'Ravi Marsh', role: 'member' as const };
const admin = { ...member, id: 'u2', role: 'admin' as const };

describe('route access', () => {
  it('sends a signed-out person to sign in with the page they asked for', () => {
    expect(accessDecision(route('/sheets/ab1?version=3'), null)).toEqual({
      name: 'sign-in',
      query: { redirect: '/sheets/ab1?version=3' },
    });
  });
  it('lets anyone reach public pages', () => {
    expect(accessDecision(route('/forgot-password', { public: true }), null)).toBe(true);
  });
  it('keeps the development mailbox for the site admin', async () => {
    const { routes } = await import('@/router/routes');
    const mailbox = routes.find((entry) => entry.path === '/mailbox');
    expect(mailbox?.meta).toMatchObject({ requiresAdmin: true });
    expect(mailbox?.meta?.public).toBeUndefined();
    expect(accessDecision(route('/mailbox', mailbox?.meta), null)).toMatchObject({ name: 'sign-in' });
    expect(accessDecision(route('/mailbox', mailbox?.meta), member)).toEqual({ name: 'admins-only' });
  });
  it('sends a member away from admin pages and lets an admin in', () => {
    expect(accessDecision(route('/admin', { requiresAdmin: true }), member)).toEqual({ name: 'admins-only' });
    expect(accessDecision(route('/admin', { requiresAdmin: true }), admin)).toBe(true);
  });
  it('sends a signed-in person on from the sign-in page', () => {
    expect(
      accessDecision(route('/sign-in', { public: true, guestOnly: true }, { redirect: '/account' }), member),
    ).toBe('/account');
  });
  it('follows only same-site paths after sign-in', () => {
    expect(safeRedirect('/sheets/x')).toBe('/sheets/x');
    expect(safeRedirect('//evil.example.test')).toBe('/sheets');
    expect(safeRedirect('/\\evil.example.test')).toBe('/sheets');
    expect(safeRedirect('https://evil.example.test')).toBe('/sheets');
    expect(safeRedirect(undefined)).toBe('/sheets');
  });
  it('titles pages "<page> · Meander"', () => {
    expect(pageTitle('Account')).toBe('Account · Meander');
    expect(pageTitle(undefined)).toBe('Meander');
  });
});

describe('mail text links', () => {
  it('makes http(s) links clickable and leaves sentence punctuation outside them', () => {
    const segments = linkifyText(
      'Choose a new password: http://127.0.0.1:3000/reset-password?token=k3y9. It works once.',
    );
    expect(segments).toEqual([
      { kind: 'text', text: 'Choose a new password: ' },
      {
        kind: 'link',
        href: 'http://127.0.0.1:3000/reset-password?token=k3y9',
        text: 'http://127.0.0.1:3000/reset-password?token=k3y9',
      },
      { kind: 'text', text: '. It works once.' },
    ]);
  });
  it('does not link other schemes', () => {
    expect(linkifyText('javascript:alert(1) and ftp://x')).toEqual([
      { kind: 'text', text: 'javascript:alert(1) and ftp://x' },
    ]);
  });
});

describe('form messages', () => {
  it('turns schema messages into sentences', () => {
    expect(asSentence('a password has at least 10 characters')).toBe(
      'A password has at least 10 characters.',
    );
    expect(asSentence('Enter a title.')).toBe('Enter a title.');
  });
});
