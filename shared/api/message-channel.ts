// Request/reply over a message port (a Web Worker in the page, a worker thread in Electron):
// the message shapes, the client side that matches replies to requests, and the serving side.
//
// Both ends are generic over how a message is posted, so the page and the main process use
// the same code and only pass their port.
import type { ApiHandlers } from './contract';
import { serveRequest } from './server';

export interface WorkerRequest {
  readonly id: number;
  readonly channel: string;
  readonly args: unknown[];
}

export type WorkerReply = { readonly id: number; readonly ok: true; readonly value: unknown } | { readonly id: number; readonly ok: false; readonly error: string };

export interface MessageClient {
  /** Sends a request and resolves with the reply's value (rejects with its error). */
  readonly call: (channel: string, args: unknown[]) => Promise<unknown>;
  /** Feed every message from the port here. */
  readonly receive: (reply: WorkerReply) => void;
  /** The port died: every waiting call rejects with this error. */
  readonly fail: (error: Error) => void;
}

export function createMessageClient(post: (request: WorkerRequest) => void): MessageClient {
  const pending = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  let nextId = 1;
  return {
    call: (channel, args) =>
      new Promise((resolve, reject) => {
        const id = nextId++;
        pending.set(id, { resolve, reject });
        post({ id, channel, args });
      }),
    receive: (reply) => {
      const waiter = pending.get(reply.id);
      if (!waiter) return;
      pending.delete(reply.id);
      if (reply.ok) waiter.resolve(reply.value);
      else waiter.reject(new Error(reply.error));
    },
    fail: (error) => {
      for (const waiter of pending.values()) waiter.reject(error);
      pending.clear();
    },
  };
}

/** Answers one request with the handlers; never throws, the error travels in the reply. */
export async function answerRequest(handlers: ApiHandlers, request: WorkerRequest): Promise<WorkerReply> {
  try {
    return { id: request.id, ok: true, value: await serveRequest(handlers, request.channel, request.args) };
  } catch (err) {
    return { id: request.id, ok: false, error: err instanceof Error ? err.message : String(err) };
  }
}
