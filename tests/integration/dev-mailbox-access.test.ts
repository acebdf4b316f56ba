import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestContext,
  signUp,
  type SignedUpUser,
  type TestContext,
  MAIL_SUBJECTS,
  waitForMail,
} from './helpers';

let context: TestContext;
let admin: SignedUpUser;
let member: SignedUpUser;
let other: SignedUpUser;

beforeAll(async () => {
  context = await createTestContext();
  admin = await signUp(context, { name: 'Site Keeper' });
  await context.database.db.execute(
    // The first admin of a test site is made by hand, as an operator would.
    (await import('drizzle-orm')).sql`update users set role = 'admin' where id = ${admin.id}`,
  );
  member = await signUp(context, { name: 'Reading Member' });
  other = await signUp(context, { name: 'Other Member' });
  for (const user of [member, other])
    await context.agent().post('/api/auth/password-reset').send({ email: user.email });
  await waitForMail(context.mailFake, member.email, MAIL_SUBJECTS.reset);
  await waitForMail(context.mailFake, other.email, MAIL_SUBJECTS.reset);
});
afterAll(async () => {
  await context.close();
});

type Listed = { to: string[]; text: string };

describe('development mailbox access', () => {
  it('answers a signed-out caller with 401 and shows no mail', async () => {
    const response = await context.anonymous().get('/api/dev/mailbox');
    expect(response.status).toBe(401);
    expect(JSON.stringify(response.body)).not.toContain('reset-password');
  });

  it('shows a member only the mail sent to their own address', async () => {
    const response = await member.agent.get('/api/dev/mailbox');
    expect(response.status).toBe(200);
    const messages = response.body.messages as Listed[];
    expect(messages.some((message) => message.to.includes(member.email))).toBe(true);
    expect(messages.every((message) => message.to.every((to) => to === member.email))).toBe(true);
  });

  it('shows the site admin every captured mail', async () => {
    const response = await admin.agent.get('/api/dev/mailbox');
    expect(response.status).toBe(200);
    const recipients = (response.body.messages as Listed[]).flatMap((message) => message.to);
    expect(recipients).toEqual(expect.arrayContaining([member.email, other.email]));
  });
});
