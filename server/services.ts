import path from 'node:path';
import type { Env } from './config';
import { connectDatabase, type Database } from './db/client';
import { migrate } from './db/migrate';
import { ensurePostgres, type LocalPostgres } from './db/postgres';
import { type MailFake, startMailFake } from './mail/mail-fake';
import { createMailer } from './mail/mailer';
import { seedDemo, type SeedResult } from './seed';

export interface RunningServices {
  database: Database;
  mailer: ReturnType<typeof createMailer>;
  /** Present when the local mail fake runs in this process. */
  mailFake?: MailFake;
  seed: SeedResult;
  /** Stops what was started here, in reverse order. */
  stop(): Promise<void>;
}

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);

/**
 * What `npm start` and `npm run dev` need before the app: PostgreSQL (our own under .data/pg
 * unless DATABASE_URL names one), migrations, the demo seed on an empty site, and the local mail
 * fake when mail goes to this machine.
 */
export async function startServices(env: Env, log: (line: string) => void): Promise<RunningServices> {
  const stops: (() => Promise<void>)[] = [];
  const stopAll = async () => {
    for (const stop of stops.reverse())
      await stop().catch((error: unknown) => log(`while stopping: ${String(error)}`));
  };
  try {
    let url = env.DATABASE_URL;
    if (!url) {
      const postgres: LocalPostgres = await ensurePostgres({
        dataDir: path.resolve('.data/pg'),
        port: env.PGPORT_MEANDER,
        database: 'meander',
        log,
      });
      stops.push(() => postgres.stop());
      url = postgres.url;
    }
    const database = connectDatabase(url);
    stops.push(() => database.close());
    await migrate(database.db);

    let mailFake: MailFake | undefined;
    if (env.NODE_ENV !== 'production' && LOOPBACK.has(env.SMTP_HOST)) {
      mailFake = await startMailFake({ port: env.SMTP_PORT });
      stops.push(() => mailFake!.stop());
    }
    const mailer = createMailer({
      host: env.SMTP_HOST,
      port: mailFake?.port ?? env.SMTP_PORT,
      from: env.MAIL_FROM,
    });
    stops.push(async () => mailer.close());
    // After the mailer: the demo's pending invitation goes out as mail.
    const seed = await seedDemo(database.db, {
      mailer,
      appOrigin: env.APP_ORIGIN ?? `http://127.0.0.1:${env.PORT}`,
    });
    return { database, mailer, mailFake, seed, stop: stopAll };
  } catch (error) {
    await stopAll();
    throw error;
  }
}

/** Runs `stop` once on SIGINT or SIGTERM, then exits. */
export function onShutdown(stop: () => Promise<void>, log: (line: string) => void): void {
  let stopping = false;
  const handler = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: shutting down`);
    stop().then(
      () => process.exit(0),
      (error: unknown) => {
        log(`shutdown failed: ${String(error)}`);
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', handler);
  process.once('SIGTERM', handler);
}
