import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * Starts a worker thread whose entry file is TypeScript. On Node 20 a worker does not pick up
 * tsx's hooks from `execArgv: ['--import', 'tsx']` for its own entry file ("Unknown file
 * extension .ts"), so a small JavaScript bootstrap registers tsx inside the thread and then
 * imports the file. The caller's own `workerData` reaches the thread as `workerData.data`.
 */
const bootstrapUrl = new URL('./ts-worker-bootstrap.mjs', import.meta.url);

export interface TypeScriptWorkerData<T> {
  tsEntry: string;
  data: T;
}

export function startTypeScriptWorker(entry: URL, options: WorkerOptions = {}): Worker {
  const workerData: TypeScriptWorkerData<unknown> = { tsEntry: entry.href, data: options.workerData };
  return new Worker(bootstrapUrl, { ...options, workerData });
}
