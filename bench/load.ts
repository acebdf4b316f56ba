import autocannon, { type Options as CannonOptions, type RequestSpec } from 'autocannon';
import { DEMO_ACCOUNTS } from '../server/seed';
import { freePort } from '../tests/setup/services';
import { startBareServer } from './load/bare-server';
import { startLoadStack } from './load/stack';

/**
 * `npm run bench:load [-- --duration S] [--rate N] [--connections N]`: autocannon against the app
 * on loopback, for a sheet read (GET /api/sheets/:id) and a version save (POST
 * /api/sheets/:id/versions), at a fixed arrival rate and at saturation, beside the same figures
 * for a bare node:http server that runs the same SQL. One JSON line per run, then one ratio line
 * per route and mode. Bounded: 8 runs of `duration` seconds each.
 */
interface Options {
  duration: number;
  rate: number;
  connections: number;
}

function parseOptions(argv: string[]): Options {
  const options: Options = { duration: 10, rate: 300, connections: 32 };
  for (let i = 0; i < argv.length; i++) {
    const flag = argv[i]!.replace(/^--/, '');
    const value = Number(argv[++i]);
    if (!(flag in options) || !Number.isInteger(value) || value < 1)
      throw new Error(`use --duration S, --rate N, --connections N (whole numbers), not "${argv[i - 1]}"`);
    options[flag as keyof Options] = value;
  }
  if (options.duration > 60 || options.connections > 256) throw new Error('at most 60 s and 256 connections');
  return options;
}

interface SaveTarget {
  id: string;
  version: number;
}

interface RunFigures {
  rps: number;
  p50: number;
  p95: number;
  p99: number;
  non2xx: number;
  /** Count of each non-2xx status. */
  failures: Record<string, number>;
  errors: number;
}

function percentile(sorted: number[], p: number): number {
  return sorted.length === 0
    ? Number.NaN
    : sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function run(options: CannonOptions): Promise<RunFigures> {
  const times: number[] = [];
  const instance = autocannon(options);
  const failures: Record<string, number> = {};
  instance.on('response', (_client, status, _bytes, ms) => {
    times.push(ms);
    if (status >= 300) failures[status] = (failures[status] ?? 0) + 1;
  });
  const result = await instance;
  times.sort((a, b) => a - b);
  const round = (value: number) => Math.round(value * 100) / 100;
  return {
    rps: round(result.requests.total / result.duration),
    p50: round(percentile(times, 50)),
    p95: round(percentile(times, 95)),
    p99: round(percentile(times, 99)),
    non2xx: result.non2xx,
    failures,
    errors: result.errors + result.timeouts,
  };
}

async function main() {
  const options = parseOptions(process.argv.slice(2));
  const stack = await startLoadStack(await freePort());
  const bare = await startBareServer(stack.database.db);
  try {
    const origin = stack.app.url;
    const member = DEMO_ACCOUNTS.find((account) => account.role === 'member')!;
    const signIn = await fetch(`${origin}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Origin: origin },
      body: JSON.stringify({ email: member.email, password: member.password }),
    });
    if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status}`);
    const cookie = signIn.headers.get('set-cookie')!.split(';')[0]!;
    const headers = { Cookie: cookie, Origin: origin, 'Content-Type': 'application/json' };
    const api = async (path: string, init: RequestInit = {}) => {
      const response = await fetch(`${origin}${path}`, { ...init, headers });
      if (!response.ok) throw new Error(`${path}: ${response.status}`);
      return (await response.json()) as Record<string, unknown>;
    };
    const [first] = (await api('/api/sheets')).sheets as { id: string }[];
    const sheet = await api(`/api/sheets/${first!.id}`);
    // A sheet per request in flight (each connection has one at a time): no two saves of one
    // sheet overlap, so every save is based on the current version and none conflicts.
    const allTargets: SaveTarget[] = [];
    const freeTargets: SaveTarget[] = [];
    for (let i = 0; i < options.connections; i++) {
      const created = await api('/api/sheets', {
        method: 'POST',
        body: JSON.stringify({ title: `Load ${i}`, document: sheet.document }),
      });
      allTargets.push({ id: String(created.id), version: Number(created.version) });
    }
    // Before each run: every sheet free, at its current version (a run's last answers may never
    // have reached the benchmark when it stopped).
    const refreshTargets = async () => {
      freeTargets.length = 0;
      for (const target of allTargets) {
        target.version = Number((await api(`/api/sheets/${target.id}`)).version);
        freeTargets.push(target);
      }
    };

    const results: Record<string, RunFigures> = {};
    for (const op of ['read', 'save'] as const) {
      for (const mode of ['rate', 'saturation'] as const) {
        for (const [target, url] of [
          ['app', origin],
          ['bare', bare.url],
        ] as const) {
          const request: RequestSpec =
            op === 'read'
              ? { method: 'GET', path: `/api/sheets/${first!.id}` }
              : {
                  method: 'POST',
                  // autocannon clears a connection's context between requests, so a sheet is
                  // taken from the free list for each save and put back when its answer arrives.
                  setupRequest: (spec, context) => {
                    const own = freeTargets.pop();
                    if (!own)
                      throw new Error('no free sheet to save on (more requests in flight than sheets)');
                    context.target = own;
                    return {
                      ...spec,
                      path: `/api/sheets/${own.id}/versions`,
                      body: JSON.stringify({
                        baseVersion: own.version,
                        message: 'load benchmark',
                        document: sheet.document,
                      }),
                    };
                  },
                  onResponse: (status, _body, context) => {
                    const own = context.target as SaveTarget;
                    if (status === 201) own.version += 1;
                    freeTargets.push(own);
                  },
                };
          await refreshTargets();
          const figures = await run({
            url,
            connections: options.connections,
            duration: options.duration,
            overallRate: mode === 'rate' ? options.rate : undefined,
            headers,
            requests: [request],
          });
          results[`${target}-${op}-${mode}`] = figures;
          process.stdout.write(`${JSON.stringify({ target, op, mode, ...figures })}\n`);
        }
        const app = results[`app-${op}-${mode}`]!;
        const base = results[`bare-${op}-${mode}`]!;
        const ratio = (a: number, b: number) => Math.round((a / b) * 100) / 100;
        process.stdout.write(
          `${JSON.stringify({
            ratio: `${op}-${mode}`,
            rpsAppOverBare: ratio(app.rps, base.rps),
            p50AppOverBare: ratio(app.p50, base.p50),
            p95AppOverBare: ratio(app.p95, base.p95),
            p99AppOverBare: ratio(app.p99, base.p99),
          })}\n`,
        );
      }
    }
  } finally {
    await bare.close();
    await stack.stop();
  }
}

main().catch((error: unknown) => {
  process.stderr.write(
    `load bench failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
  );
  process.exit(1);
});
