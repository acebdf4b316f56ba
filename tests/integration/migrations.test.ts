import { randomBytes } from 'node:crypto';
import { cp, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { migrate as runMigrations } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { connectDatabase, type Database } from '../../server/db/client';
import { migrate, MIGRATIONS_FOLDER } from '../../server/db/migrate';

/**
 * An empty database (not the migrated template), to replay migrations from the start. As in
 * helpers.ts, the superuser creates it for the app's role, which may not create databases.
 */
async function createEmptyDatabase() {
  const appUrl = new URL(inject('databaseUrl'));
  const adminUrl = new URL(inject('databaseAdminUrl'));
  adminUrl.pathname = '/postgres';
  const name = `meander_m_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl.toString() });
  await admin.connect();
  await admin.query(`CREATE DATABASE ${name} OWNER ${appUrl.username}`).finally(() => admin.end());
  const url = new URL(appUrl);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const client = new pg.Client({ connectionString: adminUrl.toString() });
      await client.connect();
      await client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`).finally(() => client.end());
    },
  };
}

/** A copy of the migrations folder whose journal stops after the migration tagged `lastTag`. */
async function migrationsUpTo(lastTag: string): Promise<string> {
  const folder = await mkdtemp(path.join(os.tmpdir(), 'meander-migrations-'));
  await cp(MIGRATIONS_FOLDER, folder, { recursive: true });
  const journalPath = path.join(folder, 'meta', '_journal.json');
  const journal = JSON.parse(await readFile(journalPath, 'utf8')) as { entries: { tag: string }[] };
  const last = journal.entries.findIndex((entry) => entry.tag === lastTag);
  if (last === -1) throw new Error(`no migration tagged ${lastTag}`);
  journal.entries = journal.entries.slice(0, last + 1);
  await writeFile(journalPath, JSON.stringify(journal));
  return folder;
}

describe('migration 0001: digests carry their engine version', () => {
  let empty: Awaited<ReturnType<typeof createEmptyDatabase>>;
  let database: Database;
  let oldFolder: string;

  beforeAll(async () => {
    empty = await createEmptyDatabase();
    database = connectDatabase(empty.url, { max: 1 });
    oldFolder = await migrationsUpTo('0000_initial');
  });
  afterAll(async () => {
    await database.close();
    await empty.drop();
    await rm(oldFolder, { recursive: true, force: true });
  });

  it('gives existing digests engine version 1 and leaves versions without digests at null', async () => {
    const db = database.db;
    await runMigrations(db, { migrationsFolder: oldFolder });
    // Rows as the first schema stored them: digests were a bare map of cell id to digest.
    await db.execute(sql`insert into users (id, email, name, password_hash)
      values ('olduser01', 'hedda.marsh@example.test', 'Hedda Marsh', 'x')`);
    await db.execute(sql`insert into sheets (id, owner_id, title, current_version)
      values ('oldsheet01', 'olduser01', 'Lake temperature anomaly', 2)`);
    await db.execute(sql`insert into sheet_versions (sheet_id, number, document, author_id, message, parent_number, digests)
      values ('oldsheet01', 1, '{"schemaVersion":1,"title":"Lake","cells":[]}', 'olduser01', 'Created', null, '{}'),
             ('oldsheet01', 2, '{"schemaVersion":1,"title":"Lake","cells":[]}', 'olduser01', 'Ran it', 1,
              '{"run":"d41d8cd98f00b204"}')`);

    await migrate(db);

    const rows = await db.execute(
      sql`select number, digests, engine_version from sheet_versions where sheet_id = 'oldsheet01' order by number`,
    );
    expect(rows.rows).toEqual([
      { number: 1, digests: {}, engine_version: null },
      { number: 2, digests: { run: 'd41d8cd98f00b204' }, engine_version: 1 },
    ]);
    const sheet = await db.execute(sql`select forked_from_version from sheets where id = 'oldsheet01'`);
    expect(sheet.rows).toEqual([{ forked_from_version: null }]);
  });

  it('refuses digests without an engine version from now on', async () => {
    const attempt = database.db.execute(sql`insert into sheet_versions
      (sheet_id, number, document, author_id, message, parent_number, digests)
      values ('oldsheet01', 3, '{}', 'olduser01', 'No engine', 2, '{"run":"abc"}')`);
    await expect(attempt).rejects.toThrow();
  });
});
