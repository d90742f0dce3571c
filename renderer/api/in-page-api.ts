// The plain-page API: the same LaylineApi type, served by shared/ code in a Web Worker.
//
// Used when the renderer runs in an ordinary browser (`npm run web`, the e2e tests),
// where there is no preload. Requests travel to engine-worker.js by postMessage.
import type { LaylineApi } from '../../shared/api/contract';
import { createApiClient } from '../../shared/api/client';
import type { WorkerReply, WorkerRequest } from './worker-protocol';

export function createInPageApi(workerUrl = new URL('./engine-worker.js', import.meta.url)): LaylineApi {
  const worker = new Worker(workerUrl, { type: 'module', name: 'layline-engine' });
  const pending = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  let nextId = 1;
  worker.addEventListener('message', (event: MessageEvent<WorkerReply>) => {
    const reply = event.data;
    const waiter = pending.get(reply.id);
    if (!waiter) return;
    pending.delete(reply.id);
    if (reply.ok) waiter.resolve(reply.value);
    else waiter.reject(new Error(reply.error));
  });
  worker.addEventListener('error', (event) => {
    const error = new Error(`engine worker failed: ${event.message}`);
    for (const waiter of pending.values()) waiter.reject(error);
    pending.clear();
  });
  return createApiClient(
    (channel, args) =>
      new Promise((resolve, reject) => {
        const id = nextId++;
        pending.set(id, { resolve, reject });
        const request: WorkerRequest = { id, channel, args };
        worker.postMessage(request);
      }),
  );
}
