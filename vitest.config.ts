import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
};

// Four projects: pure unit tests, Vue component tests in jsdom, integration tests against a
// throwaway PostgreSQL, end-to-end tests in Debian's Chromium against the built app.
export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          server: { deps: { inline: ['fmin'] } },
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
        },
      },
      {
        plugins: [vue()],
        resolve: { alias },
        test: {
          name: 'component',
          server: { deps: { inline: ['fmin'] } },
          include: ['tests/component/**/*.test.ts'],
          environment: 'jsdom',
          testTimeout: 20_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          server: { deps: { inline: ['fmin'] } },
          include: ['tests/integration/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/services.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          server: { deps: { inline: ['fmin'] } },
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/services.ts', 'tests/setup/app-server.ts'],
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
