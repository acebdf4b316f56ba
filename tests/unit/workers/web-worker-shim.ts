import { Worker as ThreadWorker } from 'node:worker_threads';
import { startTypeScriptWorker } from '../../../server/cli/ts-worker';

/**
 * Just enough of the browser's Worker for comlink, on top of worker_threads, so the browser pool
 * (src/workers/pool.ts) and its worker file run unchanged in Node tests. Inside the thread, a
 * prelude gives the global scope the `addEventListener`/`postMessage` pair a Web Worker has.
 */
const workerPrelude = new URL('./web-worker-prelude.ts', import.meta.url);

type Listener = (event: { data: unknown }) => void;

export class ShimWorker {
  private readonly thread: ThreadWorker;
  private readonly listeners = new Map<Listener, (data: unknown) => void>();
  static created = 0;

  constructor(url: URL | string) {
    ShimWorker.created++;
    this.thread = startTypeScriptWorker(workerPrelude, { workerData: { entry: String(url) } });
    this.thread.unref();
  }

  postMessage(message: unknown, transfer: Transferable[] = []): void {
    this.thread.postMessage(message, transfer as never);
  }

  addEventListener(type: string, listener: Listener): void {
    if (type !== 'message') return;
    const wrapped = (data: unknown) => listener({ data });
    this.listeners.set(listener, wrapped);
    this.thread.on('message', wrapped);
  }

  removeEventListener(type: string, listener: Listener): void {
    const wrapped = this.listeners.get(listener);
    if (type !== 'message' || !wrapped) return;
    this.thread.off('message', wrapped);
    this.listeners.delete(listener);
  }

  terminate(): void {
    void this.thread.terminate();
  }
}
