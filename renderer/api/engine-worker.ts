// The Web Worker behind the plain-page API: answers contract requests with shared/ handlers.
import { APP_VERSION } from '../../shared/app-identity';
import { createEngineHandlers } from '../../shared/api/engine-handlers';
import { realEngineDeps } from '../../shared/api/engine-deps';
import { combineHandlers, createCoreHandlers, createPageShellHandlers } from '../../shared/api/handlers';
import { answerRequest, type WorkerReply, type WorkerRequest } from '../../shared/api/message-channel';

const handlers = combineHandlers(
  createCoreHandlers({ version: APP_VERSION, runtime: 'web', platform: navigator.platform || 'web' }),
  createEngineHandlers(realEngineDeps(() => performance.now())),
  createPageShellHandlers(),
);

self.addEventListener('message', (event: MessageEvent<WorkerRequest>) => {
  void answerRequest(handlers, event.data).then(postReply);
});

function postReply(reply: WorkerReply): void {
  // In a dedicated worker `self.postMessage` takes no target origin; the DOM lib types `self` as Window.
  (self as unknown as { postMessage(message: WorkerReply): void }).postMessage(reply);
}
