import { and, gt, isNull, sql } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { signUpRequests } from './sign-up-requests.table';

export function createSignUpRequestsRepository({ db }: { db: DbExecutor }) {
  return {
    async insert(request: typeof signUpRequests.$inferInsert) {
      await db.insert(signUpRequests).values(request);
    },

    /** Marks a live request used and returns it, in one statement: a link confirms once. */
    async consume(tokenHash: string, now: Date) {
      const [row] = await db
        .update(signUpRequests)
        .set({ usedAt: now })
        .where(
          and(
            sql`${signUpRequests.tokenHash} = ${tokenHash}`,
            isNull(signUpRequests.usedAt),
            gt(signUpRequests.expiresAt, now),
          ),
        )
        .returning();
      return row ?? null;
    },
  };
}

export type SignUpRequestsRepository = ReturnType<typeof createSignUpRequestsRepository>;
