import { chmod, mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { connectDatabase } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import { ensurePostgres } from '../../server/db/postgres';
import { startMailFake } from '../../server/mail/mail-fake';
import { shareMailboxInProcess } from '../../server/testing';

declare module 'vitest' {
  export interface ProvidedContext {
    /** A migrated, empty database on a throwaway PostgreSQL, as the app's role (not a superuser). */
    databaseUrl: string;
    /** The same database as the superuser over the private socket: for creating test databases. */
    databaseAdminUrl: string;
    /** The mail fake on 127.0.0.1. */
    smtpPort: number;
  }
}

/** A port the kernel says is free right now. */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

/**
 * Global setup for the integration and end-to-end projects: a throwaway PostgreSQL in a temp
 * directory on a free port, a migrated database, and the mail fake; all torn down afterwards.
 */
export default async function setup(project: TestProject) {
  const root = await mkdtemp(path.join(os.tmpdir(), 'meander-test-'));
  // As root, PostgreSQL runs as `postgres`, which must be able to reach its data directory.
  await chmod(root, 0o755);
  const postgres = await ensurePostgres({
    dataDir: path.join(root, 'pg'),
    port: await freePort(),
    database: 'meander_test',
  });
  const mailFake = await startMailFake({ port: 0 }).catch(async (error: unknown) => {
    await postgres.stop();
    throw error;
  });
  try {
    const database = connectDatabase(postgres.url, { max: 1 });
    await migrate(database.db).finally(() => database.close());
  } catch (error) {
    await mailFake.stop();
    await postgres.stop();
    throw error;
  }
  shareMailboxInProcess(mailFake);
  project.provide('databaseUrl', postgres.url);
  project.provide('databaseAdminUrl', postgres.adminUrl);
  project.provide('smtpPort', mailFake.port);

  return async () => {
    shareMailboxInProcess(undefined);
    await mailFake.stop();
    await postgres.stop();
    await rm(root, { recursive: true, force: true });
  };
}
