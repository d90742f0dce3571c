// Registers the main-side handlers of the API contract on ipcMain.
//
// Every call is checked before it reaches a handler: the sender frame must be our
// own page (fail closed when it is missing), then serveRequest parses the arguments
// against the contract's schema. Nothing else in main/ calls ipcMain directly.
import type { IpcMain, IpcMainInvokeEvent } from 'electron';
import { ContractError, channelFor, requestNames, type ApiHandlers } from '../../shared/api/contract';
import { serveRequest } from '../../shared/api/server';

/** Decides whether a frame URL belongs to Layline's own renderer. */
export type SenderCheck = (frameUrl: string) => boolean;

/** Only our own page (its index URL, with at most a query or fragment) may call the API. */
export function fileSenderCheck(rendererIndexUrl: string): SenderCheck {
  return (frameUrl) => {
    if (frameUrl === rendererIndexUrl) return true;
    const rest = frameUrl.startsWith(rendererIndexUrl) ? frameUrl.slice(rendererIndexUrl.length) : null;
    return rest !== null && (rest.startsWith('#') || rest.startsWith('?'));
  };
}

export function senderUrl(event: Pick<IpcMainInvokeEvent, 'senderFrame'>): string | null {
  // senderFrame is null when the frame navigated away or was destroyed mid-call.
  const frame = event.senderFrame;
  if (!frame || typeof frame.url !== 'string') return null;
  return frame.url;
}

export async function handleInvoke(
  handlers: ApiHandlers,
  isTrusted: SenderCheck,
  channel: string,
  event: Pick<IpcMainInvokeEvent, 'senderFrame'>,
  rawArgs: unknown[],
): Promise<unknown> {
  const url = senderUrl(event);
  if (url === null) throw new ContractError(channel, 'sender', 'no sender frame');
  if (!isTrusted(url)) throw new ContractError(channel, 'sender', `untrusted sender ${url}`);
  return serveRequest(handlers, channel, rawArgs);
}

export function registerApiHandlers(ipcMain: Pick<IpcMain, 'handle'>, handlers: ApiHandlers, isTrusted: SenderCheck): void {
  for (const name of requestNames()) {
    const channel = channelFor(name);
    ipcMain.handle(channel, (event, ...rawArgs: unknown[]) => handleInvoke(handlers, isTrusted, channel, event, rawArgs));
  }
}
