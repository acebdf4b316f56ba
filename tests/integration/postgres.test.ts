import { chmod, mkdtemp, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { ensurePostgres, type LocalPostgres } from '../../server/db/postgres';
import { freePort } from '../setup/services';

const roots: string[] = [];
const running: LocalPostgres[] = [];

afterAll(async () => {
  for (const server of running) await server.stop().catch(() => undefined);
  for (const root of roots) await rm(root, { recursive: true, force: true });
});

async function query(url: string, text: string) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    return await client.query(text);
  } finally {
    await client.end();
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

describe('ensurePostgres', () => {
  it('reuses its data directory after a killed run (stale postmaster.pid) and loses nothing', async () => {
    const root = await mkdtemp(path.join(os.tmpdir(), 'meander-pg-'));
    roots.push(root);
    await chmod(root, 0o755);
    const options = { dataDir: path.join(root, 'pg'), port: await freePort(), database: 'reuse_check' };

    const first = await ensurePostgres(options);
    running.push(first);
    await query(first.url, 'create table gauge (reading double precision)');
    await query(first.url, 'insert into gauge values (3.25)');
    await query(first.adminUrl, 'checkpoint');

    // Kill the server the hard way, as a crashed terminal would, leaving postmaster.pid behind.
    const pid = Number((await readFile(path.join(options.dataDir, 'postmaster.pid'), 'utf8')).split('\n')[0]);
    process.kill(pid, 'SIGKILL');
    for (let waited = 0; alive(pid) && waited < 10_000; waited += 50)
      await new Promise((resolve) => setTimeout(resolve, 50));
    // Backends notice the dead postmaster and exit; give them a moment to release shared memory.
    await new Promise((resolve) => setTimeout(resolve, 1000));

    const second = await ensurePostgres(options);
    running.push(second);
    const result = await query(second.url, 'select reading from gauge');
    expect(result.rows).toEqual([{ reading: 3.25 }]);
    await second.stop();
  });
});
