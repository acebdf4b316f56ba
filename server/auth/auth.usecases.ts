import { createHash, randomBytes } from 'node:crypto';
import type { User } from 'lucia';
import type {
  ChangePasswordRequest,
  CurrentUser,
  PasswordResetConfirm,
  SignInRequest,
  UpdateAccountRequest,
} from '@shared/api/auth';
import type { Mailer } from '../mail/mailer';
import { passwordResetMail } from '../mail/reset-mail';
import type { UsersRepository } from '../users/users.repository';
import type { UserRow } from '../users/users.table';
import { badCredentials, badResetToken, rateLimited, wrongPassword } from './auth.errors';
import type { AuthLucia } from './lucia';
import type { PasswordResetsRepository } from './password-resets.repository';
import type { PasswordHasher } from './passwords';
import type { AuthLimiters } from './auth-limits';
import type { RateLimitDecision } from './rate-limiter';

export const RESET_TOKEN_LIFETIME_MS = 60 * 60 * 1000;

export interface AuthUsecaseDeps {
  users: UsersRepository;
  resets: PasswordResetsRepository;
  lucia: AuthLucia;
  hasher: PasswordHasher;
  mailer: Mailer;
  limiters: AuthLimiters;
  /** Called with errors of work done after the response (sending the reset mail). */
  report: (error: unknown) => void;
  now?: () => Date;
}

/** A signed-in result: the user as the API shows it and the cookie to set. */
export interface SignedIn {
  user: CurrentUser;
  cookie: string;
}

export function toCurrentUser(user: Pick<UserRow, 'id' | 'email' | 'name' | 'role'> | User): CurrentUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** Refuses with 429 when the decision says so. */
function enforce(decision: RateLimitDecision, action: string): void {
  if (!decision.allowed) throw rateLimited(decision.retryAfterSeconds, action);
}

export function hashResetToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export function createAuthUsecases(deps: AuthUsecaseDeps) {
  const { users, resets, lucia, hasher, mailer, limiters, report } = deps;
  const now = deps.now ?? (() => new Date());

  async function startSession(user: UserRow): Promise<SignedIn> {
    const session = await lucia.createSession(user.id, {});
    return { user: toCurrentUser(user), cookie: lucia.createSessionCookie(session.id).serialize() };
  }

  return {
    /**
     * Three limits, checked in order and each counted only when the ones before allow the
     * attempt: per client address (spraying many accounts), per address and account (guessing
     * one), per account from all addresses together (guessing from many; a short window).
     */
    async signIn(input: SignInRequest, clientAddress: string): Promise<SignedIn> {
      const account = input.email.toLowerCase();
      const pairKey = `${clientAddress}|${account}`;
      enforce(await limiters.signInPerAddress.consume(clientAddress), 'sign-in attempts');
      enforce(await limiters.signInPerAddressAndAccount.consume(pairKey), 'sign-in attempts');
      enforce(await limiters.signInPerAccount.consume(account), 'sign-in attempts for this account');
      const user = await users.findByEmail(input.email);
      const valid = user
        ? await hasher.verify(user.passwordHash, input.password)
        : await hasher.verifyDummy(input.password);
      if (!user || !valid) throw badCredentials();
      await limiters.signInPerAddressAndAccount.reset(pairKey);
      await limiters.signInPerAccount.reset(account);
      return startSession(user);
    },

    async signOut(sessionId: string): Promise<string> {
      await lucia.invalidateSession(sessionId);
      return lucia.createBlankSessionCookie().serialize();
    },

    /**
     * Limited per client address (429); otherwise always answers the same way. The mail goes out
     * after the response, at most a few per account and hour, so neither the answer nor its
     * timing tells whether the account exists.
     */
    async requestPasswordReset(email: string, clientAddress: string, appOrigin: string): Promise<void> {
      enforce(await limiters.resetRequestsPerAddress.consume(clientAddress), 'reset requests');
      const work = async () => {
        const user = await users.findByEmail(email);
        if (!user) return;
        if (!(await limiters.resetMailsPerAccount.consume(user.id)).allowed) return;
        const token = randomBytes(32).toString('base64url');
        await resets.insert({
          tokenHash: hashResetToken(token),
          userId: user.id,
          expiresAt: new Date(now().getTime() + RESET_TOKEN_LIFETIME_MS),
        });
        const link = new URL('/reset-password', appOrigin);
        link.searchParams.set('token', token);
        await mailer.send(passwordResetMail({ to: user.email, name: user.name, link: link.toString() }));
      };
      work().catch(report);
    },

    /** Sets the new password and signs the account out everywhere. */
    async confirmPasswordReset(input: PasswordResetConfirm): Promise<void> {
      const at = now();
      const userId = await resets.consume(hashResetToken(input.token), at);
      if (!userId) throw badResetToken();
      await users.updatePasswordHash(userId, await hasher.hash(input.password));
      await resets.retireAllForUser(userId, at);
      await lucia.invalidateUserSessions(userId);
    },

    async updateAccount(userId: string, input: UpdateAccountRequest): Promise<CurrentUser> {
      const user =
        input.name === undefined ? await users.findById(userId) : await users.updateName(userId, input.name);
      if (!user) throw badCredentials();
      return toCurrentUser(user);
    },

    /** Other sessions end (a changed password should lock out whoever knew the old one); this one is renewed. */
    async changePassword(userId: string, input: ChangePasswordRequest): Promise<SignedIn> {
      const user = await users.findById(userId);
      if (!user) throw badCredentials();
      if (!(await hasher.verify(user.passwordHash, input.currentPassword))) throw wrongPassword();
      await users.updatePasswordHash(userId, await hasher.hash(input.newPassword));
      await lucia.invalidateUserSessions(userId);
      return startSession(user);
    },
  };
}

export type AuthUsecases = ReturnType<typeof createAuthUsecases>;
