import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

let context: TestContext;
let user: SignedUpUser;
beforeAll(async () => {
  context = await createTestContext();
  user = await signUp(context);
});
afterAll(async () => {
  await context.close();
});

describe('malformed requests', () => {
  it('rejects a JSON body with invalid UTF-8 with 400 and stores nothing', async () => {
    // {"title":"Fjord <0xC3 0x28> level"}: 0xC3 starts a two-byte sequence that 0x28 cannot continue.
    const body = Buffer.concat([
      Buffer.from('{"title":"Fjord '),
      Buffer.from([0xc3, 0x28]),
      Buffer.from(' level"}'),
    ]);
    const response = await user.agent
      .post('/api/sheets')
      .set('Content-Type', 'application/json')
      // As bytes: superagent would otherwise serialise the Buffer as a JSON object.
      .serialize((raw: unknown) => raw as string)
      .send(body);
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('request.bad_encoding');
    const stored = await context.database.db.execute(
      sql`select title from sheets where owner_id = ${user.id}`,
    );
    expect(stored.rows).toEqual([]);
  });

  it.each(['/api/sheets/%E0%A4%A', '/api/sheets/%', '/api/sheets/abc%ZZ/versions', '/assets/%E0%A4%A.js'])(
    'answers the malformed path %s with 400, reporting nothing',
    async (path) => {
      const before = context.reported.length;
      const response = await user.agent.get(path);
      expect(response.status).toBe(400);
      expect(response.body.error.code).toBe('request.bad_url');
      expect(context.reported.length).toBe(before);
    },
  );

  it('says to send JSON when the content type is wrong', async () => {
    const response = await user.agent
      .post('/api/sheets')
      .set('Content-Type', 'text/plain')
      .send('{"title":"Plain text"}');
    expect(response.status).toBe(415);
    expect(response.body.error.message).toContain('send JSON (Content-Type: application/json)');
  });

  it('says to send JSON for a form post', async () => {
    const response = await user.agent.post('/api/sheets').type('form').send({ title: 'Form' });
    expect(response.status).toBe(415);
    expect(response.body.error.message).toContain('send JSON (Content-Type: application/json)');
  });
});
