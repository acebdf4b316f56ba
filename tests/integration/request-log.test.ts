import { Writable } from 'node:stream';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signUp, type TestContext } from './helpers';

const lines: Record<string, unknown>[] = [];
const sink = new Writable({
  write(chunk: Buffer, _encoding, done) {
    for (const line of chunk.toString('utf8').split('\n').filter(Boolean)) lines.push(JSON.parse(line));
    done();
  },
});

let context: TestContext;
beforeAll(async () => {
  context = await createTestContext({ logger: pino({ level: 'info' }, sink) });
});
afterAll(async () => {
  await context.close();
});

type Logged = { req?: { id?: string; method?: string; url?: string }; res?: { statusCode?: number } };
const requestLines = () => (lines as Logged[]).filter((line) => line.req && line.res);

describe('request log', () => {
  it('logs one structured line per request with its id, method, path and status', async () => {
    const response = await context.anonymous().get('/api/health');
    const id = response.headers['x-request-id'];
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    expect(requestLines().find((line) => line.req?.id === id)).toMatchObject({
      req: { id, method: 'GET', url: '/api/health' },
      res: { statusCode: 200 },
    });
  });

  it('gives every request its own id, whatever id the client sends', async () => {
    const first = await context.anonymous().get('/api/health').set('X-Request-Id', 'chosen-by-client');
    const second = await context.anonymous().get('/api/health').set('X-Request-Id', 'chosen-by-client');
    expect(first.headers['x-request-id']).not.toBe('chosen-by-client');
    expect(first.headers['x-request-id']).not.toBe(second.headers['x-request-id']);
  });

  it('never logs a password, a session token, a cookie or a query string', async () => {
    const user = await signUp(context, { password: 'riverbank-secret-77' });
    const signIn = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: 'riverbank-secret-77' });
    const cookie = ([] as string[]).concat(signIn.headers['set-cookie'] ?? [])[0]!.split(';')[0]!;
    await context
      .anonymous()
      .get('/api/auth/me')
      .set('Cookie', cookie)
      .set('Authorization', 'Bearer abc-secret');
    await context.anonymous().get('/reset-password?token=reset-token-not-for-logs');
    const text = JSON.stringify(lines);
    expect(text).not.toContain('riverbank-secret-77');
    expect(text).not.toContain(cookie.split('=')[1]);
    expect(text).not.toContain('abc-secret');
    expect(text).not.toContain('reset-token-not-for-logs');
    expect(requestLines().some((line) => line.req?.url === '/reset-password')).toBe(true);
  });
});

describe('loggableError', () => {
  it("drops Drizzle's query parameters from the message and its cause", async () => {
    const { loggableError } = await import('../../server/logger');
    const cause = Object.assign(new Error('duplicate key'), { code: '23505' });
    const error = new Error(
      'Failed query: insert into "sessions" values ($1)\nparams: 9f86d081884c7d659a2f',
      {
        cause,
      },
    );
    const logged = JSON.stringify(loggableError(error));
    expect(logged).not.toContain('9f86d081884c7d659a2f');
    expect(logged).toContain('Failed query');
    expect(logged).toContain('23505');
  });
});
