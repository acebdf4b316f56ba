import type { AuthLimits } from './auth/auth-limits';
import type { AppConfig } from './config';
import { connectDatabase } from './db/client';
import { migrate } from './db/migrate';
import { listen } from './index';
import type { MailboxReader } from './mail/mail-fake';
import { createMailer } from './mail/mailer';
import { seedDemo } from './seed';

export interface TestServerOptions {
  databaseUrl: string;
  /** Port of the mail fake the test setup runs on 127.0.0.1. */
  smtpPort: number;
  /** Built client to serve (dist/); omit for an API-only server. */
  clientDir?: string;
  /** 0 or omitted: a free port. */
  port?: number;
  /** The mail fake's reader, for /api/dev/mailbox; defaults to the one shared in this process. */
  mailbox?: MailboxReader;
  config?: Partial<AppConfig>;
  limits?: Partial<AuthLimits>;
}

export interface TestServer {
  url: string;
  stop(): Promise<void>;
}

const SHARED_MAILBOX = Symbol.for('meander.testing.mailbox');
type MailboxHolder = { [SHARED_MAILBOX]?: MailboxReader };

/**
 * Makes a mail fake's reader available to startTestServer in the same process (the test setup
 * starts the fake; the end-to-end setup starts the server).
 */
export function shareMailboxInProcess(mailbox: MailboxReader | undefined): void {
  (globalThis as MailboxHolder)[SHARED_MAILBOX] = mailbox;
}

export function sharedMailbox(): MailboxReader | undefined {
  return (globalThis as MailboxHolder)[SHARED_MAILBOX];
}

/** Migrates, seeds the demo site (when empty) and serves the app on 127.0.0.1, for end-to-end tests. */
export async function startTestServer(options: TestServerOptions): Promise<TestServer> {
  const database = connectDatabase(options.databaseUrl);
  const mailer = createMailer({
    host: '127.0.0.1',
    port: options.smtpPort,
    from: 'Meander <no-reply@meander.example.test>',
  });
  try {
    await migrate(database.db);
    await seedDemo(database.db, { mailer });
    const server = await listen(
      {
        db: database.db,
        mailer,
        mailbox: options.mailbox ?? sharedMailbox(),
        config: { nodeEnv: 'test', secureCookies: false, clientDir: options.clientDir, ...options.config },
        limits: options.limits,
      },
      { port: options.port ?? 0, host: '127.0.0.1' },
    );
    return {
      url: server.url,
      async stop() {
        await server.close();
        mailer.close();
        await database.close();
      },
    };
  } catch (error) {
    mailer.close();
    await database.close();
    throw error;
  }
}
