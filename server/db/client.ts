import { drizzle, type NodePgDatabase, type NodePgQueryResultHKT } from 'drizzle-orm/node-postgres';
import type { PgDatabase } from 'drizzle-orm/pg-core';
import pg from 'pg';
import * as schema from './schema';

export type Db = NodePgDatabase<typeof schema>;

/** The database or a transaction on it: repositories accept either, so usecases can compose them. */
export type DbExecutor = PgDatabase<NodePgQueryResultHKT, typeof schema>;

export interface Database {
  db: Db;
  close(): Promise<void>;
}

/**
 * A pooled connection; the caller closes it on shutdown. A connection the server ends on its own
 * (a restart, an administrator's command, a dropped database) must not crash the process: pg
 * emits such errors on the client or the pool, and an 'error' event without a listener is thrown.
 * The pool opens a new connection when one is needed; a query in flight still fails with its own
 * error.
 */
export function connectDatabase(
  url: string,
  options: { max?: number; onConnectionError?: (error: Error) => void } = {},
): Database {
  const onConnectionError =
    options.onConnectionError ??
    ((error: Error) => console.warn(`[meander] a database connection was lost: ${error.message}`));
  // A bounded wait for a connection: with PostgreSQL unreachable a request fails (503) instead of hanging.
  const pool = new pg.Pool({ connectionString: url, max: options.max ?? 10, connectionTimeoutMillis: 5000 });
  pool.on('error', onConnectionError);
  pool.on('connect', (client) => client.on('error', onConnectionError));
  const db = drizzle(pool, { schema });
  return { db, close: () => pool.end() };
}

/** PostgreSQL's SQLSTATE for a unique-constraint violation. */
export function isUniqueViolation(error: unknown): boolean {
  const cause = error && typeof error === 'object' && 'cause' in error ? error.cause : error;
  return Boolean(cause && typeof cause === 'object' && 'code' in cause && cause.code === '23505');
}
