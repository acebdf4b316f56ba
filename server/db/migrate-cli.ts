import { loadEnv } from '../config';
import { connectDatabase } from './client';
import { migrate } from './migrate';
import { ensurePostgres } from './postgres';

/** `npm run db:migrate`: applies the committed migrations to DATABASE_URL, or to the local .data/pg. */
async function main() {
  const env = loadEnv();
  const postgres = env.DATABASE_URL
    ? null
    : // Beside a running `npm start`, its PostgreSQL is used and left running.
      await ensurePostgres({
        dataDir: '.data/pg',
        port: env.PGPORT_MEANDER,
        database: 'meander',
        adoptRunning: false,
      });
  const database = connectDatabase(env.DATABASE_URL ?? postgres!.url, { max: 1 });
  try {
    await migrate(database.db);
    process.stdout.write('migrations applied\n');
  } finally {
    await database.close();
    await postgres?.stop();
  }
}

main().catch((error: unknown) => {
  process.stderr.write(`migration failed: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
