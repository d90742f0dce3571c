// The Web Worker behind the plain-page API: answers contract requests with shared/ handlers.
import { APP_VERSION } from '../../shared/app-identity';
import { createCoreHandlers } from '../../shared/api/handlers';
import { serveRequest } from '../../shared/api/server';
import type { WorkerReply, WorkerRequest } from './worker-protocol';

const handlers = createCoreHandlers({ version: APP_VERSION, runtime: 'web', platform: navigator.platform || 'web' });

self.addEventListener('message', (event: MessageEvent<WorkerRequest>) => {
  const { id, channel, args } = event.data;
  serveRequest(handlers, channel, args).then(
    (value) => postReply({ id, ok: true, value }),
    (err: unknown) => postReply({ id, ok: false, error: err instanceof Error ? err.message : String(err) }),
  );
});

function postReply(reply: WorkerReply): void {
  // In a dedicated worker `self.postMessage` takes no target origin; the DOM lib types `self` as Window.
  (self as unknown as { postMessage(message: WorkerReply): void }).postMessage(reply);
}
