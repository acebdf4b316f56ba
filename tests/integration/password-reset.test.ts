import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashResetToken } from '../../server/auth/auth.usecases';
import {
  createTestContext,
  signUp,
  TEST_ORIGIN,
  type TestContext,
  uniqueEmail,
  MAIL_SUBJECTS,
  waitForMail,
} from './helpers';

let context: TestContext;
beforeAll(async () => {
  context = await createTestContext();
});
afterAll(async () => {
  await context.close();
});

/** The token from the link in a reset mail. */
function tokenFrom(text: string): string {
  const link = text.split(/\s+/).find((word) => word.startsWith(`${TEST_ORIGIN}/reset-password?`));
  if (!link) throw new Error(`no reset link in:\n${text}`);
  const token = new URL(link).searchParams.get('token');
  if (!token) throw new Error('reset link without a token');
  return token;
}

async function requestReset(email: string) {
  return context.agent().post('/api/auth/password-reset').send({ email });
}

describe('password reset', () => {
  it('answers 202 for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('ghost');
    const response = await requestReset(email);
    expect(response.status).toBe(202);
    // The mail goes out after the answer; give it time to (not) arrive.
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(context.mailFake.messages().some((message) => message.to.includes(email))).toBe(false);
  });

  it('mails a link, confirms a new password, ends old sessions, and the link works once', async () => {
    const user = await signUp(context, { name: 'Odile Brenner' });
    expect((await user.agent.get('/api/auth/me')).status).toBe(200);

    const response = await requestReset(user.email.toUpperCase());
    expect(response.status).toBe(202);
    const mail = await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.reset);
    expect(mail.subject).toMatch(/password/i);
    expect(mail.text).toContain('Odile Brenner');
    const token = tokenFrom(mail.text);
    // 32 random bytes, base64url.
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

    // Only the SHA-256 of the token is stored.
    const stored = await context.database.db.execute(
      sql`select token_hash from password_resets where user_id = ${user.id}`,
    );
    expect(stored.rows.map((row) => row.token_hash)).toEqual([hashResetToken(token)]);

    const confirm = await context
      .agent()
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'new-delta-password' });
    expect(confirm.status).toBe(204);

    expect((await user.agent.get('/api/auth/me')).status).toBe(401);
    const oldPassword = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(oldPassword.status).toBe(401);
    const newPassword = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: 'new-delta-password' });
    expect(newPassword.status).toBe(200);

    const again = await context
      .agent()
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'third-password-here' });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('auth.bad_reset_token');
    expect(
      (
        await context
          .agent()
          .post('/api/auth/sign-in')
          .send({ email: user.email, password: 'third-password-here' })
      ).status,
    ).toBe(401);
  });

  it('rejects an expired token and keeps the old password', async () => {
    const user = await signUp(context);
    await requestReset(user.email);
    const token = tokenFrom((await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.reset)).text);
    await context.database.db.execute(
      sql`update password_resets set expires_at = now() - interval '1 minute' where token_hash = ${hashResetToken(token)}`,
    );
    const confirm = await context
      .agent()
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'too-late-password' });
    expect(confirm.status).toBe(400);
    expect(confirm.body.error.code).toBe('auth.bad_reset_token');
    expect(
      (await context.agent().post('/api/auth/sign-in').send({ email: user.email, password: user.password }))
        .status,
    ).toBe(200);
  });

  it('sets the token to expire one hour after the request', async () => {
    const user = await signUp(context);
    const before = Date.now();
    await requestReset(user.email);
    const token = tokenFrom((await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.reset)).text);
    const result = await context.database.db.execute(
      sql`select expires_at from password_resets where token_hash = ${hashResetToken(token)}`,
    );
    const expiresAt = new Date(String(result.rows[0]?.expires_at)).getTime();
    expect(expiresAt - before).toBeGreaterThanOrEqual(60 * 60 * 1000 - 1000);
    expect(expiresAt - before).toBeLessThanOrEqual(60 * 60 * 1000 + 10_000);
  });

  it('rejects an unknown token and a too-short new password', async () => {
    const unknown = await context
      .agent()
      .post('/api/auth/password-reset/confirm')
      .send({ token: 'made-up-token', password: 'long-enough-pass' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe('auth.bad_reset_token');
    const short = await context
      .agent()
      .post('/api/auth/password-reset/confirm')
      .send({ token: 'made-up-token', password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.path).toEqual(['password']);
  });

  it('shows a member their own captured mail on the development mailbox route', async () => {
    const user = await signUp(context);
    await requestReset(user.email);
    await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.reset);
    const mailbox = await user.agent.get('/api/dev/mailbox');
    expect(mailbox.status).toBe(200);
    const message = mailbox.body.messages.find((entry: { to: string[] }) => entry.to.includes(user.email));
    expect(message).toMatchObject({
      subject: expect.stringMatching(/password/i),
      text: expect.stringContaining('/reset-password?token='),
    });
  });
});
