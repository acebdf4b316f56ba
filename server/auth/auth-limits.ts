import type { DbExecutor } from '../db/client';
import { createRateLimiter, type RateLimit } from './rate-limiter';

const MINUTE = 60 * 1000;

/**
 * How often each auth action may be tried (common practice, no source; OWASP's Authentication
 * Cheat Sheet asks for limits per address and per account without fixing numbers). The
 * per-account sign-in lock is short and its answer says when it ends, so an attacker cannot keep
 * the owner out for long; the per-address-and-account limit does not stop the owner signing in
 * from another address.
 */
export const AUTH_LIMITS = {
  signInPerAddressAndAccount: { limit: 10, windowMs: 15 * MINUTE },
  signInPerAccount: { limit: 30, windowMs: 5 * MINUTE },
  signInPerAddress: { limit: 100, windowMs: 15 * MINUTE },
  signUpPerAddress: { limit: 5, windowMs: 60 * MINUTE },
  resetRequestsPerAddress: { limit: 10, windowMs: 60 * MINUTE },
  resetMailsPerAccount: { limit: 3, windowMs: 60 * MINUTE },
  /** Confirmation or notice mails per address, so sign-up cannot be used to flood a mailbox. */
  signUpMailsPerAddress: { limit: 3, windowMs: 60 * MINUTE },
} satisfies Record<string, RateLimit>;

export type AuthLimits = { [Name in keyof typeof AUTH_LIMITS]: RateLimit };

export function createAuthLimiters(db: DbExecutor, overrides: Partial<AuthLimits> = {}) {
  const limits: AuthLimits = { ...AUTH_LIMITS, ...overrides };
  const make = (name: keyof AuthLimits) => createRateLimiter({ db, name, ...limits[name] });
  return {
    signInPerAddressAndAccount: make('signInPerAddressAndAccount'),
    signInPerAccount: make('signInPerAccount'),
    signInPerAddress: make('signInPerAddress'),
    signUpPerAddress: make('signUpPerAddress'),
    resetRequestsPerAddress: make('resetRequestsPerAddress'),
    resetMailsPerAccount: make('resetMailsPerAccount'),
    signUpMailsPerAddress: make('signUpMailsPerAddress'),
  };
}

export type AuthLimiters = ReturnType<typeof createAuthLimiters>;
