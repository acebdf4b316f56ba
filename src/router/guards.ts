import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import type { CurrentUser } from '@/api/auth';

/** Only same-site paths are followed after sign-in, so a crafted link cannot send people away. */
export function safeRedirect(value: unknown, fallback = '/sheets'): string {
  if (typeof value !== 'string') return fallback;
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return fallback;
  return value;
}

/**
 * Where a person may go: `true` to let them in, else where to send them instead. Signed-out
 * people go to sign-in with the page they wanted in `redirect`; members asking for an admin page
 * go to the "admins only" page.
 */
export function accessDecision(
  to: RouteLocationNormalized,
  user: CurrentUser | null,
): true | RouteLocationRaw {
  if (to.meta.guestOnly && user) return safeRedirect(to.query.redirect);
  if (to.meta.public) return true;
  if (!user) return { name: 'sign-in', query: { redirect: to.fullPath } };
  if (to.meta.requiresAdmin && user.role !== 'admin') return { name: 'admins-only' };
  return true;
}

export function pageTitle(title: string | undefined): string {
  return title ? `${title} · Meander` : 'Meander';
}
