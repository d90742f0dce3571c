// The Electron side's engine, in a worker thread so parsing, scoring and history fits never
// block the main process (which also serves the window's input and menus). Fitted bundles live
// in the folder the main process passes as workerData.bundleFolder.
import { parentPort, workerData } from 'node:worker_threads';
import { APP_VERSION } from '../../shared/app-identity';
import { createEngineHost } from '../../shared/api/engine-host';
import { answerRequest, type WorkerRequest } from '../../shared/api/message-channel';
import { BundleLibrary } from '../history/bundle-library';
import { previewHistoryRef, readHistoryRef } from '../history/history-file-refs';

const port = parentPort;
if (!port) throw new Error('engine-thread must run as a worker thread');
const bundleFolder = (workerData as { bundleFolder?: unknown } | null)?.bundleFolder;
if (typeof bundleFolder !== 'string' || bundleFolder === '') throw new Error('engine-thread needs workerData.bundleFolder');

const handlers = createEngineHost({
  host: { version: APP_VERSION, runtime: 'electron', platform: process.platform },
  store: new BundleLibrary(bundleFolder),
  previewHistory: previewHistoryRef,
  readHistory: readHistoryRef,
  nowMs: () => performance.now(),
});

port.on('message', (request: WorkerRequest) => {
  void answerRequest(handlers, request).then((reply) => port.postMessage(reply));
});
