import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appConfigFromEnv, loadEnv } from '../../server/config';
import {
  createTestContext,
  DEFAULT_PASSWORD,
  signUp,
  TEST_HOST,
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

describe('reset links', () => {
  it('point at the configured origin whatever Host the request names', async () => {
    const user = await signUp(context);
    // The Host check refuses a foreign Host outright; a proxy that rewrote Host must not matter either.
    await context
      .agent()
      .set('X-Forwarded-Host', 'attacker.example')
      .post('/api/auth/password-reset')
      .send({ email: user.email });
    const mail = await waitForMail(context.mailFake, user.email, MAIL_SUBJECTS.reset);
    expect(mail.text).toContain(`${TEST_ORIGIN}/reset-password?token=`);
    expect(mail.text).not.toContain('attacker.example');
  });

  it('default to http://HOST:PORT of the server when APP_ORIGIN is unset', () => {
    expect(appConfigFromEnv(loadEnv({ HOST: '127.0.0.1', PORT: '3456' })).appOrigin).toBe(
      'http://127.0.0.1:3456',
    );
  });
});

describe('Host header', () => {
  it('refuses a request naming a host that is not configured with 421, sending no mail', async () => {
    const user = await signUp(context);
    const before = context.mailFake.messages().length;
    const response = await context
      .anonymous()
      .set('Host', 'attacker.example')
      .set('Origin', 'http://attacker.example')
      .post('/api/auth/password-reset')
      .send({ email: user.email });
    expect(response.status).toBe(421);
    expect(response.body.error.code).toBe('request.unknown_host');
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(context.mailFake.messages().length).toBe(before);
  });

  it('refuses a plain GET naming another host (DNS rebinding)', async () => {
    const response = await context.anonymous().set('Host', 'rebound.example:80').get('/api/health');
    expect(response.status).toBe(421);
  });

  it('accepts the configured host', async () => {
    expect((await context.anonymous().get('/api/health')).status).toBe(200);
    expect(TEST_HOST).toBe('meander.test');
  });
});

describe('Origin check', () => {
  const signUpWithOrigin = (origin: string) =>
    context
      .anonymous()
      .set('Origin', origin)
      .post('/api/auth/sign-up')
      .send({ email: uniqueEmail(), name: 'Origin Probe', password: DEFAULT_PASSWORD });

  it.each([
    ['another scheme', 'https://meander.test'],
    ['a non-web scheme', 'ftp://meander.test'],
    ['another port', 'http://meander.test:8080'],
    ['the opaque origin', 'null'],
    ['a subdomain', 'http://evil.meander.test'],
  ])('refuses %s with 403', async (_label, origin) => {
    const response = await signUpWithOrigin(origin);
    expect(response.status).toBe(403);
    expect(response.body.error.code).toBe('auth.bad_origin');
  });

  it('accepts the configured origin exactly', async () => {
    expect((await signUpWithOrigin(TEST_ORIGIN)).status).toBe(202);
  });
});
