import { existsSync } from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { startTestServer } from '../../server/testing';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Origin of the built app served for end-to-end tests. */
    appUrl: string;
  }
}

/**
 * Global setup for the end-to-end project (runs after services.ts): serves the built client
 * (`dist/`, made by `npm run build`, which `npm test` runs first) with the API on a free port.
 */
export default async function setup(project: TestProject) {
  const clientDir = path.resolve('dist');
  if (!existsSync(path.join(clientDir, 'index.html'))) {
    throw new Error('dist/ has no built client: run `npm run build` first (`npm test` does it).');
  }
  const { databaseUrl, smtpPort } = project.getProvidedContext();
  // Every browser test signs up from 127.0.0.1: the auth limits are lifted out of the way.
  const lifted = { limit: 100_000, windowMs: 60_000 };
  const server = await startTestServer({
    databaseUrl,
    smtpPort,
    clientDir,
    limits: {
      signInPerAddressAndAccount: lifted,
      signInPerAccount: lifted,
      signInPerAddress: lifted,
      signUpPerAddress: lifted,
      resetRequestsPerAddress: lifted,
      resetMailsPerAccount: lifted,
      signUpMailsPerAddress: lifted,
    },
  });
  project.provide('appUrl', server.url);
  return async () => {
    await server.stop();
  };
}
