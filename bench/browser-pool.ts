import { existsSync } from 'node:fs';
import path from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { DEMO_ACCOUNTS } from '../server/seed';
import { freePort } from '../tests/setup/services';
import { median } from './median';
import { startLoadStack } from './load/stack';

/**
 * `npm run bench:browser [-- --rounds N]`: the browser worker pool's scaling in Debian's
 * Chromium, with the page cross-origin isolated (workers take chunks from a shared counter) and
 * without (the same page with COOP/COEP stripped: chunks handed out by message). For 1 and 2
 * workers (navigator.hardwareConcurrency set to workers + 1 through the DevTools protocol), the time from
 * pressing "Run all" to the merged result of a 200,000-path, 200-step run (`--paths`, `--steps`); medians over the rounds, and the
 * speed-up of 2 workers over 1. Needs `npm run build` first.
 */
function option(name: string, fallback: number): number {
  const at = process.argv.indexOf(name);
  if (at < 0) return fallback;
  const value = Number(process.argv[at + 1]);
  if (!Number.isInteger(value) || value < 1) throw new Error(`${name} needs a positive whole number`);
  return value;
}
const ROUNDS = option('--rounds', 3);
const PATHS = option('--paths', 200_000);
const STEPS = option('--steps', 200);

async function measure(
  context: BrowserContext,
  origin: string,
  sheetId: string,
  workers: number,
  expectIsolated: boolean,
): Promise<number> {
  const page = await context.newPage();
  // The pool takes hardwareConcurrency − 1 workers. Chromium 156 ignores a getter put on
  // Navigator.prototype by an init script (the pool then had one worker in both cases), so the
  // DevTools protocol's override sets it, and the page is asked before anything is timed.
  const devtools = await context.newCDPSession(page);
  await devtools.send('Emulation.setHardwareConcurrencyOverride', { hardwareConcurrency: workers + 1 });
  await page.goto(`${origin}/sheets/${sheetId}`);
  const cores = await page.evaluate(() => navigator.hardwareConcurrency);
  if (cores !== workers + 1) throw new Error(`the page sees ${cores} cores, not ${workers + 1}`);
  await page.getByRole('button', { name: 'Run all' }).waitFor();
  await page.getByRole('button', { name: 'Run all' }).focus();
  const pressedAt = await page.evaluate(() => performance.now());
  await page.keyboard.press('Enter');
  await page.waitForFunction(
    () => performance.getEntriesByName('meander:simulation-finished').length > 0,
    null,
    {
      polling: 100,
      timeout: 300_000,
    },
  );
  const finishedAt = await page.evaluate(
    () => performance.getEntriesByName('meander:simulation-finished').at(-1)!.startTime,
  );
  const isolated = await page.evaluate(() => window.crossOriginIsolated);
  await page.close();
  if (isolated !== expectIsolated)
    throw new Error(`the page was ${isolated ? '' : 'not '}cross-origin isolated`);
  return finishedAt - pressedAt;
}

async function main() {
  const clientDir = path.resolve('dist');
  if (!existsSync(path.join(clientDir, 'index.html'))) throw new Error('run `npm run build` first');
  const stack = await startLoadStack(await freePort(), clientDir);
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run'],
  });
  try {
    const origin = stack.app.url;
    const member = DEMO_ACCOUNTS.find((account) => account.role === 'member')!;
    for (const isolation of ['isolated', 'not isolated'] as const) {
      const context = await browser.newContext();
      if (isolation === 'not isolated')
        await context.route('**/*', async (route) => {
          const response = await route.fetch();
          const headers = { ...response.headers() };
          delete headers['cross-origin-opener-policy'];
          delete headers['cross-origin-embedder-policy'];
          await route.fulfill({ response, headers });
        });
      const signIn = await context.request.post(`${origin}/api/auth/sign-in`, {
        headers: { Origin: origin },
        data: { email: member.email, password: member.password },
      });
      if (!signIn.ok()) throw new Error(`sign-in failed: ${signIn.status()}`);
      const created = await context.request.post(`${origin}/api/sheets`, {
        headers: { Origin: origin },
        data: {
          title: 'Pool scaling',
          document: {
            schemaVersion: 1,
            title: 'Pool scaling',
            cells: [
              { id: 'p', kind: 'params', params: [{ name: 'rate', value: 0.9 }] },
              {
                id: 'm',
                kind: 'model',
                states: [{ name: 'h', initial: '1', drift: '-rate * h', diffusion: { N: '0.4' } }],
                noises: [{ name: 'N' }],
              },
              {
                id: 's',
                kind: 'simulation',
                model: 'm',
                t1: 2,
                steps: STEPS,
                paths: PATHS,
                seed: 7,
                saveCount: 11,
              },
              { id: 'x', kind: 'probe', simulation: 's', quantity: 'exceedance', state: 'h', level: 0.5 },
            ],
          },
        },
      });
      const { id } = (await created.json()) as { id: string };
      const times: Record<number, number[]> = { 1: [], 2: [] };
      for (let round = 0; round < ROUNDS; round++)
        for (const workers of [1, 2])
          times[workers]!.push(await measure(context, origin, id, workers, isolation === 'isolated'));
      const one = median(times[1]!);
      const two = median(times[2]!);
      process.stdout.write(
        `${JSON.stringify({
          page: isolation,
          paths: PATHS,
          steps: STEPS,
          msOneWorker: Math.round(one),
          msTwoWorkers: Math.round(two),
          speedUpTwoOverOne: Math.round((one / two) * 100) / 100,
          rounds: ROUNDS,
        })}\n`,
      );
      await context.close();
    }
  } finally {
    await browser.close();
    await stack.stop();
  }
}

main().catch((error: unknown) => {
  process.stderr.write(
    `browser pool bench failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
  );
  process.exit(1);
});
