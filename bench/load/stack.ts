import { mkdtemp, rm, chmod } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { pino } from 'pino';
import type { AuthLimits } from '../../server/auth/auth-limits';
import { AUTH_LIMITS } from '../../server/auth/auth-limits';
import { connectDatabase, type Database } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import { ensurePostgres, type LocalPostgres } from '../../server/db/postgres';
import { listen, type ListeningServer } from '../../server/index';
import { seedDemo } from '../../server/seed';

export interface LoadStack {
  app: ListeningServer;
  database: Database;
  stop(): Promise<void>;
}

/**
 * A throwaway PostgreSQL (temporary directory, its own port), migrated and seeded with the demo
 * site, and the app on 127.0.0.1 as `npm start` builds it (request log included, written to
 * /dev/null); sign-in limits lifted so the benchmark's own sign-ins are not refused.
 */
export async function startLoadStack(port: number, clientDir?: string): Promise<LoadStack> {
  const root = await mkdtemp(path.join(os.tmpdir(), 'meander-load-'));
  await chmod(root, 0o755);
  let postgres: LocalPostgres | undefined;
  try {
    postgres = await ensurePostgres({ dataDir: path.join(root, 'pg'), port, database: 'meander_load' });
    const database = connectDatabase(postgres.url, { max: 10 });
    await migrate(database.db);
    await seedDemo(database.db);
    const lifted = Object.fromEntries(
      Object.keys(AUTH_LIMITS).map((name) => [name, { limit: 1_000_000, windowMs: 60_000 }]),
    ) as AuthLimits;
    const app = await listen(
      {
        db: database.db,
        mailer: { send: async () => undefined },
        config: { nodeEnv: 'production', secureCookies: false, clientDir },
        limits: lifted,
        logger: pino({ level: 'info' }, pino.destination('/dev/null')),
      },
      { port: 0 },
    );
    const running = postgres;
    return {
      app,
      database,
      async stop() {
        await app.close();
        await database.close();
        await running.stop();
        await rm(root, { recursive: true, force: true });
      },
    };
  } catch (error) {
    await postgres?.stop();
    await rm(root, { recursive: true, force: true });
    throw error;
  }
}
