import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appConfigFromEnv, loadEnv } from '../../server/config';
import { createTestContext, signUp, type TestContext } from './helpers';

describe('loadEnv', () => {
  it('fills the documented defaults', () => {
    const env = loadEnv({});
    expect(env).toMatchObject({
      NODE_ENV: 'development',
      PORT: 3000,
      API_PORT: 3001,
      PGPORT_MEANDER: 54329,
      SMTP_PORT: 2525,
    });
    expect(appConfigFromEnv(env).secureCookies).toBe(false);
  });

  it('turns on secure cookies in production unless SESSION_SECURE says otherwise', () => {
    expect(appConfigFromEnv(loadEnv({ NODE_ENV: 'production' })).secureCookies).toBe(true);
    expect(appConfigFromEnv(loadEnv({ NODE_ENV: 'production', SESSION_SECURE: 'false' })).secureCookies).toBe(
      false,
    );
  });

  it('keeps only the origin of APP_ORIGIN', () => {
    expect(loadEnv({ APP_ORIGIN: 'https://meander.example.test/some/path' }).APP_ORIGIN).toBe(
      'https://meander.example.test',
    );
  });

  it('reads TRUST_PROXY as a flag, a hop count or a list of proxies, and trusts none by default', () => {
    expect(appConfigFromEnv(loadEnv({})).trustProxy).toBe(false);
    expect(loadEnv({ TRUST_PROXY: 'true' }).TRUST_PROXY).toBe(true);
    expect(loadEnv({ TRUST_PROXY: '2' }).TRUST_PROXY).toBe(2);
    expect(loadEnv({ TRUST_PROXY: 'loopback, 10.0.0.0/8' }).TRUST_PROXY).toBe('loopback, 10.0.0.0/8');
  });

  it('fails fast with every problem named', () => {
    let message = '';
    try {
      loadEnv({ PORT: 'eighty', DATABASE_URL: 'mysql://x', NODE_ENV: 'staging' });
    } catch (error) {
      message = String(error);
    }
    expect(message).toContain('The environment is not valid');
    expect(message).toContain('PORT');
    expect(message).toContain('NODE_ENV');
    expect(message).toContain('DATABASE_URL must be a postgres:// URL');
  });
});

describe('secure cookies', () => {
  let context: TestContext;
  beforeAll(async () => {
    context = await createTestContext({ config: { secureCookies: true } });
  });
  afterAll(async () => {
    await context.close();
  });

  it('marks the session cookie Secure when configured for production', async () => {
    const user = await signUp(context, { name: 'Secure Cookie' });
    const response = await context
      .agent()
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: user.password });
    expect(response.status).toBe(200);
    const cookies = ([] as string[]).concat(response.headers['set-cookie'] ?? []);
    expect(cookies.find((cookie) => cookie.startsWith('meander_session='))).toMatch(/;\s*Secure/i);
  });
});
