// The Web Worker behind the plain-page API: answers contract requests with shared/ handlers.
// History files arrive as the File the user picked (structured-cloned into the worker) and
// are read in slices; fitted bundles are kept in the browser's IndexedDB.
import { APP_VERSION } from '../../shared/app-identity';
import { createEngineHost } from '../../shared/api/engine-host';
import { answerRequest, type WorkerReply, type WorkerRequest } from '../../shared/api/message-channel';
import { blobByteSource, type ByteSource } from '../../shared/history/byte-source';
import type { HistoryFileRef } from '../../shared/history/history-requests';
import { previewHistorySource, readHistorySource } from '../../shared/history/read-history-source';
import { createIndexedDbBundleStore } from './indexed-db-bundle-store';

function sourceOf(ref: HistoryFileRef): ByteSource {
  if (ref.kind !== 'blob') throw new Error('the page reads delay history from a file you pick; it cannot open paths on disk');
  return blobByteSource(ref.name, ref.blob);
}

const handlers = createEngineHost({
  host: { version: APP_VERSION, runtime: 'web', platform: navigator.platform || 'web' },
  store: createIndexedDbBundleStore(),
  previewHistory: (ref) => previewHistorySource(sourceOf(ref)),
  readHistory: (ref, options) => readHistorySource(sourceOf(ref), options),
  nowMs: () => performance.now(),
});

self.addEventListener('message', (event: MessageEvent<WorkerRequest>) => {
  void answerRequest(handlers, event.data).then(postReply);
});

function postReply(reply: WorkerReply): void {
  // In a dedicated worker `self.postMessage` takes no target origin; the DOM lib types `self` as Window.
  (self as unknown as { postMessage(message: WorkerReply): void }).postMessage(reply);
}
