import { parentPort, workerData } from 'node:worker_threads';

/** Runs inside a test thread: makes the global scope look like a Web Worker's, then loads the worker file. */
const port = parentPort!;
const scope = globalThis as unknown as {
  addEventListener(type: string, listener: (event: { data: unknown }) => void): void;
  removeEventListener(type: string, listener: (event: { data: unknown }) => void): void;
  postMessage(message: unknown, transfer?: unknown[]): void;
};
const wrappers = new Map<unknown, (data: unknown) => void>();
scope.addEventListener = (type, listener) => {
  if (type !== 'message') return;
  const wrapped = (data: unknown) => listener({ data });
  wrappers.set(listener, wrapped);
  port.on('message', wrapped);
};
scope.removeEventListener = (type, listener) => {
  const wrapped = wrappers.get(listener);
  if (type === 'message' && wrapped) port.off('message', wrapped);
};
scope.postMessage = (message, transfer = []) => port.postMessage(message, transfer as never);

await import((workerData as { data: { entry: string } }).data.entry);
