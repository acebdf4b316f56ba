import { describe, expect, it } from 'vitest';
import pg from 'pg';
import { sql } from 'drizzle-orm';
import { connectDatabase } from '../../server/db/client';
import { createTestDatabase } from './helpers';

describe('the database pool', () => {
  it('survives a connection the server terminates, reports it and serves the next query', async () => {
    const testDb = await createTestDatabase();
    const lost: Error[] = [];
    const database = connectDatabase(testDb.url, { max: 1, onConnectionError: (error) => lost.push(error) });
    try {
      const first = await database.db.execute(sql`select pg_backend_pid() as pid`);
      const pid = Number(first.rows[0]!.pid);
      const admin = new pg.Client({ connectionString: testDb.url });
      await admin.connect();
      await admin.query('select pg_terminate_backend($1)', [pid]);
      await admin.end();
      // The idle connection learns of its end asynchronously; without a listener this was an uncaught error.
      await expect.poll(() => lost.length, { timeout: 5000 }).toBeGreaterThan(0);
      expect(lost[0]!.message).toMatch(/terminat/i);
      const second = await database.db.execute(sql`select pg_backend_pid() as pid`);
      expect(Number(second.rows[0]!.pid)).not.toBe(pid);
    } finally {
      await database.close();
      await testDb.drop();
    }
  });
});
