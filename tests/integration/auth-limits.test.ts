import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import {
  createTestContext,
  DEFAULT_PASSWORD,
  MAIL_SUBJECTS,
  signUp,
  TEST_HOST,
  TEST_ORIGIN,
  type TestContext,
  uniqueEmail,
} from './helpers';

// Small limits keep the tests short; the production defaults are in server/auth/auth-limits.ts.
const WINDOW = { windowMs: 60_000 };
let context: TestContext;
beforeAll(async () => {
  context = await createTestContext({
    config: { trustProxy: 'loopback' },
    limits: {
      signInPerAddressAndAccount: { limit: 3, ...WINDOW },
      signInPerAccount: { limit: 6, ...WINDOW },
      signInPerAddress: { limit: 1000, ...WINDOW },
      signUpPerAddress: { limit: 1000, ...WINDOW },
      resetRequestsPerAddress: { limit: 3, ...WINDOW },
      resetMailsPerAccount: { limit: 2, ...WINDOW },
    },
  });
});
afterAll(async () => {
  await context.close();
});

/** A client that the app sees at `address` (the test app trusts X-Forwarded-For from loopback). */
const from = (address: string) => context.agent().set('X-Forwarded-For', address);
const signIn = (address: string, email: string, password: string) =>
  from(address).post('/api/auth/sign-in').send({ email, password });

describe('sign-in limits', () => {
  it('after the limit for one address, the right password still works from another address', async () => {
    const user = await signUp(context);
    for (let attempt = 0; attempt < 3; attempt += 1)
      expect((await signIn('198.51.100.1', user.email, 'wrong-password')).status).toBe(401);
    expect((await signIn('198.51.100.1', user.email, user.password)).status).toBe(429);
    expect((await signIn('198.51.100.2', user.email, user.password)).status).toBe(200);
  });

  it('locks an account guessed at from many addresses, briefly, and says when the lock ends', async () => {
    const user = await signUp(context);
    for (let attempt = 0; attempt < 6; attempt += 1)
      expect((await signIn(`203.0.113.${attempt + 1}`, user.email, 'wrong-password')).status).toBe(401);
    const locked = await signIn('203.0.113.99', user.email, user.password);
    expect(locked.status).toBe(429);
    expect(locked.body.error.code).toBe('auth.rate_limited');
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(locked.headers['retry-after'])).toBeLessThanOrEqual(60);
    expect(locked.body.error.message).toMatch(/try again in 1 minute/i);
  });

  it('ignores X-Forwarded-For from a client that is not a trusted proxy', async () => {
    const direct = await createTestContext({
      limits: { signInPerAddressAndAccount: { limit: 2, ...WINDOW } },
    });
    try {
      const user = await signUp(direct);
      for (let attempt = 0; attempt < 2; attempt += 1)
        await direct
          .agent()
          .set('X-Forwarded-For', `192.0.2.${attempt}`)
          .post('/api/auth/sign-in')
          .send({ email: user.email, password: 'wrong-password' });
      const forged = await direct
        .agent()
        .set('X-Forwarded-For', '192.0.2.200')
        .post('/api/auth/sign-in')
        .send({ email: user.email, password: 'wrong-password' });
      expect(forged.status).toBe(429);
    } finally {
      await direct.close();
    }
  });
});

describe('sign-up and reset limits', () => {
  it('rate-limits sign-up per address', async () => {
    const limited = await createTestContext({ limits: { signUpPerAddress: { limit: 2, ...WINDOW } } });
    try {
      const attempt = () =>
        limited
          .agent()
          .post('/api/auth/sign-up')
          .send({ email: uniqueEmail(), name: 'Batch Sign-up', password: DEFAULT_PASSWORD });
      expect((await attempt()).status).toBe(202);
      expect((await attempt()).status).toBe(202);
      const third = await attempt();
      expect(third.status).toBe(429);
      expect(third.body.error.code).toBe('auth.rate_limited');
    } finally {
      await limited.close();
    }
  });

  it('rate-limits reset requests per address with 429', async () => {
    for (let attempt = 0; attempt < 3; attempt += 1)
      expect(
        (await from('198.51.100.50').post('/api/auth/password-reset').send({ email: uniqueEmail() })).status,
      ).toBe(202);
    const limited = await from('198.51.100.50')
      .post('/api/auth/password-reset')
      .send({ email: uniqueEmail() });
    expect(limited.status).toBe(429);
  });

  it('sends at most a few reset mails per account however many addresses ask, answering the same', async () => {
    const user = await signUp(context);
    for (let attempt = 0; attempt < 4; attempt += 1) {
      const response = await from(`198.51.100.${60 + attempt}`)
        .post('/api/auth/password-reset')
        .send({ email: user.email });
      expect(response.status).toBe(202);
    }
    await new Promise((resolve) => setTimeout(resolve, 500));
    const resetMails = context.mailFake
      .messages()
      .filter((message) => message.to.includes(user.email) && MAIL_SUBJECTS.reset.test(message.subject));
    expect(resetMails).toHaveLength(2);
  });
});

describe('several app servers', () => {
  it('count sign-in attempts together, because the counts live in PostgreSQL', async () => {
    const user = await signUp(context);
    // A second app on the same database, as a second server behind a load balancer would be.
    const second = createApp({
      db: context.database.db,
      mailer: { send: async () => undefined },
      config: { nodeEnv: 'test', appOrigin: TEST_ORIGIN, secureCookies: false, trustProxy: 'loopback' },
      limits: { signInPerAddressAndAccount: { limit: 3, ...WINDOW } },
    });
    const onSecond = () =>
      request(second)
        .post('/api/auth/sign-in')
        .set('Host', TEST_HOST)
        .set('Origin', TEST_ORIGIN)
        .set('X-Forwarded-For', '198.51.100.77');
    expect((await signIn('198.51.100.77', user.email, 'wrong-password')).status).toBe(401);
    expect((await onSecond().send({ email: user.email, password: 'wrong-password' })).status).toBe(401);
    expect((await signIn('198.51.100.77', user.email, 'wrong-password')).status).toBe(401);
    expect((await onSecond().send({ email: user.email, password: user.password })).status).toBe(429);
  });
});
