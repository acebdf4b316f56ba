import { parentPort, workerData } from 'node:worker_threads';
import { setKernelChoice } from '../../shared/engine/wasm/kernel-choice';
import type { TypeScriptWorkerData } from './ts-worker';
import type { ThreadData } from './thread-pool';
import { runStudy } from '../../shared/engine/study';
import { fitModel } from '../../shared/fit/fit-model';
import { chunkTransferables, runChunkTask, runClaimedChunks } from '../../shared/run/chunk-task';
import { collectTransferables } from '../../shared/run/transferables';
import type { FromWorker, ToWorker } from './messages';

/** A worker thread of the headless runner: the same chunk task as the browser's worker. */
if (!parentPort) throw new Error('server/cli/worker.ts runs only as a worker thread');
const port = parentPort;
setKernelChoice((workerData as TypeScriptWorkerData<ThreadData | undefined>).data?.kernel ?? 'auto');

function send(message: FromWorker, transfer: ArrayBuffer[] = []): void {
  port.postMessage(message, transfer);
}

port.on('message', (message: ToWorker) => {
  try {
    if (message.type === 'chunk') {
      const chunk = runChunkTask(
        message.plan,
        message.firstPath,
        message.pathCount,
        message.cancel,
        (pathsDone) => send({ type: 'progress', id: message.id, pathsDone }),
      );
      send({ type: 'chunk-done', id: message.id, chunk }, chunkTransferables(chunk));
    } else if (message.type === 'claim') {
      const { indices, chunks } = runClaimedChunks(message.plan, message.task);
      send({ type: 'claim-done', id: message.id, indices, chunks }, collectTransferables(chunks));
    } else if (message.type === 'fit') {
      send({ type: 'fit-done', id: message.id, result: fitModel(message.problem) });
    } else {
      send({ type: 'study-done', id: message.id, result: runStudy(message.plan, message.options) });
    }
  } catch (error) {
    send({ type: 'failed', id: message.id, message: error instanceof Error ? error.message : String(error) });
  }
});
