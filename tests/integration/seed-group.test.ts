import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { connectDatabase, type Database } from '../../server/db/client';
import { type MailFake, startMailFake } from '../../server/mail/mail-fake';
import { createMailer } from '../../server/mail/mailer';
import { DEMO_ACCOUNTS, seedDemo } from '../../server/seed';
import { DEMO_INVITEE } from '../../server/seed-group';
import { createTestDatabase, MAIL_SUBJECTS, waitForMail } from './helpers';

describe('the demo research group', () => {
  let testDb: Awaited<ReturnType<typeof createTestDatabase>>;
  let database: Database;
  let mailFake: MailFake;
  let mailer: ReturnType<typeof createMailer>;

  beforeAll(async () => {
    testDb = await createTestDatabase();
    database = connectDatabase(testDb.url, { max: 2 });
    mailFake = await startMailFake({ port: 0 });
    mailer = createMailer({
      host: '127.0.0.1',
      port: mailFake.port,
      from: 'Meander <no-reply@meander.example.test>',
    });
    await seedDemo(database.db, { mailer, appOrigin: 'http://meander.test' });
  });
  afterAll(async () => {
    mailer.close();
    await mailFake.stop();
    await database.close();
    await testDb.drop();
  });

  const query = async (statement: ReturnType<typeof sql>) => (await database.db.execute(statement)).rows;
  const idOf = async (email: string) =>
    (await query(sql`select id from users where email = ${email}`))[0]?.id as string;

  it('shares one sheet of its owner with an editor and a commenter, and none with the site admin', async () => {
    const [, maren, tomas, aino] = DEMO_ACCOUNTS;
    const shares = await query(sql`select s.title, o.email as owner, u.email, sh.role
      from sheet_shares sh join sheets s on s.id = sh.sheet_id join users u on u.id = sh.user_id
      join users o on o.id = s.owner_id order by sh.role`);
    expect(shares).toEqual([
      expect.objectContaining({ owner: maren!.email, email: aino!.email, role: 'commenter' }),
      expect.objectContaining({ owner: maren!.email, email: tomas!.email, role: 'editor' }),
    ]);
    const admin = await idOf(DEMO_ACCOUNTS[0]!.email);
    expect(await query(sql`select 1 from sheet_shares where user_id = ${admin}`)).toEqual([]);
    expect(await query(sql`select 1 from sheets where owner_id = ${admin}`)).toEqual([]);
  });

  it("has the editor's fork with a changed volatility, linked to the shared sheet", async () => {
    const tomas = await idOf(DEMO_ACCOUNTS[2]!.email);
    const [fork] = await query(sql`select f.id, f.forked_from, f.forked_from_version, f.current_version,
        src.title as source_title
      from sheets f join sheets src on src.id = f.forked_from where f.owner_id = ${tomas}`);
    expect(fork).toMatchObject({ forked_from_version: 1, current_version: 2 });
    const sigma = async (sheetId: string, number: number) =>
      (
        await query(sql`select p->>'value' as value from sheet_versions v,
          jsonb_array_elements(v.document->'cells') c, jsonb_array_elements(c->'params') p
          where v.sheet_id = ${sheetId} and v.number = ${number} and p->>'name' = 'sigma'`)
      )[0]?.value;
    expect(await sigma(fork!.forked_from as string, 1)).toBe('0.4');
    expect(await sigma(fork!.id as string, 2)).toBe('0.55');
  });

  it('has comment threads, one on a chart cell and one resolved, and a pending invitation mailed', async () => {
    const threads = await query(sql`select c.cell_id, c.resolved, v.document as document,
        (select count(*)::int from comments r where r.parent_id = c.id) as replies
      from comments c join sheets s on s.id = c.sheet_id
      join sheet_versions v on v.sheet_id = s.id and v.number = c.version_number
      where c.parent_id is null order by c.created_at`);
    const kindOf = (thread: (typeof threads)[number]) =>
      (thread.document as { cells: { id: string; kind: string }[] }).cells.find(
        (cell) => cell.id === thread.cell_id,
      )?.kind;
    expect(threads.map((thread) => [kindOf(thread), thread.resolved, thread.replies])).toEqual([
      ['chart', false, 1],
      ['params', true, 0],
    ]);
    expect(await query(sql`select email, role from sheet_invitations`)).toEqual([
      { email: DEMO_INVITEE, role: 'viewer' },
    ]);
    const mail = await waitForMail(mailFake, DEMO_INVITEE, MAIL_SUBJECTS.invitation);
    expect(mail.text).toMatch(/http:\/\/meander\.test\/invitations\/[A-Za-z0-9_-]{40,}/);
  });
});
