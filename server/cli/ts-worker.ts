import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * Starts a worker thread whose entry file is TypeScript. On Node 20 a worker does not pick up
 * tsx's hooks from `execArgv: ['--import', 'tsx']` for its own entry file ("Unknown file
 * extension .ts"), so a tiny bootstrap registers tsx inside the thread and then imports the file.
 */
function tsxApiUrl(): string {
  // import.meta.resolve is there under plain Node and tsx; some test runners leave it out.
  if (typeof import.meta.resolve === 'function') return import.meta.resolve('tsx/esm/api');
  const packageJson = createRequire(import.meta.url).resolve('tsx/package.json');
  return pathToFileURL(join(dirname(packageJson), 'dist/esm/api/index.mjs')).href;
}

export function startTypeScriptWorker(entry: URL, options: Omit<WorkerOptions, 'eval'> = {}): Worker {
  const bootstrap = `import(${JSON.stringify(tsxApiUrl())}).then(({ register }) => { register(); return import(${JSON.stringify(entry.href)}); });`;
  return new Worker(bootstrap, { ...options, eval: true });
}
