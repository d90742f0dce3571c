// The Electron side's engine, in a worker thread so parsing, scoring and history fits never
// block the main process (which also serves the window's input and menus). Large scoring runs
// share their connection work with a helper thread of its own. Fitted bundles live
// in the folder the main process passes as workerData.bundleFolder.
import path from 'node:path';
import { parentPort, Worker, workerData } from 'node:worker_threads';
import { APP_VERSION } from '../../shared/app-identity';
import { createEngineHost } from '../../shared/api/engine-host';
import { answerRequest, type WorkerRequest } from '../../shared/api/message-channel';
import { BundleLibrary } from '../history/bundle-library';
import { previewHistoryRef, readHistoryRef } from '../history/history-file-refs';
import { PairWorker, scoreInParallel } from '../scoring/pair-workers';
import type { EngineSourceSpec } from './engine-source-spec';

const port = parentPort;
if (!port) throw new Error('engine-thread must run as a worker thread');
const bundleFolder = (workerData as { bundleFolder?: unknown } | null)?.bundleFolder;
if (typeof bundleFolder !== 'string' || bundleFolder === '') throw new Error('engine-thread needs workerData.bundleFolder');

// A second thread for the connection work of large scoring runs, started now so that the first
// analysis finds it ready; it loads the same bundle as this thread (score-pair-worker.ts).
const helper = new PairWorker(path.join(__dirname, 'score-pair-worker.cjs'), (file) => new Worker(file, { workerData: { bundleFolder } }));
helper.start();

const handlers = createEngineHost({
  host: { version: APP_VERSION, runtime: 'electron', platform: process.platform },
  store: new BundleLibrary(bundleFolder),
  previewHistory: previewHistoryRef,
  readHistory: readHistoryRef,
  nowMs: () => performance.now(),
  scoreTrips: (parsed, source, options, loaded) => {
    const spec: EngineSourceSpec | undefined = loaded && { choice: loaded.choice, generation: loaded.generation };
    return scoreInParallel(parsed, source, spec, options, spec ? helper : null);
  },
});

port.on('message', (request: WorkerRequest) => {
  void answerRequest(handlers, request).then((reply) => port.postMessage(reply));
});
