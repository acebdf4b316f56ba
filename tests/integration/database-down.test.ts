import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { connectDatabase, type Database } from '../../server/db/client';
import { freePort } from '../setup/services';
import { TEST_HOST, TEST_ORIGIN } from './helpers';

let database: Database;
let app: ReturnType<typeof createApp>;
const reported: unknown[] = [];

beforeAll(async () => {
  // Nothing listens on this port: every query fails to connect, as with PostgreSQL stopped.
  database = connectDatabase(`postgres://meander@127.0.0.1:${await freePort()}/meander`, {
    onConnectionError: () => undefined,
  });
  app = createApp({
    db: database.db,
    mailer: { send: async () => undefined },
    config: { nodeEnv: 'test', appOrigin: TEST_ORIGIN, secureCookies: false },
    report: (error) => reported.push(error),
  });
});
afterAll(async () => {
  await database.close();
});

const client = () =>
  request.agent(app).host(TEST_HOST).set('Origin', TEST_ORIGIN).set('Cookie', 'meander_session=abcdef123456');

describe('with the database down', () => {
  it('health with a session cookie answers 503 { ok: false, db: "down" }', async () => {
    const response = await client().get('/api/health');
    expect(response.status).toBe(503);
    expect(response.body).toEqual({ ok: false, db: 'down' });
  });

  it.each([
    ['GET', '/api/sheets'],
    ['GET', '/api/auth/me'],
    ['POST', '/api/auth/sign-in'],
    ['POST', '/api/auth/sign-up'],
  ])('%s %s answers 503 with a plain message', async (method, path) => {
    const call = method === 'GET' ? client().get(path) : client().post(path);
    const response = await call.send(
      method === 'GET'
        ? undefined
        : { email: 'down@example.test', name: 'Down Time', password: 'long-enough-pass' },
    );
    expect(response.status).toBe(503);
    expect(response.body.error.code).toBe('server.unavailable');
    expect(response.body.error.message).toMatch(/database/i);
  });

  it('answers the anonymous health check with 503 too', async () => {
    const response = await request(app).get('/api/health').set('Host', TEST_HOST);
    expect(response.status).toBe(503);
    expect(response.body).toEqual({ ok: false, db: 'down' });
  });
});
