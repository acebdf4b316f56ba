import { appConfigFromEnv, loadEnv } from './config';
import { listen } from './index';
import { createLogger } from './logger';
import { onShutdown, startServices } from './services';

/** `npm start`: local services, the API and the built client from dist/ on PORT. */
const log = (line: string) => console.log(`[meander] ${line}`);

async function main() {
  const env = loadEnv();
  const services = await startServices(env, log);
  if (services.seed.seeded) {
    log('first run: demo accounts created (demo-only credentials, also in the README):');
    for (const account of services.seed.accounts)
      log(`  ${account.role.padEnd(6)} ${account.email}  password: ${account.password}`);
  }
  const server = await listen(
    {
      db: services.database.db,
      mailer: services.mailer,
      mailbox: services.mailFake,
      logger: createLogger(env.LOG_LEVEL),
      config: appConfigFromEnv(env, 'dist'),
    },
    { port: env.PORT, host: env.HOST },
  ).catch(async (error: unknown) => {
    await services.stop();
    throw error;
  });
  if (services.mailFake)
    log(
      `mail goes to the local fake on port ${services.mailFake.port}; the site admin reads it at ${server.url}/mailbox`,
    );
  log(`Meander is running at ${server.url}`);
  onShutdown(async () => {
    await server.close();
    await services.stop();
  }, log);
}

main().catch((error: unknown) => {
  console.error(`[meander] could not start: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
