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

/** A pooled connection; the caller closes it on shutdown. */
export function connectDatabase(url: string, options: { max?: number } = {}): Database {
  const pool = new pg.Pool({ connectionString: url, max: options.max ?? 10 });
  const db = drizzle(pool, { schema });
  return { db, close: () => pool.end() };
}

/** PostgreSQL's SQLSTATE for a unique-constraint violation. */
export function isUniqueViolation(error: unknown): boolean {
  const cause = error && typeof error === 'object' && 'cause' in error ? error.cause : error;
  return Boolean(cause && typeof cause === 'object' && 'code' in cause && cause.code === '23505');
}
