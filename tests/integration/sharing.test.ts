import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestContext,
  signUp,
  type SignedUpUser,
  type TestContext,
  uniqueEmail,
  waitForMail,
  MAIL_SUBJECTS,
} from './helpers';

let context: TestContext;

beforeAll(async () => {
  context = await createTestContext();
});
afterAll(async () => {
  await context.close();
});

/** An invented sheet: nitrate in a drainage ditch, decaying with noisy inflow. */
function ditchDocument(title: string) {
  return {
    schemaVersion: 1,
    title,
    cells: [
      { id: 'why', kind: 'note', text: 'Nitrate after fertiliser runoff.' },
      {
        id: 'p',
        kind: 'params',
        params: [
          { name: 'd', value: 0.3 },
          { name: 'q', value: 0.2 },
        ],
      },
      {
        id: 'm',
        kind: 'model',
        states: [{ name: 'C', initial: '5', drift: '-d * C', diffusion: { F: 'q * C' } }],
        noises: [{ name: 'F' }],
      },
      { id: 'run', kind: 'simulation', model: 'm', t1: 4, steps: 40, paths: 100, seed: 3 },
    ],
  };
}

async function ownedSheet(owner: SignedUpUser, title = 'Ditch nitrate') {
  const created = await owner.agent.post('/api/sheets').send({ title, document: ditchDocument(title) });
  expect(created.status).toBe(201);
  return created.body.id as string;
}

async function shareWith(owner: SignedUpUser, sheetId: string, user: SignedUpUser, role: string) {
  const response = await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email: user.email, role });
  expect(response.status).toBe(201);
}

/** The token in the accept link of the newest invitation mailed to `email`. */
async function invitationToken(email: string, after = 0): Promise<string> {
  const started = Date.now();
  for (;;) {
    const mails = context.mailFake.messages().filter((mail) => mail.to.includes(email));
    const mail = mails[mails.length - 1];
    if (mail && mails.length > after) {
      const token = /\/invitations\/([A-Za-z0-9_-]+)/.exec(mail.text)?.[1];
      if (!token) throw new Error(`no accept link in: ${mail.text}`);
      return token;
    }
    if (Date.now() - started > 5000) throw new Error(`no invitation mail to ${email}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

async function invitationRows(sheetId: string) {
  const result = await context.database.db.execute(
    sql`select email, role from sheet_invitations where sheet_id = ${sheetId} order by email`,
  );
  return result.rows;
}

describe('invitations by e-mail', () => {
  it('invites an unknown address; signing up with it and accepting gives the role, once', async () => {
    const owner = await signUp(context, { name: 'Rosalind Achterberg' });
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('invited');
    const invite = await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'commenter' });
    expect(invite.status).toBe(201);
    expect(invite.body).toMatchObject({ kind: 'invited', invitation: { email, role: 'commenter' } });
    // Seven days from now, give or take the test's own duration.
    const lifetime = Date.parse(invite.body.invitation.expiresAt) - Date.now();
    expect(Math.abs(lifetime - 7 * 24 * 3600 * 1000)).toBeLessThan(60_000);

    const token = await invitationToken(email);
    const mail = await waitForMail(context.mailFake, email, MAIL_SUBJECTS.invitation);
    expect(mail.subject).toContain('Rosalind Achterberg');
    const stored = await context.database.db.execute(
      sql`select token_hash from sheet_invitations where email = ${email}`,
    );
    expect(stored.rows[0]?.token_hash).not.toBe(token);

    const preview = await context.agent().get(`/api/invitations/${token}`);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      sheetTitle: 'Ditch nitrate',
      invitedBy: 'Rosalind Achterberg',
      email,
    });

    const invitee = await signUp(context, { email, name: 'Benedikt Oyelaran' });
    expect((await invitee.agent.get(`/api/sheets/${sheetId}`)).status).toBe(404);
    const accept = await invitee.agent.post(`/api/invitations/${token}/accept`);
    expect(accept.status).toBe(200);
    expect(accept.body).toEqual({ sheetId, role: 'commenter' });
    const sheet = await invitee.agent.get(`/api/sheets/${sheetId}`);
    expect(sheet.body).toMatchObject({ role: 'commenter', owner: { id: owner.id } });
    const list = await invitee.agent.get('/api/sheets');
    expect(list.body.sheets).toEqual([
      expect.objectContaining({
        id: sheetId,
        role: 'commenter',
        owner: { id: owner.id, name: 'Rosalind Achterberg' },
      }),
    ]);

    const again = await invitee.agent.post(`/api/invitations/${token}/accept`);
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe('invitations.invalid');
    const shares = await owner.agent.get(`/api/sheets/${sheetId}/shares`);
    expect(shares.body.people).toEqual([
      expect.objectContaining({ userId: owner.id, role: 'owner' }),
      { userId: invitee.id, name: 'Benedikt Oyelaran', email, role: 'commenter' },
    ]);
    expect(shares.body.invitations).toEqual([]);
  });

  it('updates the pending invitation when the same address is invited twice', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('twice');
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'viewer' }).expect(201);
    const firstToken = await invitationToken(email);
    await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: email.toUpperCase(), role: 'editor' })
      .expect(201);
    const secondToken = await invitationToken(email, 1);
    expect(await invitationRows(sheetId)).toEqual([{ email, role: 'editor' }]);
    const invitee = await signUp(context, { email });
    expect((await invitee.agent.post(`/api/invitations/${firstToken}/accept`)).status).toBe(404);
    const accept = await invitee.agent.post(`/api/invitations/${secondToken}/accept`);
    expect(accept.body).toEqual({ sheetId, role: 'editor' });
  });

  it('refuses an expired token with 410 and gives no role', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('late');
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'viewer' }).expect(201);
    const token = await invitationToken(email);
    await context.database.db.execute(
      sql`update sheet_invitations set expires_at = now() - interval '1 minute' where email = ${email}`,
    );
    const invitee = await signUp(context, { email });
    const accept = await invitee.agent.post(`/api/invitations/${token}/accept`);
    expect(accept.status).toBe(410);
    expect(accept.body.error.code).toBe('invitations.invalid');
    expect((await invitee.agent.get(`/api/sheets/${sheetId}`)).status).toBe(404);
    expect((await context.agent().get(`/api/invitations/${token}`)).status).toBe(410);
  });

  it('refuses an account with another address and keeps the invitation for the right one', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('meant-for');
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'viewer' }).expect(201);
    const token = await invitationToken(email);
    const someoneElse = await signUp(context);
    const wrong = await someoneElse.agent.post(`/api/invitations/${token}/accept`);
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.code).toBe('invitations.wrong_account');
    expect((await someoneElse.agent.get(`/api/sheets/${sheetId}`)).status).toBe(404);
    expect(await invitationRows(sheetId)).toEqual([{ email, role: 'viewer' }]);
    const invitee = await signUp(context, { email });
    expect((await invitee.agent.post(`/api/invitations/${token}/accept`)).status).toBe(200);
  });

  it('needs a session to accept, and a token to preview', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('anon');
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'viewer' }).expect(201);
    const token = await invitationToken(email);
    expect((await context.agent().post(`/api/invitations/${token}/accept`)).status).toBe(401);
    expect((await context.agent().get('/api/invitations/not-a-token')).status).toBe(404);
    expect(await invitationRows(sheetId)).toEqual([{ email, role: 'viewer' }]);
  });

  it('withdraws a pending invitation: the link stops working', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const email = uniqueEmail('withdrawn');
    await owner.agent.post(`/api/sheets/${sheetId}/shares`).send({ email, role: 'viewer' }).expect(201);
    const token = await invitationToken(email);
    expect((await owner.agent.delete(`/api/sheets/${sheetId}/invitations/${email}`)).status).toBe(204);
    expect((await owner.agent.delete(`/api/sheets/${sheetId}/invitations/${email}`)).status).toBe(404);
    const invitee = await signUp(context, { email });
    expect((await invitee.agent.post(`/api/invitations/${token}/accept`)).status).toBe(404);
  });
});

describe('sharing with registered people', () => {
  it('gives a registered address the role at once and mails a notice', async () => {
    const owner = await signUp(context, { name: 'Hanne Villadsen' });
    const sheetId = await ownedSheet(owner, 'Ditch shared');
    const colleague = await signUp(context, { name: 'Mateus Irikefe' });
    const share = await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: colleague.email.toUpperCase(), role: 'editor' });
    expect(share.status).toBe(201);
    expect(share.body).toEqual({
      kind: 'shared',
      person: { userId: colleague.id, name: 'Mateus Irikefe', email: colleague.email, role: 'editor' },
    });
    const sheet = await colleague.agent.get(`/api/sheets/${sheetId}`);
    expect(sheet.body.role).toBe('editor');
    const mail = await waitForMail(context.mailFake, colleague.email, MAIL_SUBJECTS.shared);
    expect(mail.subject).toBe('Hanne Villadsen shared "Ditch shared" with you');
    expect(mail.text).toContain(`/sheets/${sheetId}`);
  });

  it('refuses to share with the owner, and an unknown role, with 400', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const self = await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: owner.email, role: 'viewer' });
    expect(self.status).toBe(400);
    expect(self.body.error.code).toBe('shares.owner');
    const badRole = await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: uniqueEmail(), role: 'owner' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.path).toEqual(['role']);
  });

  it('changes a role, and revoking takes effect on the next request of that user', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const reader = await signUp(context);
    await shareWith(owner, sheetId, reader, 'viewer');
    expect((await reader.agent.patch(`/api/sheets/${sheetId}`).send({ title: 'Mine now' })).status).toBe(403);
    const change = await owner.agent
      .patch(`/api/sheets/${sheetId}/shares/${reader.id}`)
      .send({ role: 'editor' });
    expect(change.status).toBe(200);
    expect((await reader.agent.patch(`/api/sheets/${sheetId}`).send({ title: 'Edited' })).status).toBe(200);

    expect((await owner.agent.delete(`/api/sheets/${sheetId}/shares/${reader.id}`)).status).toBe(204);
    // The same session, the very next request.
    const after = await reader.agent.get(`/api/sheets/${sheetId}`);
    expect(after.status).toBe(404);
    expect((await reader.agent.get('/api/sheets')).body.sheets).toEqual([]);
    expect((await owner.agent.delete(`/api/sheets/${sheetId}/shares/${reader.id}`)).status).toBe(404);
  });

  it('transfers ownership to an editor; the old owner becomes an editor', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const editor = await signUp(context);
    const viewer = await signUp(context);
    await shareWith(owner, sheetId, editor, 'editor');
    await shareWith(owner, sheetId, viewer, 'viewer');

    const toViewer = await owner.agent.post(`/api/sheets/${sheetId}/owner`).send({ userId: viewer.id });
    expect(toViewer.status).toBe(400);
    expect(toViewer.body.error.code).toBe('shares.transfer_needs_editor');

    const transfer = await owner.agent.post(`/api/sheets/${sheetId}/owner`).send({ userId: editor.id });
    expect(transfer.status).toBe(200);
    expect((await editor.agent.get(`/api/sheets/${sheetId}`)).body).toMatchObject({
      role: 'owner',
      owner: { id: editor.id },
    });
    expect((await owner.agent.get(`/api/sheets/${sheetId}`)).body.role).toBe('editor');
    const oldOwnerDelete = await owner.agent.delete(`/api/sheets/${sheetId}`);
    expect(oldOwnerDelete.status).toBe(403);
    expect(oldOwnerDelete.body.error.message).toMatch(/^You are an editor on this sheet/);
    const people = (await editor.agent.get(`/api/sheets/${sheetId}/shares`)).body.people;
    expect(people.map((person: { userId: string; role: string }) => [person.userId, person.role])).toEqual([
      [editor.id, 'owner'],
      [viewer.id, 'viewer'],
      [owner.id, 'editor'],
    ]);
  });

  it('shows pending invitations only to those who may share', async () => {
    const owner = await signUp(context);
    const sheetId = await ownedSheet(owner);
    const viewer = await signUp(context);
    await shareWith(owner, sheetId, viewer, 'viewer');
    await owner.agent
      .post(`/api/sheets/${sheetId}/shares`)
      .send({ email: uniqueEmail(), role: 'viewer' })
      .expect(201);
    expect((await owner.agent.get(`/api/sheets/${sheetId}/shares`)).body.invitations).toHaveLength(1);
    expect((await viewer.agent.get(`/api/sheets/${sheetId}/shares`)).body.invitations).toEqual([]);
  });
});
