import { lt, sql } from 'drizzle-orm';
import type { DbExecutor } from '../db/client';
import { rateLimits } from './rate-limits.table';

export type RateLimitDecision = { allowed: true } | { allowed: false; retryAfterSeconds: number };

export interface RateLimit {
  /** Attempts allowed per window and key. */
  limit: number;
  windowMs: number;
}

/** Expired windows are deleted now and then, by whichever server happens to count. */
const PRUNE_EVERY = 500;

/**
 * A fixed-window counter per key, kept in PostgreSQL: one upsert per attempt counts it and
 * reads the window, atomically, so two app servers (or two requests at once) never both slip
 * under the limit. The database's clock decides, not each server's.
 */
export function createRateLimiter({
  db,
  name,
  limit,
  windowMs,
}: RateLimit & { db: DbExecutor; name: string }) {
  let calls = 0;
  const windowSql = sql`make_interval(secs => ${windowMs / 1000})`;
  return {
    async consume(key: string): Promise<RateLimitDecision> {
      calls += 1;
      if (calls % PRUNE_EVERY === 0) await db.delete(rateLimits).where(lt(rateLimits.resetsAt, sql`now()`));
      const result = await db.execute<{ count: number; retry_ms: number }>(sql`
        insert into ${rateLimits} (key, count, resets_at)
        values (${`${name}:${key}`}, 1, now() + ${windowSql})
        on conflict (key) do update set
          count = case when ${rateLimits}.resets_at <= now() then 1 else ${rateLimits}.count + 1 end,
          resets_at = case when ${rateLimits}.resets_at <= now() then excluded.resets_at
                      else ${rateLimits}.resets_at end
        returning count, (extract(epoch from resets_at - now()) * 1000)::float8 as retry_ms`);
      const row = result.rows[0]!;
      if (Number(row.count) <= limit) return { allowed: true };
      return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(Number(row.retry_ms) / 1000)) };
    },
    async reset(key: string): Promise<void> {
      await db.delete(rateLimits).where(sql`${rateLimits.key} = ${`${name}:${key}`}`);
    },
  };
}

export type RateLimiter = ReturnType<typeof createRateLimiter>;
