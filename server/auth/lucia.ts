import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia } from 'lucia';
import type { Db } from '../db/client';
import type { UserRow } from '../users/users.table';
import { users } from '../users/users.table';
import { sessions } from './sessions.table';

export const SESSION_COOKIE_NAME = 'meander_session';

/** Sessions in PostgreSQL; the cookie is httpOnly and SameSite=Lax (lucia's defaults), Secure when asked. */
export function createLucia({ db, secureCookies }: { db: Db; secureCookies: boolean }) {
  const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);
  return new Lucia(adapter, {
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
  }
}
