import { randomBytes } from 'node:crypto';
import { generateIdFromEntropySize } from 'lucia';
import type { SignUpConfirm, SignUpRequest } from '@shared/api/auth';
import { isUniqueViolation } from '../db/client';
import type { Mailer } from '../mail/mailer';
import { alreadyRegisteredMail, confirmSignUpMail } from '../mail/sign-up-mail';
import type { UsersRepository } from '../users/users.repository';
import { badSignUpToken, rateLimited } from './auth.errors';
import type { AuthLimiters } from './auth-limits';
import { hashResetToken, type SignedIn, toCurrentUser } from './auth.usecases';
import type { AuthLucia } from './lucia';
import type { PasswordHasher } from './passwords';
import type { SignUpRequestsRepository } from './sign-up-requests.repository';

export const SIGN_UP_TOKEN_LIFETIME_MS = 24 * 60 * 60 * 1000;

export const SIGN_UP_ACCEPTED =
  'Check your mail: we sent a link to finish signing up. It works once, within a day.';

export interface SignUpUsecaseDeps {
  users: UsersRepository;
  requests: SignUpRequestsRepository;
  lucia: AuthLucia;
  hasher: PasswordHasher;
  mailer: Mailer;
  limiters: AuthLimiters;
  /** Errors of the work done after the answer (the mail). */
  report: (error: unknown) => void;
  now?: () => Date;
}

/**
 * Sign-up in two steps, so the answer never tells whether an address is registered (OWASP's
 * Authentication Cheat Sheet, account enumeration): every request gets the same 202, and the
 * mail decides. A free address gets a link that creates the account; a registered one gets a
 * notice to its owner, and nothing changes.
 */
export function createSignUpUsecases(deps: SignUpUsecaseDeps) {
  const { users, requests, lucia, hasher, mailer, limiters, report } = deps;
  const now = deps.now ?? (() => new Date());

  return {
    async request(input: SignUpRequest, clientAddress: string, appOrigin: string): Promise<string> {
      const decision = await limiters.signUpPerAddress.consume(clientAddress);
      if (!decision.allowed) throw rateLimited(decision.retryAfterSeconds, 'sign-up attempts');
      // Hashed whatever the address, so both answers take the same time.
      const passwordHash = await hasher.hash(input.password);
      const work = async () => {
        const email = input.email.toLowerCase();
        if (!(await limiters.signUpMailsPerAddress.consume(email)).allowed) return;
        const existing = await users.findByEmail(email);
        if (existing) {
          await mailer.send(
            alreadyRegisteredMail({ to: existing.email, name: existing.name, origin: appOrigin }),
          );
          return;
        }
        const token = randomBytes(32).toString('base64url');
        await requests.insert({
          tokenHash: hashResetToken(token),
          email,
          name: input.name,
          passwordHash,
          expiresAt: new Date(now().getTime() + SIGN_UP_TOKEN_LIFETIME_MS),
        });
        const link = new URL('/confirm-sign-up', appOrigin);
        link.searchParams.set('token', token);
        await mailer.send(confirmSignUpMail({ to: email, name: input.name, link: link.toString() }));
      };
      work().catch(report);
      return SIGN_UP_ACCEPTED;
    },

    /** Creates the account from a live link and signs it in. */
    async confirm(input: SignUpConfirm): Promise<SignedIn> {
      const pending = await requests.consume(hashResetToken(input.token), now());
      if (!pending) throw badSignUpToken();
      const user = await users
        .insert({
          id: generateIdFromEntropySize(10),
          email: pending.email,
          name: pending.name,
          passwordHash: pending.passwordHash,
          role: 'member',
        })
        .catch((error: unknown) => {
          // Registered meanwhile (two links for one address): that link is spent.
          throw isUniqueViolation(error) ? badSignUpToken() : error;
        });
      const session = await lucia.createSession(user.id, {});
      return { user: toCurrentUser(user), cookie: lucia.createSessionCookie(session.id).serialize() };
    },
  };
}

export type SignUpUsecases = ReturnType<typeof createSignUpUsecases>;
