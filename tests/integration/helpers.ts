import { randomBytes } from 'node:crypto';
import pg from 'pg';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { inject } from 'vitest';
import { createApp } from '../../server/app';
import { AUTH_LIMITS, type AuthLimits } from '../../server/auth/auth-limits';
import type { AppConfig } from '../../server/config';
import { connectDatabase, type Database } from '../../server/db/client';
import { type MailFake, startMailFake } from '../../server/mail/mail-fake';
import type { Logger } from '../../server/logger';
import { createMailer } from '../../server/mail/mailer';

/** The origin the test app believes it has; state-changing requests must name it. */
export const TEST_ORIGIN = 'http://meander.test';
/** The Host header of TEST_ORIGIN: requests naming another host are refused. */
export const TEST_HOST = new URL(TEST_ORIGIN).host;

export interface TestContext {
  app: ReturnType<typeof createApp>;
  database: Database;
  mailFake: MailFake;
  /** Errors the app reported as unexpected (a test can assert there were none). */
  reported: unknown[];
  /** A cookie-keeping client that sends our Host and Origin. */
  agent(): TestAgent;
  /** A client that sends our Host but no Origin and no cookie (a plain GET, a hostile form). */
  anonymous(): TestAgent;
  close(): Promise<void>;
}

/**
 * A fresh database per test file, copied from the migrated template the global setup made, so
 * files never see each other's users (the last-admin rule counts every admin on the site).
 */
export async function createTestDatabase(): Promise<{ url: string; drop(): Promise<void> }> {
  const templateUrl = new URL(inject('databaseUrl'));
  const template = templateUrl.pathname.slice(1);
  const name = `meander_t_${randomBytes(6).toString('hex')}`;
  // The app's role may not create databases: the superuser does, and hands the copy to that role.
  const adminUrl = new URL(inject('databaseAdminUrl'));
  adminUrl.pathname = '/postgres';
  const owner = templateUrl.username;
  const admin = new pg.Client({ connectionString: adminUrl.toString() });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE ${name} TEMPLATE ${template} OWNER ${owner}`);
  } finally {
    await admin.end();
  }
  const url = new URL(templateUrl);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const client = new pg.Client({ connectionString: adminUrl.toString() });
      await client.connect();
      await client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`).finally(() => client.end());
    },
  };
}

/**
 * Every test signs up and signs in from the same address: the limits are lifted far out of the
 * way unless a test sets its own (the limits' own tests do).
 */
export const GENEROUS_LIMITS: AuthLimits = Object.fromEntries(
  Object.keys(AUTH_LIMITS).map((name) => [name, { limit: 100_000, windowMs: 60_000 }]),
) as AuthLimits;

export async function createTestContext(
  options: {
    config?: Partial<AppConfig>;
    limits?: Partial<AuthLimits>;
    mountMailbox?: boolean;
    logger?: Logger;
  } = {},
): Promise<TestContext> {
  const testDb = await createTestDatabase();
  const database = connectDatabase(testDb.url, { max: 5 });
  // A mail fake in this worker, so the test can read what the app sent.
  const mailFake = await startMailFake({ port: 0 });
  const mailer = createMailer({
    host: '127.0.0.1',
    port: mailFake.port,
    from: 'Meander <no-reply@meander.example.test>',
  });
  const reported: unknown[] = [];
  const app = createApp({
    db: database.db,
    mailer,
    mailbox: options.mountMailbox === false ? undefined : mailFake,
    config: { nodeEnv: 'test', appOrigin: TEST_ORIGIN, secureCookies: false, ...options.config },
    limits: { ...GENEROUS_LIMITS, ...options.limits },
    logger: options.logger,
    report: (error) => reported.push(error),
  });
  return {
    app,
    database,
    mailFake,
    reported,
    agent: () => request.agent(app).host(TEST_HOST).set('Origin', TEST_ORIGIN),
    anonymous: () => request.agent(app).host(TEST_HOST),
    async close() {
      mailer.close();
      await mailFake.stop();
      await database.close();
      await testDb.drop();
    },
  };
}

let counter = 0;

/** example.test addresses only; unique within a run. */
export function uniqueEmail(label = 'modeller'): string {
  counter += 1;
  return `${label}-${counter}-${randomBytes(3).toString('hex')}@example.test`;
}

export const DEFAULT_PASSWORD = 'estuary-salinity-42';

export interface SignedUpUser {
  agent: TestAgent;
  id: string;
  email: string;
  name: string;
  password: string;
}

/**
 * Signs up a new member through the API as a person would: the sign-up, the mailed link, the
 * confirmation; returns a client holding the new session.
 */
export async function signUp(
  context: TestContext,
  fields: { email?: string; name?: string; password?: string } = {},
): Promise<SignedUpUser> {
  const agent = context.agent();
  const email = fields.email ?? uniqueEmail();
  const name = fields.name ?? 'Hydrology Tester';
  const password = fields.password ?? DEFAULT_PASSWORD;
  const response = await agent.post('/api/auth/sign-up').send({ email, name, password });
  if (response.status !== 202)
    throw new Error(`sign-up failed: ${response.status} ${JSON.stringify(response.body)}`);
  const mail = await waitForMail(context.mailFake, email.toLowerCase(), MAIL_SUBJECTS.confirmSignUp);
  const link = mail.text.split(/\s+/).find((word) => word.includes('/confirm-sign-up?token='));
  if (!link) throw new Error(`no confirmation link in:\n${mail.text}`);
  const confirmed = await agent
    .post('/api/auth/sign-up/confirm')
    .send({ token: new URL(link).searchParams.get('token') });
  if (confirmed.status !== 201)
    throw new Error(`sign-up confirmation failed: ${confirmed.status} ${JSON.stringify(confirmed.body)}`);
  return { agent, id: confirmed.body.id as string, email: email.toLowerCase(), name, password };
}

/** Subjects of the mails the tests wait for. */
export const MAIL_SUBJECTS = {
  reset: /new Meander password/,
  confirmSignUp: /Confirm your new Meander account/,
  alreadyRegistered: /tried to sign up with your address/,
  invitation: /invites you to the Meander sheet/,
  shared: /shared ".*" with you/,
} as const;

/**
 * Waits for the mail fake to hold a message to `to` whose subject matches (the app sends its mail
 * after answering); the newest such message.
 */
export async function waitForMail(mailFake: MailFake, to: string, subject: RegExp, timeoutMs = 5000) {
  const started = Date.now();
  for (;;) {
    const found = mailFake
      .messages()
      .filter((message) => message.to.includes(to) && subject.test(message.subject))
      .at(-1);
    if (found) return found;
    if (Date.now() - started > timeoutMs) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}
