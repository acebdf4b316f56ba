import { index, integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/**
 * Attempt counts per limiter key (`sign-in:address:…`), in PostgreSQL so that every app server
 * behind a load balancer counts the same attempts. One fixed window per key.
 */
export const rateLimits = pgTable(
  'rate_limits',
  {
    key: text('key').primaryKey(),
    count: integer('count').notNull(),
    resetsAt: timestamp('resets_at', { withTimezone: true }).notNull(),
  },
  (table) => [index('rate_limits_resets_at_idx').on(table.resetsAt)],
);
