import { spawn } from 'node:child_process';
import { appConfigFromEnv, loadEnv } from './config';
import { listen } from './index';
import { createLogger } from './logger';
import { onShutdown, startServices } from './services';

/** `npm run dev`: local services and the API on API_PORT, then Vite's dev server, which proxies /api here. */
const log = (line: string) => process.stdout.write(`[meander] ${line}\n`);
/** Vite's dev server address (its default port); set APP_ORIGIN when Vite runs elsewhere. */
const VITE_ORIGIN = 'http://localhost:5173';

async function main() {
  const env = loadEnv({ NODE_ENV: 'development', ...process.env });
  const services = await startServices(env, log);
  if (services.seed.seeded) {
    log('first run: demo accounts created (demo-only credentials, also in the README):');
    for (const account of services.seed.accounts)
      log(`  ${account.role.padEnd(6)} ${account.email}  password: ${account.password}`);
  }
  const api = await listen(
    {
      db: services.database.db,
      mailer: services.mailer,
      mailbox: services.mailFake,
      logger: createLogger(env.LOG_LEVEL),
      // The browser talks to Vite's dev server, which passes /api and its Host on to us.
      config: appConfigFromEnv({ ...env, APP_ORIGIN: env.APP_ORIGIN ?? VITE_ORIGIN }),
    },
    { port: env.API_PORT, host: '127.0.0.1' },
  ).catch(async (error: unknown) => {
    await services.stop();
    throw error;
  });
  log(`API at ${api.url}; starting Vite`);

  const vite = spawn(process.execPath, ['node_modules/vite/bin/vite.js'], {
    stdio: 'inherit',
    env: { ...process.env, API_PORT: String(env.API_PORT) },
  });
  const viteExited = new Promise<number | null>((resolve) => vite.once('exit', (code) => resolve(code)));
  // Ctrl-C reaches Vite and us at once, so either side may begin the shutdown; it runs once.
  let stopping: Promise<void> | null = null;
  const stop = () =>
    (stopping ??= (async () => {
      if (vite.exitCode === null && vite.signalCode === null) vite.kill('SIGTERM');
      await viteExited;
      await api.close();
      await services.stop();
    })());
  // Without Vite there is nothing to develop against: stop the rest too.
  void viteExited.then((code) => {
    if (stopping) return;
    log(`Vite exited (code ${code ?? 'none'}); stopping`);
    stop().finally(() => process.exit(code ?? 1));
  });
  onShutdown(stop, log);
}

main().catch((error: unknown) => {
  process.stderr.write(
    `[meander] could not start: ${error instanceof Error ? error.message : String(error)}\n`,
  );
  process.exit(1);
});
