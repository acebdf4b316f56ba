import { createHash } from 'node:crypto';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { and, eq, sql } from 'drizzle-orm';
import { type Adapter, type DatabaseSession, Lucia, TimeSpan } from 'lucia';
import type { Db } from '../db/client';
import type { UserRow } from '../users/users.table';
import { users } from '../users/users.table';
import { sessions } from './sessions.table';

export const SESSION_COOKIE_NAME = 'meander_session';

/**
 * Idle expiry: a session unused for this long ends. Lucia renews a session used in the second
 * half of this span for the full span again, so a session in use lives on, up to the absolute
 * lifetime.
 */
export const SESSION_IDLE_LIFETIME_DAYS = 14;
/** Absolute expiry: a session ends this long after sign-in, however much it is used. */
export const SESSION_ABSOLUTE_LIFETIME_MS = 30 * 24 * 60 * 60 * 1000;

/** The stored id of a session: SHA-256 of the cookie's token, so a read of the table opens no session. */
export function hashSessionToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/**
 * Lucia's Drizzle adapter with every session id hashed on the way in, and sessions past their
 * absolute lifetime reported as expired (lucia then deletes them).
 */
function hashingAdapter(db: Db): Adapter {
  const inner = new DrizzlePostgreSQLAdapter(db, sessions, users);
  const absoluteEnd = (session: DatabaseSession) => {
    const createdAt = session.attributes.createdAt;
    return createdAt instanceof Date ? createdAt.getTime() + SESSION_ABSOLUTE_LIFETIME_MS : 0;
  };
  return {
    async getSessionAndUser(token) {
      const [session, user] = await inner.getSessionAndUser(hashSessionToken(token));
      if (!session || !user) return [null, null];
      const expiresAt = new Date(Math.min(session.expiresAt.getTime(), absoluteEnd(session)));
      return [{ ...session, id: token, expiresAt }, user];
    },
    getUserSessions: (userId) => inner.getUserSessions(userId),
    setSession: (session) => inner.setSession({ ...session, id: hashSessionToken(session.id) }),
    async updateSessionExpiration(token, expiresAt) {
      // Renewal never reaches past the absolute end.
      await db
        .update(sessions)
        .set({
          expiresAt: sql`least(${expiresAt}, ${sessions.createdAt} + make_interval(secs => ${SESSION_ABSOLUTE_LIFETIME_MS / 1000}))`,
        })
        .where(and(eq(sessions.id, hashSessionToken(token))));
    },
    deleteSession: (token) => inner.deleteSession(hashSessionToken(token)),
    deleteUserSessions: (userId) => inner.deleteUserSessions(userId),
    deleteExpiredSessions: () => inner.deleteExpiredSessions(),
  };
}

/** Sessions in PostgreSQL; the cookie is httpOnly and SameSite=Lax (lucia's defaults), Secure when asked. */
export function createLucia({ db, secureCookies }: { db: Db; secureCookies: boolean }) {
  return new Lucia(hashingAdapter(db), {
    sessionExpiresIn: new TimeSpan(SESSION_IDLE_LIFETIME_DAYS, 'd'),
    sessionCookie: { name: SESSION_COOKIE_NAME, attributes: { secure: secureCookies, sameSite: 'lax' } },
    // Only what a request needs: never the password hash.
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      role: attributes.role,
    }),
  });
}

export type AuthLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
  interface Register {
    Lucia: AuthLucia;
    DatabaseUserAttributes: Omit<UserRow, 'id'>;
    DatabaseSessionAttributes: { createdAt?: Date };
  }
}
