// The plain-page API: the same LaylineApi type, served by shared/ code in a Web Worker.
//
// Used when the renderer runs in an ordinary browser (`npm run web`, the e2e tests),
// where there is no preload. Requests travel to engine-worker.js by postMessage.
import type { LaylineApi } from '../../shared/api/contract';
import { createApiClient } from '../../shared/api/client';
import { createMessageClient, type WorkerReply } from '../../shared/api/message-channel';

export function createInPageApi(workerUrl = new URL('./engine-worker.js', import.meta.url)): LaylineApi {
  const worker = new Worker(workerUrl, { type: 'module', name: 'layline-engine' });
  const client = createMessageClient((request) => worker.postMessage(request));
  worker.addEventListener('message', (event: MessageEvent<WorkerReply>) => client.receive(event.data));
  worker.addEventListener('error', (event) => client.fail(new Error(`engine worker failed: ${event.message}`)));
  return createApiClient(client.call);
}
