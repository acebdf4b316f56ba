import { execFile } from 'node:child_process';
import { chown, mkdir, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);

export interface EnsurePostgresOptions {
  /** Data directory; created and initialised on first use, reused afterwards. */
  dataDir: string;
  port: number;
  database: string;
  /** Progress lines (first start, install); silent by default. */
  log?: (line: string) => void;
}

export interface LocalPostgres {
  /** Connection URL over TCP on 127.0.0.1 with trust auth for the `meander` role. */
  url: string;
  /** Stops the server if this call started it (a server that was already running is left alone). */
  stop(): Promise<void>;
}

/** The role the app connects as; created by initdb (`-U`), so no password is involved. */
const SUPERUSER = 'meander';
const SERVICE_ACCOUNT = 'postgres';

/**
 * Starts Debian's PostgreSQL on 127.0.0.1 with a private data directory: initdb on first use,
 * reuse afterwards (a second start loses nothing), a stale postmaster.pid from a killed run is
 * removed, the database is created if missing. initdb refuses to run as root, so as root the
 * directories are handed to the `postgres` account and the binaries run through `runuser`.
 */
export async function ensurePostgres(options: EnsurePostgresOptions): Promise<LocalPostgres> {
  const log = options.log ?? (() => undefined);
  const dataDir = path.resolve(options.dataDir);
  // Socket and server log live beside the data, in a directory the server's account can write.
  const socketDir = path.join(path.dirname(dataDir), `${path.basename(dataDir)}-run`);
  const binDir = await findPostgresBinaries(log);
  const asRoot = process.getuid?.() === 0;
  const exec = (binary: string, args: string[]) => runAs(asRoot, path.join(binDir, binary), args);

  // The parent keeps the usual mode (the server's account must reach through it); only the data is private.
  await mkdir(path.dirname(dataDir), { recursive: true });
  await mkdir(dataDir, { recursive: true, mode: 0o700 });
  await mkdir(socketDir, { recursive: true, mode: 0o700 });
  if (asRoot) await chownToService([dataDir, socketDir]);

  if (!(await exists(path.join(dataDir, 'PG_VERSION')))) {
    log(`initialising PostgreSQL data directory ${dataDir}`);
    await exec('initdb', ['-D', dataDir, '-U', SUPERUSER, '--auth=trust', '--encoding=UTF8', '--no-locale']);
    await restrictToLoopback(dataDir);
    if (asRoot) await chownToService([dataDir]);
  }
  await removeStalePid(dataDir, exec);

  const serverOptions = `-k ${socketDir} -p ${options.port} -c listen_addresses=127.0.0.1`;
  const logFile = path.join(socketDir, 'postgres.log');
  // A server someone else started (an `npm start` in another terminal) is reused and left running.
  const startedHere = !(await isRunning(dataDir, exec));
  if (startedHere) {
    log(`starting PostgreSQL on 127.0.0.1:${options.port}`);
    await exec('pg_ctl', [
      'start',
      '-w',
      '-t',
      '60',
      '-D',
      dataDir,
      '-l',
      logFile,
      '-o',
      serverOptions,
    ]).catch(async (error: unknown) => {
      const tail = await readFile(logFile, 'utf8').catch(() => '');
      throw new Error(
        `PostgreSQL did not start (${errorText(error)}).\n${tail.split('\n').slice(-15).join('\n')}`,
      );
    });
  }
  // A server that was already running may listen elsewhere; postmaster.pid says where.
  const running = await readPostmasterPid(dataDir);
  const port = running?.port ?? options.port;
  if (port !== options.port) log(`PostgreSQL for ${dataDir} was already running on port ${port}; using it`);
  await createDatabaseIfMissing({ ...options, port }, running?.socketDir ?? socketDir, exec);

  return {
    url: `postgres://${SUPERUSER}@127.0.0.1:${port}/${options.database}`,
    async stop() {
      if (startedHere && (await isRunning(dataDir, exec)))
        await exec('pg_ctl', ['stop', '-m', 'fast', '-w', '-D', dataDir]);
    },
  };
}

/** The highest installed version's bin directory; installs Debian's package when root. */
async function findPostgresBinaries(log: (line: string) => void): Promise<string> {
  const found = await highestVersionBin();
  if (found) return found;
  if (process.getuid?.() !== 0) {
    throw new Error(
      'PostgreSQL is not installed (no /usr/lib/postgresql/*/bin/initdb). Install it with:\n' +
        '  sudo apt-get update && sudo apt-get install -y postgresql',
    );
  }
  log('PostgreSQL is missing: apt-get install -y postgresql');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  await run('apt-get', ['update'], { env });
  await run('apt-get', ['install', '-y', 'postgresql'], { env, maxBuffer: 64 * 1024 * 1024 });
  const installed = await highestVersionBin();
  if (!installed)
    throw new Error('apt-get installed postgresql but no initdb was found under /usr/lib/postgresql');
  return installed;
}

async function highestVersionBin(): Promise<string | null> {
  const root = '/usr/lib/postgresql';
  const versions = await readdir(root).catch(() => [] as string[]);
  const candidates = versions
    .filter((name) => /^\d+(\.\d+)?$/.test(name))
    .sort((a, b) => Number(b) - Number(a))
    .map((version) => path.join(root, version, 'bin'));
  for (const bin of candidates) if (await exists(path.join(bin, 'initdb'))) return bin;
  return null;
}

type Exec = (binary: string, args: string[]) => Promise<{ stdout: string; stderr: string }>;

async function runAs(asRoot: boolean, binary: string, args: string[]) {
  const [command, commandArgs] = asRoot
    ? ['runuser', ['-u', SERVICE_ACCOUNT, '--', binary, ...args]]
    : [binary, args];
  try {
    // cwd '/' so the service account never needs access to the caller's working directory.
    return await run(command, commandArgs, { cwd: '/', maxBuffer: 16 * 1024 * 1024 });
  } catch (error) {
    throw new Error(`${path.basename(binary)} failed: ${errorText(error)}`, { cause: error });
  }
}

function errorText(error: unknown): string {
  if (
    error &&
    typeof error === 'object' &&
    'stderr' in error &&
    typeof error.stderr === 'string' &&
    error.stderr.trim()
  ) {
    return error.stderr.trim();
  }
  return error instanceof Error ? error.message : String(error);
}

/** Trust auth, but only for connections from this machine (loopback TCP and the socket). */
async function restrictToLoopback(dataDir: string): Promise<void> {
  const hba = [
    '# Written by Meander: trust for local connections only; the server listens on 127.0.0.1.',
    'local   all   all                 trust',
    'host    all   all   127.0.0.1/32  trust',
    'host    all   all   ::1/128       trust',
    '',
  ].join('\n');
  await writeFile(path.join(dataDir, 'pg_hba.conf'), hba);
}

async function chownToService(paths: string[]): Promise<void> {
  const { stdout } = await run('id', ['-u', SERVICE_ACCOUNT]);
  const { stdout: gid } = await run('id', ['-g', SERVICE_ACCOUNT]);
  for (const target of paths) await chownRecursive(target, Number(stdout.trim()), Number(gid.trim()));
}

async function chownRecursive(target: string, uid: number, gid: number): Promise<void> {
  await chown(target, uid, gid);
  const info = await stat(target);
  if (!info.isDirectory()) return;
  for (const entry of await readdir(target)) await chownRecursive(path.join(target, entry), uid, gid);
}

async function isRunning(dataDir: string, exec: Exec): Promise<boolean> {
  try {
    await exec('pg_ctl', ['status', '-D', dataDir]);
    return true;
  } catch {
    return false;
  }
}

/**
 * A run that was killed leaves postmaster.pid behind. If the pid it names is not alive, the file
 * is stale and pg_ctl would refuse to start, so it goes (the data itself is untouched; PostgreSQL
 * recovers from its write-ahead log on start).
 */
async function removeStalePid(dataDir: string, exec: Exec): Promise<void> {
  const pidFile = path.join(dataDir, 'postmaster.pid');
  const content = await readFile(pidFile, 'utf8').catch(() => null);
  if (content === null) return;
  const pid = Number(content.split('\n')[0]);
  if (Number.isInteger(pid) && pid > 0 && isAlive(pid) && (await isRunning(dataDir, exec))) return;
  await rm(pidFile, { force: true });
}

/** postmaster.pid: line 4 is the port, line 5 the socket directory (PostgreSQL's pidfile.h). */
async function readPostmasterPid(dataDir: string): Promise<{ port: number; socketDir: string } | null> {
  const content = await readFile(path.join(dataDir, 'postmaster.pid'), 'utf8').catch(() => null);
  if (content === null) return null;
  const lines = content.split('\n');
  const port = Number(lines[3]);
  const socketDir = lines[4]?.trim();
  return Number.isInteger(port) && port > 0 && socketDir ? { port, socketDir } : null;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to another user (the postgres account).
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

async function createDatabaseIfMissing(
  options: EnsurePostgresOptions,
  socketDir: string,
  exec: Exec,
): Promise<void> {
  const psql = ['-h', socketDir, '-p', String(options.port), '-U', SUPERUSER, '-d', 'postgres', '-tA'];
  const { stdout } = await exec('psql', [
    ...psql,
    '-c',
    `SELECT 1 FROM pg_database WHERE datname = '${options.database.replace(/'/g, "''")}'`,
  ]);
  if (stdout.trim() === '1') return;
  await exec('createdb', ['-h', socketDir, '-p', String(options.port), '-U', SUPERUSER, options.database]);
}

async function exists(target: string): Promise<boolean> {
  try {
    await stat(target);
    return true;
  } catch {
    return false;
  }
}
