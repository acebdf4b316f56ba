import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signUp, type TestContext } from './helpers';

let context: TestContext;
let clientDir: string;

beforeAll(async () => {
  clientDir = await mkdtemp(path.join(os.tmpdir(), 'meander-client-'));
  await mkdir(path.join(clientDir, 'assets'));
  await writeFile(
    path.join(clientDir, 'index.html'),
    '<!doctype html><title>Meander</title><div id="app"></div>',
  );
  await writeFile(path.join(clientDir, 'assets', 'index-abc123.js'), 'export {};');
  await writeFile(
    path.join(clientDir, 'assets', 'simulation.worker-def456.js'),
    'self.onmessage = () => {};',
  );
  context = await createTestContext({ config: { clientDir } });
});
afterAll(async () => {
  await context.close();
  await rm(clientDir, { recursive: true, force: true });
});

describe('health', () => {
  it('reports the database up', async () => {
    const response = await context.anonymous().get('/api/health');
    expect(response.status).toBe(200);
    expect(response.body).toEqual({ ok: true, db: 'up' });
  });
});

describe('request handling', () => {
  it('answers malformed JSON with 400 request.bad_json', async () => {
    const response = await context
      .agent()
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('request.bad_json');
  });

  it('answers a body over 2 MB with 413', async () => {
    const response = await context
      .agent()
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ email: 'a@example.test', password: 'x'.repeat(2_200_000) }));
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe('request.too_large');
  });

  it('answers an unknown API path with a JSON 404, not the client page', async () => {
    const response = await context.anonymous().get('/api/no-such-thing');
    expect(response.status).toBe(404);
    expect(response.body.error.code).toBe('request.not_found');
  });
});

describe('serving the built client', () => {
  it('serves index.html for client routes with a CSP that forbids eval', async () => {
    const response = await context.anonymous().get('/sheets/abc');
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/text\/html/);
    expect(response.text).toContain('<div id="app">');
    const csp = response.headers['content-security-policy'];
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-eval');
    expect(csp).not.toContain('wasm-unsafe-eval');
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['referrer-policy']).toBeDefined();
  });

  it("gives worker scripts a policy that allows the engine's generated code", async () => {
    const worker = await context.anonymous().get('/assets/simulation.worker-def456.js');
    expect(worker.status).toBe(200);
    expect(worker.headers['content-security-policy']).toMatch(
      /script-src 'self' 'unsafe-eval' 'wasm-unsafe-eval'/,
    );
    const page = await context.anonymous().get('/assets/index-abc123.js');
    expect(page.headers['content-security-policy']).not.toContain('unsafe-eval');
  });

  it('answers a missing asset with 404 instead of the page', async () => {
    const response = await context.anonymous().get('/assets/missing-000.js');
    expect(response.status).toBe(404);
  });
});

describe('development mailbox', () => {
  it('is not mounted in production', async () => {
    const production = await createTestContext({ config: { nodeEnv: 'production' } });
    try {
      expect((await production.anonymous().get('/api/dev/mailbox')).status).toBe(404);
    } finally {
      await production.close();
    }
  });

  it('is not mounted without an in-process mail fake', async () => {
    const withoutFake = await createTestContext({ mountMailbox: false });
    try {
      expect((await withoutFake.anonymous().get('/api/dev/mailbox')).status).toBe(404);
    } finally {
      await withoutFake.close();
    }
  });

  it('lists captured mail outside production when the fake runs in-process, to a signed-in caller', async () => {
    const { agent } = await signUp(context);
    const response = await agent.get('/api/dev/mailbox');
    expect(response.status).toBe(200);
    expect(response.body).toEqual({ messages: expect.any(Array) });
  });
});

describe('security headers', () => {
  it('marks authenticated API answers Cache-Control: no-store', async () => {
    const { agent } = await signUp(context);
    for (const path of ['/api/auth/me', '/api/sheets']) {
      const response = await agent.get(path);
      expect(response.status).toBe(200);
      expect(response.headers['cache-control']).toBe('no-store');
    }
  });

  it("forbids the worker every connection (connect-src 'none')", async () => {
    const worker = await context.anonymous().get('/assets/simulation.worker-def456.js');
    expect(worker.headers['content-security-policy']).toContain("connect-src 'none'");
    const page = await context.anonymous().get('/sheets/abc');
    expect(page.headers['content-security-policy']).toContain("connect-src 'self'");
  });

  it('makes the page cross-origin isolated and turns off features the app does not use', async () => {
    for (const path of ['/sheets/abc', '/assets/index-abc123.js', '/assets/simulation.worker-def456.js']) {
      const response = await context.anonymous().get(path);
      expect(response.headers['cross-origin-opener-policy']).toBe('same-origin');
      expect(response.headers['cross-origin-embedder-policy']).toBe('require-corp');
    }
    const policy = (await context.anonymous().get('/sheets/abc')).headers['permissions-policy'];
    for (const feature of ['camera=()', 'microphone=()', 'geolocation=()', 'payment=()', 'usb=()'])
      expect(policy).toContain(feature);
  });
});
