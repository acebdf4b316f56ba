import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SheetDocumentInput } from '@shared/sheet/document';
import { createTestContext, signUp, type SignedUpUser, TEST_ORIGIN, type TestContext } from './helpers';

let context: TestContext;
let owner: SignedUpUser;
let stranger: SignedUpUser;

beforeAll(async () => {
  context = await createTestContext();
  owner = await signUp(context, { name: 'Priya Okonkwo' });
  stranger = await signUp(context, { name: 'Lev Sarkis' });
});
afterAll(async () => {
  await context.close();
});

/** A small invented model: a mean-reverting reservoir level with one noise source. */
function reservoirDocument(title: string, reversionRate = 0.8): SheetDocumentInput {
  return {
    schemaVersion: 1,
    title,
    cells: [
      { id: 'intro', kind: 'note', text: 'Reservoir level anomaly around its seasonal mean.' },
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'k', value: reversionRate },
          { name: 'sigma', value: 0.35 },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'L', initial: '1.5', drift: '-k * L', diffusion: { W: 'sigma' } }],
        noises: [{ name: 'W' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 12, steps: 240, paths: 500, seed: 2718 },
    ],
  };
}

async function createSheet(user: SignedUpUser, title: string, document?: unknown) {
  const response = await user.agent
    .post('/api/sheets')
    .send(document === undefined ? { title } : { title, document });
  expect(response.status).toBe(201);
  return response.body as { id: string; title: string; version: number };
}

async function countVersions(sheetId: string): Promise<number> {
  const result = await context.database.db.execute(
    sql`select count(*)::int as n from sheet_versions where sheet_id = ${sheetId}`,
  );
  return Number(result.rows[0]?.n);
}

describe('creating and reading sheets', () => {
  it('creates an empty sheet at version 1 whose document carries the title', async () => {
    const created = await createSheet(owner, 'Empty draft');
    expect(created).toEqual({ id: expect.stringMatching(/^[a-z0-9]+$/), title: 'Empty draft', version: 1 });
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.status).toBe(200);
    expect(sheet.body).toMatchObject({
      id: created.id,
      title: 'Empty draft',
      owner: { id: owner.id, name: 'Priya Okonkwo' },
      version: 1,
      document: { schemaVersion: 1, title: 'Empty draft', cells: [] },
    });
    expect(Number.isNaN(Date.parse(sheet.body.updatedAt))).toBe(false);
  });

  it('creates a sheet from a document, fills schema defaults and keeps the document title in step', async () => {
    const created = await createSheet(owner, 'Reservoir anomaly', reservoirDocument('A different title'));
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body.document.title).toBe('Reservoir anomaly');
    const run = sheet.body.document.cells.find((cell: { id: string }) => cell.id === 'run');
    // Defaults from sheetDocumentSchema: Euler–Maruyama, t0 = 0, 101 saved times.
    expect(run).toMatchObject({ method: 'euler-maruyama', t0: 0, saveCount: 101 });
  });

  it('rejects a bad document with 400 and the path of the first issue', async () => {
    const document = reservoirDocument('Broken');
    (document.cells[3] as { paths: number }).paths = -5;
    const response = await owner.agent.post('/api/sheets').send({ title: 'Broken', document });
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('sheets.invalid_document');
    expect(response.body.error.path).toEqual(['document', 'cells', 3, 'paths']);
    expect(response.body.error.message).toMatch(/^document\.cells\.3\.paths: /);
  });

  it('rejects an empty title with 400 and writes nothing', async () => {
    const before = (await owner.agent.get('/api/sheets')).body.sheets.length;
    const response = await owner.agent.post('/api/sheets').send({ title: '   ' });
    expect(response.status).toBe(400);
    expect(response.body.error.path).toEqual(['title']);
    expect((await owner.agent.get('/api/sheets')).body.sheets.length).toBe(before);
  });

  it('lists only my sheets, newest change first, with version and updatedAt', async () => {
    const user = await signUp(context);
    const first = await createSheet(user, 'First');
    const second = await createSheet(user, 'Second');
    await createSheet(stranger, 'Not yours');
    // Saving a version makes the first sheet the most recently changed.
    await user.agent
      .post(`/api/sheets/${first.id}/versions`)
      .send({ baseVersion: 1, message: 'touch', document: reservoirDocument('First') });
    const list = await user.agent.get('/api/sheets');
    expect(list.status).toBe(200);
    expect(list.body.sheets.map((sheet: { id: string }) => sheet.id)).toEqual([first.id, second.id]);
    expect(list.body.sheets[0]).toMatchObject({ title: 'First', version: 2, updatedAt: expect.any(String) });
  });

  it('renames a sheet; the current document shows the new title', async () => {
    const created = await createSheet(owner, 'Working title');
    const rename = await owner.agent.patch(`/api/sheets/${created.id}`).send({ title: 'Final title' });
    expect(rename.status).toBe(200);
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body.title).toBe('Final title');
    expect(sheet.body.document.title).toBe('Final title');
  });

  it('deletes a sheet: 204, then 404 and gone from the list', async () => {
    const created = await createSheet(owner, 'To delete');
    expect((await owner.agent.delete(`/api/sheets/${created.id}`)).status).toBe(204);
    expect((await owner.agent.get(`/api/sheets/${created.id}`)).status).toBe(404);
    const list = await owner.agent.get('/api/sheets');
    expect(list.body.sheets.some((sheet: { id: string }) => sheet.id === created.id)).toBe(false);
  });
});

describe('who may see a sheet', () => {
  it('answers 401 to every sheet route without a session', async () => {
    const created = await createSheet(owner, 'Private');
    const anonymous = context.anonymous().set('Origin', TEST_ORIGIN);
    expect((await anonymous.get('/api/sheets')).status).toBe(401);
    expect((await anonymous.get(`/api/sheets/${created.id}`)).status).toBe(401);
    expect((await anonymous.post('/api/sheets').send({ title: 'x' })).status).toBe(401);
  });

  it("answers 404 for another user's sheet on every route, as if it did not exist", async () => {
    const created = await createSheet(owner, 'Owner only');
    const missing = await stranger.agent.get('/api/sheets/doesnotexist0000');
    const routes = [
      stranger.agent.get(`/api/sheets/${created.id}`),
      stranger.agent.patch(`/api/sheets/${created.id}`).send({ title: 'Taken over' }),
      stranger.agent.delete(`/api/sheets/${created.id}`),
      stranger.agent.get(`/api/sheets/${created.id}/versions`),
      stranger.agent.get(`/api/sheets/${created.id}/versions/1`),
      stranger.agent
        .post(`/api/sheets/${created.id}/versions`)
        .send({ baseVersion: 1, message: 'sneaky', document: reservoirDocument('x') }),
    ];
    for (const response of await Promise.all(routes)) {
      expect(response.status).toBe(404);
      expect(response.body).toEqual(missing.body);
    }
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body).toMatchObject({ title: 'Owner only', version: 1 });
  });

  it('answers 404, never 500, for malformed sheet ids and version numbers', async () => {
    const created = await createSheet(owner, 'Ids');
    const responses = await Promise.all([
      owner.agent.get('/api/sheets/NOT-AN-ID'),
      owner.agent.get(`/api/sheets/${'a'.repeat(300)}`),
      owner.agent.get("/api/sheets/'%3B%20drop%20table%20sheets"),
      owner.agent.get(`/api/sheets/${created.id}/versions/abc`),
      owner.agent.get(`/api/sheets/${created.id}/versions/0`),
      owner.agent.get(`/api/sheets/${created.id}/versions/99999999999`),
      owner.agent.get(`/api/sheets/${created.id}/versions/7`),
    ]);
    expect(responses.map((response) => response.status)).toEqual([404, 404, 404, 404, 404, 404, 404]);
    expect(context.reported).toEqual([]);
  });
});

describe('versions', () => {
  it('saves a version on the current base: 201 with the next number, the sheet moves on', async () => {
    const created = await createSheet(owner, 'Reservoir v', reservoirDocument('Reservoir v'));
    const save = await owner.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'Faster reversion',
      document: reservoirDocument('Reservoir v', 1.4),
      digests: { run: 'sha256:abc123' },
    });
    expect(save.status).toBe(201);
    expect(save.body).toEqual({ number: 2 });
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body.version).toBe(2);
    expect(sheet.body.document.cells[1].params[0]).toEqual({ name: 'k', value: 1.4 });
    expect(sheet.body.digests).toEqual({ run: 'sha256:abc123' });
  });

  it('takes the sheet title from a saved document', async () => {
    const created = await createSheet(owner, 'Before');
    const save = await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 1, message: 'Retitled in the editor', document: reservoirDocument('After') });
    expect(save.status).toBe(201);
    expect((await owner.agent.get(`/api/sheets/${created.id}`)).body.title).toBe('After');
  });

  it('rejects a save based on a stale version with 409, the current number, and writes nothing', async () => {
    const created = await createSheet(owner, 'Contested', reservoirDocument('Contested'));
    const first = await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 1, message: 'Mine first', document: reservoirDocument('Contested', 0.5) });
    expect(first.status).toBe(201);
    const stale = await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 1, message: 'Also based on 1', document: reservoirDocument('Overwritten?', 9) });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatchObject({ code: 'sheets.version_conflict', currentVersion: 2 });
    expect(stale.body.error.message).toEqual(expect.any(String));
    expect(await countVersions(created.id)).toBe(2);
    const sheet = await owner.agent.get(`/api/sheets/${created.id}`);
    expect(sheet.body).toMatchObject({ title: 'Contested', version: 2 });
    expect(sheet.body.document.cells[1].params[0].value).toBe(0.5);
  });

  it('lets exactly one of two simultaneous saves on the same base win', async () => {
    const created = await createSheet(owner, 'Race', reservoirDocument('Race'));
    const saves = await Promise.all(
      [0.3, 0.6, 0.9, 1.2].map((rate) =>
        owner.agent
          .post(`/api/sheets/${created.id}/versions`)
          .send({ baseVersion: 1, message: `rate ${rate}`, document: reservoirDocument('Race', rate) }),
      ),
    );
    expect(saves.map((response) => response.status).sort()).toEqual([201, 409, 409, 409]);
    expect(await countVersions(created.id)).toBe(2);
  });

  it('rejects a bad document or message on save with 400 and writes nothing', async () => {
    const created = await createSheet(owner, 'Strict');
    const badDocument = await owner.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'bad',
      document: { schemaVersion: 1, title: 'Strict', cells: [{ id: 'x', kind: 'spreadsheet' }] },
    });
    expect(badDocument.status).toBe(400);
    expect(badDocument.body.error.path.slice(0, 3)).toEqual(['document', 'cells', 0]);
    const longMessage = await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 1, message: 'x'.repeat(201), document: reservoirDocument('Strict') });
    expect(longMessage.status).toBe(400);
    expect(longMessage.body.error.path).toEqual(['message']);
    const unknownDigest = await owner.agent.post(`/api/sheets/${created.id}/versions`).send({
      baseVersion: 1,
      message: 'digest',
      document: reservoirDocument('Strict'),
      digests: { nosuchcell: 'abc' },
    });
    expect(unknownDigest.status).toBe(400);
    expect(unknownDigest.body.error.path).toEqual(['digests', 'nosuchcell']);
    expect(await countVersions(created.id)).toBe(1);
  });

  it('lists versions newest first with message, author and parent, and returns one with its document', async () => {
    const created = await createSheet(owner, 'History', reservoirDocument('History'));
    await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 1, message: 'Slower', document: reservoirDocument('History', 0.2) });
    await owner.agent
      .post(`/api/sheets/${created.id}/versions`)
      .send({ baseVersion: 2, message: 'Slower still', document: reservoirDocument('History', 0.1) });
    const list = await owner.agent.get(`/api/sheets/${created.id}/versions`);
    expect(list.status).toBe(200);
    expect(
      list.body.versions.map((version: { number: number; parent: number | null; message: string }) => [
        version.number,
        version.parent,
        version.message,
      ]),
    ).toEqual([
      [3, 2, 'Slower still'],
      [2, 1, 'Slower'],
      [1, null, 'Created'],
    ]);
    expect(list.body.versions[0].author).toEqual({ id: owner.id, name: 'Priya Okonkwo' });
    expect(list.body.versions[0]).not.toHaveProperty('document');

    const two = await owner.agent.get(`/api/sheets/${created.id}/versions/2`);
    expect(two.status).toBe(200);
    expect(two.body).toMatchObject({ number: 2, parent: 1, message: 'Slower' });
    expect(two.body.document.cells[1].params[0].value).toBe(0.2);
  });

  it('has no route that changes a saved version', async () => {
    const created = await createSheet(owner, 'Immutable');
    const put = await owner.agent.put(`/api/sheets/${created.id}/versions/1`).send({ message: 'rewritten' });
    const patch = await owner.agent
      .patch(`/api/sheets/${created.id}/versions/1`)
      .send({ message: 'rewritten' });
    const del = await owner.agent.delete(`/api/sheets/${created.id}/versions/1`);
    expect([put.status, patch.status, del.status]).toEqual([404, 404, 404]);
    expect((await owner.agent.get(`/api/sheets/${created.id}/versions/1`)).body.message).toBe('Created');
  });
});
