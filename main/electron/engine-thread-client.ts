// The main process's handle on the engine thread: the engine and history requests of the
// contract, forwarded over the thread's message port and checked on return. A thread that dies
// is restarted on the next call.
import { Worker } from 'node:worker_threads';
import { channelFor, parseResult, type ApiHandlers } from '../../shared/api/contract';
import { ENGINE_REQUEST_NAMES, type EngineHandlers } from '../../shared/api/engine-handlers';
import { HISTORY_REQUEST_NAMES, type HistoryHandlers } from '../../shared/api/history-handlers';
import { createMessageClient, type MessageClient, type WorkerReply } from '../../shared/api/message-channel';

export type ThreadEngine = EngineHandlers &
  HistoryHandlers & {
    readonly close: () => Promise<void>;
  };

const FORWARDED = [...ENGINE_REQUEST_NAMES, ...HISTORY_REQUEST_NAMES] as const;

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

  const forwarded: Record<string, (...args: unknown[]) => Promise<unknown>> = {};
  for (const name of FORWARDED) forwarded[name] = async (...args: unknown[]) => parseResult(name, await connect().call(channelFor(name), args));
  // Built key by key from the contract's names, each reply parsed by its own schema, so it
  // has the handlers' types; TypeScript cannot follow that through a loop, hence the cast.
  const handlers = forwarded as unknown as Pick<ApiHandlers, (typeof FORWARDED)[number]>;
  return {
    ...handlers,
    close: async () => {
      await worker?.terminate();
    },
  };
}
