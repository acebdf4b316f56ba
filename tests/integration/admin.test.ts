import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUsersRepository } from '../../server/users/users.repository';
import { createTestContext, signUp, type SignedUpUser, type TestContext } from './helpers';

let context: TestContext;
let admin: SignedUpUser;
let member: SignedUpUser;

/** Promotes directly in the database: the first admin of a site comes from the seed, not the API. */
async function makeAdmin(user: SignedUpUser) {
  await createUsersRepository({ db: context.database.db }).updateRole(user.id, 'admin');
}

beforeAll(async () => {
  // This file's own database: the last-admin rule counts every admin on the site.
  context = await createTestContext();
  admin = await signUp(context, { name: 'Ada Site-Admin', email: 'ada.admin@example.test' });
  await makeAdmin(admin);
  member = await signUp(context, { name: 'Milo Member', email: 'milo.member@example.test' });
  for (let index = 0; index < 23; index += 1) {
    await signUp(context, {
      name: `Field Worker ${String(index).padStart(2, '0')}`,
      email: `field.worker${index}@example.test`,
    });
  }
});
afterAll(async () => {
  await context.close();
});

describe('admin routes', () => {
  it('answer 403 to a member and 401 without a session', async () => {
    const list = await member.agent.get('/api/admin/users');
    expect(list.status).toBe(403);
    expect(list.body.error.code).toBe('auth.forbidden');
    const patch = await member.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'admin' });
    expect(patch.status).toBe(403);
    expect((await member.agent.get('/api/auth/me')).body.role).toBe('member');
    expect((await context.agent().get('/api/admin/users')).status).toBe(401);
  });

  it('list users with a total and pages', async () => {
    const first = await admin.agent.get('/api/admin/users?page=1&pageSize=10');
    expect(first.status).toBe(200);
    expect(first.body.total).toBe(25);
    expect(first.body.users).toHaveLength(10);
    const last = await admin.agent.get('/api/admin/users?page=3&pageSize=10');
    expect(last.body.users).toHaveLength(5);
    const ids = new Set<string>();
    for (const page of [1, 2, 3]) {
      const response = await admin.agent.get(`/api/admin/users?page=${page}&pageSize=10`);
      for (const user of response.body.users) ids.add(user.id);
    }
    expect(ids.size).toBe(25);
    expect(first.body.users[0]).toEqual({
      id: expect.any(String),
      email: expect.stringMatching(/@example\.test$/),
      name: expect.any(String),
      role: expect.stringMatching(/^(member|admin)$/),
      createdAt: expect.any(String),
    });
    expect(first.body.users[0]).not.toHaveProperty('passwordHash');
  });

  it('search by name or e-mail, case-insensitively, with the total of matches', async () => {
    const byName = await admin.agent.get('/api/admin/users?search=FIELD%20worker%201');
    // Names are zero-padded: "Field Worker 10" … "Field Worker 19" contain it, "Field Worker 01" does not.
    expect(byName.body.total).toBe(10);
    const byEmail = await admin.agent.get('/api/admin/users?search=milo.member');
    expect(byEmail.body.users.map((user: { id: string }) => user.id)).toEqual([member.id]);
    const literalPercent = await admin.agent.get('/api/admin/users?search=%25');
    expect(literalPercent.body.total).toBe(0);
  });

  it('reject a bad page size with 400', async () => {
    const response = await admin.agent.get('/api/admin/users?pageSize=1000');
    expect(response.status).toBe(400);
    expect(response.body.error.path).toEqual(['pageSize']);
  });

  it('change a role, and the new admin can use admin routes', async () => {
    const promoted = await admin.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'admin' });
    expect(promoted.status).toBe(200);
    expect(promoted.body).toMatchObject({ id: member.id, role: 'admin' });
    expect((await member.agent.get('/api/admin/users')).status).toBe(200);
    const demoted = await admin.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'member' });
    expect(demoted.body.role).toBe('member');
    expect((await member.agent.get('/api/admin/users')).status).toBe(403);
  });

  it('refuse to demote the last admin with 409', async () => {
    const response = await admin.agent.patch(`/api/admin/users/${admin.id}`).send({ role: 'member' });
    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe('admin.last_admin');
    expect((await admin.agent.get('/api/auth/me')).body.role).toBe('admin');
  });

  it('never leave the site without an admin when two admins demote each other at once', async () => {
    await admin.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'admin' });
    const [first, second] = await Promise.all([
      admin.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'member' }),
      member.agent.patch(`/api/admin/users/${admin.id}`).send({ role: 'member' }),
    ]);
    expect([first.status, second.status].sort()).toEqual([200, 409]);
    const list = await (first.status === 200 ? admin : member).agent.get('/api/admin/users?pageSize=100');
    expect(list.body.users.filter((user: { role: string }) => user.role === 'admin')).toHaveLength(1);
  });

  it('answer 404 for an unknown user and 400 for an unknown role', async () => {
    const current = (await admin.agent.get('/api/auth/me')).body.role === 'admin' ? admin : member;
    expect((await current.agent.patch('/api/admin/users/nosuchuser').send({ role: 'admin' })).status).toBe(
      404,
    );
    const badRole = await current.agent.patch(`/api/admin/users/${member.id}`).send({ role: 'owner' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.path).toEqual(['role']);
  });
});
