// The Electron side's engine, in a worker thread so parsing and scoring never block the
// main process (which also serves the window's input and menus).
import { parentPort } from 'node:worker_threads';
import { APP_VERSION } from '../../shared/app-identity';
import { createEngineHandlers } from '../../shared/api/engine-handlers';
import { realEngineDeps } from '../../shared/api/engine-deps';
import { combineHandlers, createCoreHandlers, createPageShellHandlers } from '../../shared/api/handlers';
import { answerRequest, type WorkerRequest } from '../../shared/api/message-channel';

const port = parentPort;
if (!port) throw new Error('engine-thread must run as a worker thread');

const handlers = combineHandlers(
  createCoreHandlers({ version: APP_VERSION, runtime: 'electron', platform: process.platform }),
  createEngineHandlers(realEngineDeps(() => performance.now())),
  createPageShellHandlers(),
);

port.on('message', (request: WorkerRequest) => {
  void answerRequest(handlers, request).then((reply) => port.postMessage(reply));
});
