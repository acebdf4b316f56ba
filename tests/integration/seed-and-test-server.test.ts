import request from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { exampleSheets } from '@shared/examples/index';
import { connectDatabase, type Database } from '../../server/db/client';
import { DEMO_ACCOUNTS, seedDemo } from '../../server/seed';
import { demoSheetFiles } from '../../server/seed-sheets';
import { startTestServer } from '../../server/testing';
import { createTestDatabase } from './helpers';

describe('seedDemo', () => {
  let testDb: Awaited<ReturnType<typeof createTestDatabase>>;
  let database: Database;
  beforeAll(async () => {
    testDb = await createTestDatabase();
    database = connectDatabase(testDb.url, { max: 2 });
  });
  afterAll(async () => {
    await database.close();
    await testDb.drop();
  });

  it('creates the demo accounts and sheets on an empty site, and does nothing the second time', async () => {
    const first = await seedDemo(database.db);
    expect(first.seeded).toBe(true);
    // Every example sheet, every demo sheet file (a sheet with its stored data), and the demo
    // editor's fork of the shared one.
    const expected = exampleSheets.length + demoSheetFiles().length + 1;
    expect(first.sheetCount).toBe(expected);
    const second = await seedDemo(database.db);
    expect(second.seeded).toBe(false);
    const users = await database.db.query.users.findMany();
    expect(users.map((user) => user.email).sort()).toEqual(
      DEMO_ACCOUNTS.map((account) => account.email).sort(),
    );
    expect(users.filter((user) => user.role === 'admin')).toHaveLength(1);
    const sheets = await database.db.query.sheets.findMany();
    expect(sheets).toHaveLength(expected);
  });
});

describe('startTestServer', () => {
  let testDb: Awaited<ReturnType<typeof createTestDatabase>>;
  let server: Awaited<ReturnType<typeof startTestServer>>;
  beforeAll(async () => {
    testDb = await createTestDatabase();
    server = await startTestServer({ databaseUrl: testDb.url, smtpPort: inject('smtpPort') });
  });
  afterAll(async () => {
    await server.stop();
    await testDb.drop();
  });

  it('serves a seeded site on 127.0.0.1 where the demo admin can sign in and see the users', async () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    const admin = DEMO_ACCOUNTS.find((account) => account.role === 'admin')!;
    const agent = request.agent(server.url).set('Origin', server.url);
    const signIn = await agent
      .post('/api/auth/sign-in')
      .send({ email: admin.email, password: admin.password });
    expect(signIn.status).toBe(200);
    expect(signIn.body.role).toBe('admin');
    const users = await agent.get('/api/admin/users');
    expect(users.body.total).toBe(DEMO_ACCOUNTS.length);
  });

  it('gives each demo member sheets they can open', async () => {
    const member = DEMO_ACCOUNTS.find((account) => account.role === 'member')!;
    const agent = request.agent(server.url).set('Origin', server.url);
    await agent.post('/api/auth/sign-in').send({ email: member.email, password: member.password });
    const list = await agent.get('/api/sheets');
    expect(list.body.sheets.length).toBeGreaterThan(0);
    const sheet = await agent.get(`/api/sheets/${list.body.sheets[0].id}`);
    expect(sheet.status).toBe(200);
    expect(sheet.body.document.cells.length).toBeGreaterThan(0);
  });
});
