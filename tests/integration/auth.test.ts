import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestContext,
  DEFAULT_PASSWORD,
  MAIL_SUBJECTS,
  signUp,
  type TestContext,
  uniqueEmail,
  waitForMail,
} from './helpers';

let context: TestContext;
beforeAll(async () => {
  // A small limit keeps the rate-limit test short; the production default is 10 per 15 minutes.
  context = await createTestContext({
    limits: { signInPerAddressAndAccount: { limit: 5, windowMs: 15 * 60 * 1000 } },
  });
});
afterAll(async () => {
  await context.close();
});

function sessionCookie(setCookie: string[] | string | undefined): string | undefined {
  const cookies = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  return cookies.find((cookie) => cookie.startsWith('meander_session='));
}

describe('sign-up', () => {
  it('creates a member on confirmation, answering 201 with the user and an httpOnly SameSite=Lax session cookie', async () => {
    const email = uniqueEmail('Estuary.Modeller');
    const agent = context.agent();
    const started = await agent
      .post('/api/auth/sign-up')
      .send({ email, name: 'Rhea Castell', password: DEFAULT_PASSWORD });
    expect(started.status).toBe(202);
    const link = (await waitForMail(context.mailFake, email.toLowerCase(), MAIL_SUBJECTS.confirmSignUp)).text
      .split(/\s+/)
      .find((word) => word.includes('/confirm-sign-up?token='))!;
    const response = await agent
      .post('/api/auth/sign-up/confirm')
      .send({ token: new URL(link).searchParams.get('token') });
    expect(response.status).toBe(201);
    expect(response.body).toEqual({
      id: expect.any(String),
      email: email.toLowerCase(),
      name: 'Rhea Castell',
      role: 'member',
    });
    const cookie = sessionCookie(response.headers['set-cookie']);
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Not production: no Secure flag, so the cookie works on http://localhost.
    expect(cookie).not.toMatch(/Secure/i);
  });

  it('stores an argon2id hash, never the password', async () => {
    const user = await signUp(context);
    const result = await context.database.db.execute(
      sql`select password_hash from users where id = ${user.id}`,
    );
    const hash = String(result.rows[0]?.password_hash);
    expect(hash.startsWith('$argon2id$')).toBe(true);
    expect(hash).not.toContain(user.password);
  });

  it('rejects a password shorter than 10 characters with 400 and the field path', async () => {
    const response = await context
      .agent()
      .post('/api/auth/sign-up')
      .send({ email: uniqueEmail(), name: 'Short Pass', password: 'nine-char' });
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('request.invalid');
    expect(response.body.error.path).toEqual(['password']);
    expect(response.body.error.message).toMatch(/10 characters/);
  });

  it('never makes a second account for the same e-mail in any letter case', async () => {
    const user = await signUp(context);
    const response = await context
      .agent()
      .post('/api/auth/sign-up')
      .send({ email: user.email.toUpperCase(), name: 'Copy Cat', password: DEFAULT_PASSWORD });
    expect(response.status).toBe(202);
    const notice = await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.alreadyRegistered);
    expect(notice.text).not.toContain('/confirm-sign-up');
    const rows = await context.database.db.execute(
      sql`select count(*)::int as n from users where lower(email) = ${user.email}`,
    );
    expect(rows.rows).toEqual([{ n: 1 }]);
  });
});

describe('sign-in, me and sign-out', () => {
  it('signs in with the right password (e-mail case ignored) and /me returns the user', async () => {
    const user = await signUp(context, { name: 'Ansel Varga' });
    const agent = context.agent();
    const signIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: user.email.toUpperCase(), password: user.password });
    expect(signIn.status).toBe(200);
    expect(signIn.body).toMatchObject({
      id: user.id,
      email: user.email,
      name: 'Ansel Varga',
      role: 'member',
    });
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toEqual({ id: user.id, email: user.email, name: 'Ansel Varga', role: 'member' });
  });

  it('answers 401 without a session', async () => {
    const response = await context.anonymous().get('/api/auth/me');
    expect(response.status).toBe(401);
    expect(response.body.error.code).toBe('auth.unauthenticated');
  });

  it('gives the same 401 for an unknown e-mail and for a wrong password', async () => {
    const user = await signUp(context);
    const wrongPassword = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: 'not-the-password' });
    const unknownEmail = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: uniqueEmail('nobody'), password: 'not-the-password' });
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    expect(unknownEmail.body).toEqual(wrongPassword.body);
    expect(wrongPassword.body.error.code).toBe('auth.bad_credentials');
  });

  it('signs out: the session cookie is cleared and the old session no longer works', async () => {
    const user = await signUp(context);
    const cookieBefore = (await user.agent.get('/api/auth/me')).status;
    expect(cookieBefore).toBe(200);
    const signOut = await user.agent.post('/api/auth/sign-out');
    expect(signOut.status).toBe(204);
    expect(sessionCookie(signOut.headers['set-cookie'])).toMatch(/Max-Age=0/i);
    expect((await user.agent.get('/api/auth/me')).status).toBe(401);
  });

  it('rate-limits sign-in per address and e-mail with 429 and Retry-After', async () => {
    const user = await signUp(context);
    const agent = context.agent();
    for (let attempt = 1; attempt <= 5; attempt += 1) {
      const response = await agent
        .post('/api/auth/sign-in')
        .send({ email: user.email, password: `wrong-${attempt}` });
      expect(response.status).toBe(401);
    }
    // Even the right password is refused once the limit is reached.
    const limited = await agent
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('auth.rate_limited');
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(limited.headers['retry-after'])).toBeLessThanOrEqual(15 * 60);
    // Another e-mail from the same address is not affected.
    const other = await signUp(context);
    expect(
      (await agent.post('/api/auth/sign-in').send({ email: other.email, password: other.password })).status,
    ).toBe(200);
  });
});

describe('cross-site request guard', () => {
  it('refuses a state-changing request without an Origin header with 403 auth.bad_origin', async () => {
    const response = await context
      .anonymous()
      .post('/api/auth/sign-up')
      .send({ email: uniqueEmail(), name: 'No Origin', password: DEFAULT_PASSWORD });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('auth.bad_origin');
  });

  it('refuses a request from another origin, even with a valid session', async () => {
    const user = await signUp(context);
    const response = await user.agent
      .post('/api/sheets')
      .set('Origin', 'http://elsewhere.example.test')
      .send({ title: 'Forged' });
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('auth.bad_origin');
    const list = await user.agent.get('/api/sheets');
    expect(list.body.sheets).toEqual([]);
  });

  it('lets GET through without an Origin header', async () => {
    const response = await context.anonymous().get('/api/health');
    expect(response.status).toBe(200);
  });
});

describe('account', () => {
  it('renames the signed-in user', async () => {
    const user = await signUp(context, { name: 'Old Name' });
    const response = await user.agent.patch('/api/account').send({ name: '  Ilse Marchetti ' });
    expect(response.status).toBe(200);
    expect(response.body.name).toBe('Ilse Marchetti');
    expect((await user.agent.get('/api/auth/me')).body.name).toBe('Ilse Marchetti');
  });

  it('changes the password only with the current one, and ends other sessions', async () => {
    const user = await signUp(context);
    const otherDevice = context.agent();
    expect(
      (await otherDevice.post('/api/auth/sign-in').send({ email: user.email, password: user.password }))
        .status,
    ).toBe(200);

    const wrong = await user.agent
      .post('/api/account/password')
      .send({ currentPassword: 'not-my-password', newPassword: 'tidal-prism-2024' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('auth.wrong_password');

    const changed = await user.agent
      .post('/api/account/password')
      .send({ currentPassword: user.password, newPassword: 'tidal-prism-2024' });
    expect(changed.status).toBe(204);
    expect((await user.agent.get('/api/auth/me')).status).toBe(200);
    expect((await otherDevice.get('/api/auth/me')).status).toBe(401);
    expect(
      (
        await context
          .agent()
          .post('/api/auth/sign-in')
          .send({ email: user.email, password: 'tidal-prism-2024' })
      ).status,
    ).toBe(200);
  });

  it('needs a session', async () => {
    const response = await context.agent().patch('/api/account').send({ name: 'Anyone' });
    expect(response.status).toBe(401);
  });
});
