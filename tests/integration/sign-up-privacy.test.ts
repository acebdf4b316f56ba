import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashResetToken } from '../../server/auth/auth.usecases';
import {
  createTestContext,
  DEFAULT_PASSWORD,
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

function confirmToken(text: string): string {
  const link = text.split(/\s+/).find((word) => word.startsWith(`${TEST_ORIGIN}/confirm-sign-up?`));
  if (!link) throw new Error(`no confirmation link in:\n${text}`);
  return new URL(link).searchParams.get('token')!;
}

const startSignUp = (email: string, name = 'Ines Varga', password = DEFAULT_PASSWORD) =>
  context.agent().post('/api/auth/sign-up').send({ email, name, password });

describe('sign-up does not tell whether an address is registered', () => {
  it('answers a new address with 202 and no session, and mails a link that creates the account once', async () => {
    const email = uniqueEmail('newcomer');
    const response = await startSignUp(email);
    expect(response.status).toBe(202);
    expect(response.headers['set-cookie']).toBeUndefined();
    expect(response.body.message).toMatch(/mail/i);
    expect((await context.database.db.execute(sql`select 1 from users where email = ${email}`)).rows).toEqual(
      [],
    );

    const token = confirmToken(
      (await waitForMail(context.mailFake, email, MAIL_SUBJECTS.confirmSignUp)).text,
    );
    const stored = await context.database.db.execute(
      sql`select token_hash from sign_up_requests where email = ${email}`,
    );
    expect(stored.rows).toEqual([{ token_hash: hashResetToken(token) }]);

    const agent = context.agent();
    const confirmed = await agent.post('/api/auth/sign-up/confirm').send({ token });
    expect(confirmed.status).toBe(201);
    expect(confirmed.body).toMatchObject({ email, name: 'Ines Varga', role: 'member' });
    expect((await agent.get('/api/auth/me')).body.email).toBe(email);
    const again = await context.agent().post('/api/auth/sign-up/confirm').send({ token });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('auth.bad_sign_up_token');
  });

  it('answers a registered address exactly the same, changes nothing and tells the owner by mail', async () => {
    const owner = await signUp(context, { name: 'Owner Already' });
    const fresh = await startSignUp(uniqueEmail('fresh'));
    const taken = await startSignUp(owner.email.toUpperCase(), 'Intruder', 'intruder-password-1');
    expect(taken.status).toBe(fresh.status);
    expect(taken.body).toEqual(fresh.body);
    expect(taken.headers['set-cookie']).toBeUndefined();

    const notice = await waitForMail(context.mailFake, owner.email, MAIL_SUBJECTS.alreadyRegistered);
    expect(notice.text).toMatch(/already has a Meander account/i);
    expect(notice.text).not.toContain('/confirm-sign-up');
    const signIn = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: owner.email, password: owner.password });
    expect(signIn.status).toBe(200);
    const intruder = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: owner.email, password: 'intruder-password-1' });
    expect(intruder.status).toBe(401);
  });

  it('refuses an expired confirmation link', async () => {
    const email = uniqueEmail('late');
    await startSignUp(email);
    const token = confirmToken(
      (await waitForMail(context.mailFake, email, MAIL_SUBJECTS.confirmSignUp)).text,
    );
    await context.database.db.execute(
      sql`update sign_up_requests set expires_at = now() - interval '1 minute' where token_hash = ${hashResetToken(token)}`,
    );
    const response = await context.agent().post('/api/auth/sign-up/confirm').send({ token });
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('auth.bad_sign_up_token');
  });
});
