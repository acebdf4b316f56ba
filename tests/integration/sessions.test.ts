import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SESSION_ABSOLUTE_LIFETIME_MS } from '../../server/auth/lucia';
import { createTestContext, signUp, type TestContext } from './helpers';

let context: TestContext;
beforeAll(async () => {
  context = await createTestContext();
});
afterAll(async () => {
  await context.close();
});

function sessionToken(setCookie: string[] | string | undefined): string {
  const cookies = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  const cookie = cookies.find((entry) => entry.startsWith('meander_session='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.slice('meander_session='.length).split(';')[0]!;
}

async function signInToken(email: string, password: string): Promise<string> {
  const response = await context.agent().post('/api/auth/sign-in').send({ email, password });
  expect(response.status).toBe(200);
  return sessionToken(response.headers['set-cookie']);
}

describe('sessions', () => {
  it('stores the SHA-256 of the session token, never the token', async () => {
    const user = await signUp(context);
    const token = await signInToken(user.email, user.password);
    const rows = await context.database.db.execute(sql`select id from sessions where user_id = ${user.id}`);
    const ids = rows.rows.map((row) => String(row.id));
    expect(ids).not.toContain(token);
    expect(ids).toContain(createHash('sha256').update(token).digest('hex'));
  });

  it('accepts the token from the cookie and refuses the stored hash used as a token', async () => {
    const user = await signUp(context);
    const token = await signInToken(user.email, user.password);
    const me = await context.anonymous().get('/api/auth/me').set('Cookie', `meander_session=${token}`);
    expect(me.status).toBe(200);
    const hash = createHash('sha256').update(token).digest('hex');
    const stolen = await context.anonymous().get('/api/auth/me').set('Cookie', `meander_session=${hash}`);
    expect(stolen.status).toBe(401);
  });

  it('ends a session past its absolute lifetime even while it is in use', async () => {
    const user = await signUp(context);
    const token = await signInToken(user.email, user.password);
    const hash = createHash('sha256').update(token).digest('hex');
    await context.database.db.execute(
      sql`update sessions set created_at = now() - make_interval(secs => ${SESSION_ABSOLUTE_LIFETIME_MS / 1000 + 60}),
          expires_at = now() + interval '1 day' where id = ${hash}`,
    );
    const me = await context.anonymous().get('/api/auth/me').set('Cookie', `meander_session=${token}`);
    expect(me.status).toBe(401);
  });

  it('ends a session unused past its idle expiry', async () => {
    const user = await signUp(context);
    const token = await signInToken(user.email, user.password);
    const hash = createHash('sha256').update(token).digest('hex');
    await context.database.db.execute(
      sql`update sessions set expires_at = now() - interval '1 minute' where id = ${hash}`,
    );
    const me = await context.anonymous().get('/api/auth/me').set('Cookie', `meander_session=${token}`);
    expect(me.status).toBe(401);
  });
});
