// Serves the API contract from plain handler functions, whatever the transport.
//
// The Electron main process and the page's Web Worker both answer requests here:
// arguments are parsed against the contract before a handler runs, and its result
// is parsed before it is sent back.
import { CHANNEL_PREFIX, ContractError, isRequestName, parseArgs, parseResult, type ApiHandlers } from './contract';

export function requestNameOf(channel: string): string | null {
  return channel.startsWith(CHANNEL_PREFIX) ? channel.slice(CHANNEL_PREFIX.length) : null;
}

export async function serveRequest(handlers: ApiHandlers, channel: string, rawArgs: unknown): Promise<unknown> {
  const name = requestNameOf(channel);
  if (name === null || !isRequestName(name)) throw new ContractError(channel, 'unknown-request', 'no such request');
  const args = parseArgs(name, rawArgs);
  // Each handler has the signature the contract gives its name; the parsed args match it.
  const handler = handlers[name] as (...a: unknown[]) => Promise<unknown>;
  return parseResult(name, await handler(...(args as unknown[])));
}
