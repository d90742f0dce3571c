// Turns any transport into a validated LaylineApi object.
//
// The Electron preload (transport: ipcRenderer.invoke) and the plain-page harness
// (transport: a Web Worker) both build their object here, so both check arguments
// before sending and results on arrival in exactly the same way.
import { channelFor, parseArgs, parseResult, requestNames, type LaylineApi, type RequestName } from './contract';

/** Sends one request over some channel and resolves with the raw reply. */
export type Transport = (channel: string, args: unknown[]) => Promise<unknown>;

export function createApiClient(transport: Transport): LaylineApi {
  const api: Record<string, (...args: unknown[]) => Promise<unknown>> = {};
  for (const name of requestNames()) {
    api[name] = async (...args: unknown[]) => {
      const checked = parseArgs(name as RequestName, args) as unknown[];
      return parseResult(name, await transport(channelFor(name), checked));
    };
  }
  // The object is built key by key from the contract's own names and every reply is
  // parsed by that request's schema, so it satisfies LaylineApi; TypeScript cannot
  // follow a mapped type through a loop, hence the one cast.
  return Object.freeze(api) as unknown as LaylineApi;
}
