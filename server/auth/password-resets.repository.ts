import { and, eq, gt, isNull } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { passwordResets } from './password-resets.table';

export function createPasswordResetsRepository({ db }: { db: DbExecutor }) {
  return {
    async insert(reset: { tokenHash: string; userId: string; expiresAt: Date }) {
      await db.insert(passwordResets).values(reset);
    },

    /**
     * Marks a live token used and returns its user, in one statement: two confirmations racing
     * for the same token cannot both win.
     */
    async consume(tokenHash: string, now: Date) {
      const [row] = await db
        .update(passwordResets)
        .set({ usedAt: now })
        .where(
          and(
            eq(passwordResets.tokenHash, tokenHash),
            isNull(passwordResets.usedAt),
            gt(passwordResets.expiresAt, now),
          ),
        )
        .returning({ userId: passwordResets.userId });
      return row?.userId ?? null;
    },

    /** After a reset, older links for the same account stop working too. */
    async retireAllForUser(userId: string, now: Date) {
      await db
        .update(passwordResets)
        .set({ usedAt: now })
        .where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
    },
  };
}

export type PasswordResetsRepository = ReturnType<typeof createPasswordResetsRepository>;
