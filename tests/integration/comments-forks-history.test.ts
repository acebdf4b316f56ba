import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '@shared/engine/version';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

let context: TestContext;
let owner: SignedUpUser;
let editor: SignedUpUser;
let commenter: SignedUpUser;
let viewer: SignedUpUser;

beforeAll(async () => {
  context = await createTestContext();
  owner = await signUp(context, { name: 'Esperanza Vukovic' });
  editor = await signUp(context, { name: 'Tarek Lindholm' });
  commenter = await signUp(context, { name: 'Nkechi Aaltonen' });
  viewer = await signUp(context, { name: 'Gustavo Mbeki' });
});
afterAll(async () => {
  await context.close();
});

/** An invented sheet: a beaver pond's water level under noisy rainfall, with a chart. */
function pondDocument(title: string, sigma = 0.15, withChart = true) {
  return {
    schemaVersion: 1,
    title,
    cells: [
      { id: 'intro', kind: 'note', text: 'Pond level behind a beaver dam.' },
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'e', value: 0.5 },
          { name: 'sigma', value: sigma },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'L', initial: '1', drift: 'e * (1.4 - L)', diffusion: { W: 'sigma' } }],
        noises: [{ name: 'W' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 6, steps: 60, paths: 100, seed: 8 },
      ...(withChart ? [{ id: 'level-fan', kind: 'chart', simulation: 'run', view: 'fan', state: 'L' }] : []),
    ],
  };
}

/** A sheet of the owner's, shared with the editor, the commenter and the viewer. */
async function teamSheet(title = 'Beaver pond'): Promise<string> {
  const created = await owner.agent.post('/api/sheets').send({ title, document: pondDocument(title) });
  const sheetId = created.body.id as string;
  for (const [user, role] of [
    [editor, 'editor'],
    [commenter, 'commenter'],
    [viewer, 'viewer'],
  ] as const) {
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email: user.email, role }).expect(201);
  }
  return sheetId;
}

/** Waits until the mail fake holds `count` messages whose subject contains `subject`. */
async function mailsAbout(subject: string, count: number) {
  const started = Date.now();
  for (;;) {
    const found = context.mailFake.messages().filter((mail) => mail.subject.includes(subject));
    if (found.length >= count) return found;
    if (Date.now() - started > 5000) throw new Error(`only ${found.length} mails about ${subject}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

describe('comments on cells', () => {
  it('keeps threads one reply deep, resolves and reopens them, and mails the people concerned', async () => {
    const sheetId = await teamSheet('Pond thread');
    const thread = await commenter.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'level-fan', version: 1, body: 'Does the band include **rain gauge** error?' });
    expect(thread.status).toBe(201);
    const threadMails = await mailsAbout('Nkechi Aaltonen commented on "Pond thread"', 2);
    expect(threadMails.flatMap((mail) => mail.to).sort()).toEqual([editor.email, owner.email].sort());

    const reply = await editor.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'level-fan', version: 1, body: 'No, only the model noise.', parentId: thread.body.id });
    expect(reply.status).toBe(201);
    const replyMails = await mailsAbout('Tarek Lindholm replied on "Pond thread"', 1);
    expect(replyMails.flatMap((mail) => mail.to)).toEqual([commenter.email]);
    expect(replyMails[0]!.text).toContain('> No, only the model noise.');

    const nested = await owner.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'level-fan', version: 1, body: 'Nested?', parentId: reply.body.id });
    expect(nested.status).toBe(400);
    expect(nested.body.error.code).toBe('comments.bad_parent');

    const resolve = await commenter.agent.patch(`/api/comments/${thread.body.id}`).send({ resolved: true });
    expect(resolve.status).toBe(200);
    expect(resolve.body.resolved).toBe(true);
    let list = await viewer.agent.get(`/api/sheets/${sheetId}/comments`);
    expect(list.body.threads).toEqual([
      expect.objectContaining({
        id: thread.body.id,
        cellId: 'level-fan',
        version: 1,
        resolved: true,
        author: { id: commenter.id, name: 'Nkechi Aaltonen' },
        body: 'Does the band include **rain gauge** error?',
        replies: [expect.objectContaining({ id: reply.body.id, body: 'No, only the model noise.' })],
      }),
    ]);
    await editor.agent.patch(`/api/comments/${thread.body.id}`).send({ resolved: false }).expect(200);
    const replyResolve = await editor.agent.patch(`/api/comments/${reply.body.id}`).send({ resolved: true });
    expect(replyResolve.status).toBe(400);
    list = await viewer.agent.get(`/api/sheets/${sheetId}/comments`);
    expect(list.body.threads[0].resolved).toBe(false);

    const edit = await commenter.agent
      .patch(`/api/comments/${thread.body.id}`)
      .send({ body: 'Does the band include gauge error?' });
    expect(edit.status).toBe(200);
    expect(edit.body.editedAt).toEqual(expect.any(String));
  });

  it('mails nobody about their own comment', async () => {
    const sheetId = await teamSheet('Pond quiet');
    await owner.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'p', version: 1, body: 'Note to self: check e.' })
      .expect(201);
    const mails = await mailsAbout('Esperanza Vukovic commented on "Pond quiet"', 1);
    expect(mails.flatMap((mail) => mail.to)).toEqual([editor.email]);
  });

  it('refuses a cell the version does not have, and a version the sheet does not have', async () => {
    const sheetId = await teamSheet('Pond cells');
    const noCell = await commenter.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'nowhere', version: 1, body: 'Hm' });
    expect(noCell.status).toBe(400);
    expect(noCell.body.error).toMatchObject({ code: 'comments.unknown_cell', path: ['cellId'] });
    const noVersion = await commenter.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'p', version: 5, body: 'Hm' });
    expect(noVersion.status).toBe(404);
    const count = await context.database.db.execute(
      sql`select count(*)::int as n from comments where sheet_id = ${sheetId}`,
    );
    expect(count.rows[0]?.n).toBe(0);
  });

  it('keeps a comment readable after its cell is deleted in a later version', async () => {
    const sheetId = await teamSheet('Pond chart gone');
    const thread = await commenter.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'level-fan', version: 1, body: 'This chart needs a unit.' })
      .expect(201);
    await editor.agent
      .post(`/api/sheets/${sheetId}/versions`)
      .send({
        baseVersion: 1,
        message: 'Drop the chart',
        document: pondDocument('Pond chart gone', 0.15, false),
      })
      .expect(201);
    const list = await viewer.agent.get(`/api/sheets/${sheetId}/comments`);
    expect(list.body.threads).toEqual([
      expect.objectContaining({
        id: thread.body.id,
        cellId: 'level-fan',
        version: 1,
        body: 'This chart needs a unit.',
        cellInCurrentVersion: false,
      }),
    ]);
  });

  it('lets the owner delete any thread, with its replies, and an author only their own', async () => {
    const sheetId = await teamSheet('Pond delete');
    const thread = await commenter.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'intro', version: 1, body: 'Typo in the note.' })
      .expect(201);
    const reply = await editor.agent
      .post(`/api/sheets/${sheetId}/comments`)
      .send({ cellId: 'intro', version: 1, body: 'Fixed next version.', parentId: thread.body.id })
      .expect(201);
    expect((await commenter.agent.delete(`/api/comments/${reply.body.id}`)).status).toBe(403);
    expect((await editor.agent.delete(`/api/comments/${reply.body.id}`)).status).toBe(204);
    expect((await owner.agent.delete(`/api/comments/${thread.body.id}`)).status).toBe(204);
    expect((await viewer.agent.get(`/api/sheets/${sheetId}/comments`)).body.threads).toEqual([]);
  });
});

describe('forks with lineage', () => {
  it('copies a version with its cell ids into a sheet the forker owns, linked back to the source', async () => {
    const sheetId = await teamSheet('Pond source');
    await owner.agent
      .post(`/api/sheets/${sheetId}/versions`)
      .send({
        baseVersion: 1,
        message: 'Noisier',
        document: pondDocument('Pond source', 0.3),
        digests: { run: 'feed01' },
      })
      .expect(201);
    const fork = await viewer.agent.post(`/api/sheets/${sheetId}/forks`).send({ version: 2 });
    expect(fork.status).toBe(201);
    const forked = await viewer.agent.get(`/api/sheets/${fork.body.id}`);
    expect(forked.body).toMatchObject({
      role: 'owner',
      title: 'Pond source (fork)',
      forkedFrom: sheetId,
      forkedFromVersion: 2,
      forkSource: { sheetId, title: 'Pond source', version: 2, canRead: true },
      digests: { run: 'feed01' },
      // The save named no engine version, so the server recorded its own; the fork keeps it.
      engineVersion: ENGINE_VERSION,
    });
    expect(forked.body.document.cells.map((cell: { id: string }) => cell.id)).toEqual([
      'intro',
      'p',
      'm',
      'run',
      'level-fan',
    ]);
    expect((await viewer.agent.get(`/api/sheets/${sheetId}`)).body.forkCount).toBe(1);
    // The owner cannot see the viewer's private fork.
    expect((await owner.agent.get(`/api/sheets/${sheetId}`)).body.forkCount).toBe(0);
    expect((await owner.agent.get(`/api/sheets/${sheetId}/forks`)).body.forks).toEqual([]);
    const forks = await viewer.agent.get(`/api/sheets/${sheetId}/forks`);
    expect(forks.body.forks).toEqual([expect.objectContaining({ id: fork.body.id, role: 'owner' })]);
  });

  it('keeps a fork working, and its lineage, after the source is deleted', async () => {
    const sheetId = await teamSheet('Pond doomed');
    const fork = await editor.agent.post(`/api/sheets/${sheetId}/forks`).send({ title: 'My pond' });
    expect(fork.status).toBe(201);
    expect((await owner.agent.delete(`/api/sheets/${sheetId}`)).status).toBe(204);
    const forked = await editor.agent.get(`/api/sheets/${fork.body.id}`);
    expect(forked.status).toBe(200);
    expect(forked.body).toMatchObject({
      title: 'My pond',
      forkedFrom: sheetId,
      forkSource: { sheetId, title: 'Pond doomed', version: 1, canRead: false },
    });
    const save = await editor.agent
      .post(`/api/sheets/${fork.body.id}/versions`)
      .send({ baseVersion: 1, message: 'Carry on', document: pondDocument('My pond', 0.2) });
    expect(save.status).toBe(201);
    expect((await editor.agent.post(`/api/sheets/${sheetId}/forks`).send({})).status).toBe(404);
  });

  it('refuses a version the source does not have with 404 and creates nothing', async () => {
    const sheetId = await teamSheet('Pond short');
    const before = await context.database.db.execute(sql`select count(*)::int as n from sheets`);
    const fork = await viewer.agent.post(`/api/sheets/${sheetId}/forks`).send({ version: 4 });
    expect(fork.status).toBe(404);
    const after = await context.database.db.execute(sql`select count(*)::int as n from sheets`);
    expect(after.rows[0]?.n).toBe(before.rows[0]?.n);
  });
});

describe('history', () => {
  it('restores an old version as a new one on top of the current, history untouched', async () => {
    const sheetId = await teamSheet('Pond restore');
    await editor.agent
      .post(`/api/sheets/${sheetId}/versions`)
      .send({
        baseVersion: 1,
        message: 'Wilder',
        document: pondDocument('Pond restore', 0.6),
        digests: { run: 'ab12' },
      })
      .expect(201);
    const restore = await editor.agent.post(`/api/sheets/${sheetId}/versions/1/restore`);
    expect(restore.status).toBe(201);
    expect(restore.body).toEqual({ number: 3 });
    const three = await viewer.agent.get(`/api/sheets/${sheetId}/versions/3`);
    expect(three.body).toMatchObject({
      number: 3,
      parent: 2,
      message: 'Restored version 1',
      digests: {},
      engineVersion: null,
    });
    const one = await viewer.agent.get(`/api/sheets/${sheetId}/versions/1`);
    expect(three.body.document).toEqual(one.body.document);
    const two = await viewer.agent.get(`/api/sheets/${sheetId}/versions/2`);
    expect(two.body.document.cells[1].params[1].value).toBe(0.6);
    const current = await editor.agent.post(`/api/sheets/${sheetId}/versions/3/restore`);
    expect(current.status).toBe(400);
  });

  it('answers the head cheaply: 304 while nothing changed, the new version after a save', async () => {
    const sheetId = await teamSheet('Pond head');
    const first = await viewer.agent.get(`/api/sheets/${sheetId}/head`);
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ version: 1, title: 'Pond head' });
    const etag = first.headers.etag as string;
    expect(etag).toEqual(expect.any(String));
    const unchanged = await viewer.agent.get(`/api/sheets/${sheetId}/head`).set('If-None-Match', etag);
    expect(unchanged.status).toBe(304);
    await editor.agent
      .post(`/api/sheets/${sheetId}/versions`)
      .send({ baseVersion: 1, message: 'Tweak', document: pondDocument('Pond head', 0.2) })
      .expect(201);
    const changed = await viewer.agent.get(`/api/sheets/${sheetId}/head`).set('If-None-Match', etag);
    expect(changed.status).toBe(200);
    expect(changed.body.version).toBe(2);
  });

  it('gives exactly one 201 and 49 409 to 50 concurrent saves by two editors on the same base', async () => {
    const sheetId = await teamSheet('Pond race');
    const secondEditor = await signUp(context, { name: 'Ilona Castellanos' });
    await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: secondEditor.email, role: 'editor' })
      .expect(201);
    const saves = await Promise.all(
      Array.from({ length: 50 }, (_unused, index) =>
        (index % 2 === 0 ? secondEditor : editor).agent.post(`/api/sheets/${sheetId}/versions`).send({
          baseVersion: 1,
          message: `try ${index}`,
          document: pondDocument('Pond race', 0.1 + index / 100),
        }),
      ),
    );
    const statuses = saves.map((response) => response.status);
    expect(statuses.filter((status) => status === 201)).toHaveLength(1);
    expect(statuses.filter((status) => status === 409)).toHaveLength(49);
    const versions = await context.database.db.execute(
      sql`select count(*)::int as n from sheet_versions where sheet_id = ${sheetId}`,
    );
    expect(versions.rows[0]?.n).toBe(2);
  });
});
