// Entry of every TypeScript worker thread (see ts-worker.ts): plain JavaScript, so it loads
// without hooks; it registers tsx in this thread and then imports the real entry file.
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
await import(workerData.tsEntry);
