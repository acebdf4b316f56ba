import { chmod, mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensurePostgres, type LocalPostgres } from '../../server/db/postgres';
import { freePort } from '../setup/services';

const roots: string[] = [];
const running: LocalPostgres[] = [];

async function newRoot(): Promise<string> {
  const root = await mkdtemp(path.join(os.tmpdir(), 'meander-pg-'));
  roots.push(root);
  await chmod(root, 0o755);
  return root;
}

async function query(url: string, text: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await client.query(text);
  } finally {
    await client.end();
  }
}

afterAll(async () => {
  for (const server of running) await server.stop().catch(() => undefined);
  for (const root of roots) await rm(root, { recursive: true, force: true });
});

describe('the local PostgreSQL is locked down', () => {
  let root: string;
  let server: LocalPostgres;
  let port: number;
  beforeAll(async () => {
    root = await newRoot();
    port = await freePort();
    server = await ensurePostgres({ dataDir: path.join(root, 'pg'), port, database: 'locked' });
    running.push(server);
  });

  it('keeps a generated password in a file only its owner can read', async () => {
    const file = path.join(root, 'pg-password');
    expect((await stat(file)).mode & 0o777).toBe(0o600);
    const password = (await readFile(file, 'utf8')).trim();
    expect(password.length).toBeGreaterThanOrEqual(32);
    expect(new URL(server.url).password).toBe(password);
  });

  it('refuses a TCP connection without the password, for any role', async () => {
    for (const user of ['meander_app', 'meander', 'postgres'])
      await expect(query(`postgres://${user}@127.0.0.1:${port}/locked`, 'select 1')).rejects.toThrow(
        /password|authentication|no pg_hba/i,
      );
    const wrong = new URL(server.url);
    wrong.password = 'not-the-password';
    await expect(query(wrong.toString(), 'select 1')).rejects.toThrow(/password authentication failed/);
  });

  it('connects the app as a role that is not a superuser and owns its tables', async () => {
    await query(server.url, 'create table reservoir (level double precision)');
    const role = await query(
      server.url,
      'select current_user as name, rolsuper, rolcreaterole, rolcreatedb from pg_roles where rolname = current_user',
    );
    expect(role.rows).toEqual([
      { name: 'meander_app', rolsuper: false, rolcreaterole: false, rolcreatedb: false },
    ]);
    const owner = await query(server.url, "select tableowner from pg_tables where tablename = 'reservoir'");
    expect(owner.rows).toEqual([{ tableowner: 'meander_app' }]);
    const database = await query(
      server.url,
      'select pg_get_userbyid(datdba) as owner from pg_database where datname = current_database()',
    );
    expect(database.rows).toEqual([{ owner: 'meander_app' }]);
  });

  it('uses scram-sha-256 and listens on loopback only, with no trust rule', async () => {
    const settings = await query(
      server.adminUrl,
      "select name, setting from pg_settings where name in ('listen_addresses', 'password_encryption') order by name",
    );
    expect(settings.rows).toEqual([
      { name: 'listen_addresses', setting: '127.0.0.1' },
      { name: 'password_encryption', setting: 'scram-sha-256' },
    ]);
    const rules = await query(server.adminUrl, 'select type, auth_method from pg_hba_file_rules');
    expect(rules.rows.length).toBeGreaterThan(0);
    expect(rules.rows.map((rule) => rule.auth_method)).not.toContain('trust');
    expect(rules.rows.filter((rule) => rule.type === 'host').map((rule) => rule.auth_method)).toEqual(
      expect.arrayContaining(['scram-sha-256']),
    );
  });
});

describe('a cluster made by an earlier Meander (trust, superuser app role)', () => {
  it('is locked down on the next start and keeps its data, now owned by the app role', async () => {
    const root = await newRoot();
    const options = { dataDir: path.join(root, 'pg'), port: await freePort(), database: 'legacy' };
    const first = await ensurePostgres(options);
    running.push(first);
    // Recreate the old layout: tables owned by the superuser, trust for every local connection.
    await query(first.adminUrl, 'create table gauge (reading double precision)');
    await query(first.adminUrl, 'insert into gauge values (1.75)');
    await first.stop();
    await writeFile(
      path.join(options.dataDir, 'pg_hba.conf'),
      'local all all trust\nhost all all 127.0.0.1/32 trust\n',
    );

    const second = await ensurePostgres(options);
    running.push(second);
    expect((await query(second.url, 'select reading from gauge')).rows).toEqual([{ reading: 1.75 }]);
    expect(
      (await query(second.url, "select tableowner from pg_tables where tablename = 'gauge'")).rows,
    ).toEqual([{ tableowner: 'meander_app' }]);
    await expect(query(`postgres://meander@127.0.0.1:${options.port}/legacy`, 'select 1')).rejects.toThrow();
    await second.stop();
  });
});

describe('a cluster already running in its data directory', () => {
  it('is adopted, said so, and stopped on stop()', async () => {
    const root = await newRoot();
    const options = { dataDir: path.join(root, 'pg'), port: await freePort(), database: 'orphan' };
    // The orphan: a server whose starter was killed and never stopped it.
    const orphan = await ensurePostgres(options);
    running.push(orphan);
    const lines: string[] = [];
    const adopter = await ensurePostgres({ ...options, log: (line) => lines.push(line) });
    running.push(adopter);
    expect(lines.join('\n')).toMatch(/already running.*adopt/i);
    expect((await query(adopter.url, 'select 1 as up')).rows).toEqual([{ up: 1 }]);
    await adopter.stop();
    await expect(query(adopter.url, 'select 1')).rejects.toThrow();
  });

  it('is left running when the caller asks not to adopt it (npm run db:migrate beside npm start)', async () => {
    const root = await newRoot();
    const options = { dataDir: path.join(root, 'pg'), port: await freePort(), database: 'beside' };
    const owner = await ensurePostgres(options);
    running.push(owner);
    const guest = await ensurePostgres({ ...options, adoptRunning: false });
    await guest.stop();
    expect((await query(owner.url, 'select 1 as up')).rows).toEqual([{ up: 1 }]);
    await owner.stop();
  });
});
