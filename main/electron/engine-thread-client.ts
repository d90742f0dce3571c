// The main process's handle on the engine thread: the engine requests of the contract,
// forwarded over the thread's message port. A thread that dies is restarted on the next call.
import { Worker } from 'node:worker_threads';
import { channelFor } from '../../shared/api/contract';
import type { EngineHandlers } from '../../shared/api/engine-handlers';
import { parseResult } from '../../shared/api/contract';
import { createMessageClient, type MessageClient, type WorkerReply } from '../../shared/api/message-channel';

export interface ThreadEngine extends EngineHandlers {
  readonly close: () => Promise<void>;
}

export function createThreadEngine(workerFile: string, makeWorker: (file: string) => Worker = (file) => new Worker(file)): ThreadEngine {
  let worker: Worker | null = null;
  let client: MessageClient | null = null;

  const connect = (): MessageClient => {
    if (client) return client;
    const w = makeWorker(workerFile);
    const c = createMessageClient((request) => w.postMessage(request));
    w.on('message', (reply: WorkerReply) => c.receive(reply));
    w.on('error', (err) => c.fail(err instanceof Error ? err : new Error(String(err))));
    w.on('exit', (code) => {
      c.fail(new Error(`the engine thread stopped (exit code ${code})`));
      if (worker === w) {
        worker = null;
        client = null;
      }
    });
    worker = w;
    client = c;
    return c;
  };

  return {
    analyzeTrips: async (text, settings) => parseResult('analyzeTrips', await connect().call(channelFor('analyzeTrips'), [text, settings])),
    connectionCurve: async (analysisId, tripId, index) => parseResult('connectionCurve', await connect().call(channelFor('connectionCurve'), [analysisId, tripId, index])),
    getBundleInfo: async () => parseResult('getBundleInfo', await connect().call(channelFor('getBundleInfo'), [])),
    exportReport: async (analysisId, kind) => parseResult('exportReport', await connect().call(channelFor('exportReport'), [analysisId, kind])),
    close: async () => {
      await worker?.terminate();
    },
  };
}
