// IPC handlers: sender checks and payload validation, with electron mocked at the boundary.
import { beforeEach, describe, expect, it, vi } from 'vitest';

const handle = vi.fn();
vi.mock('electron', () => ({ ipcMain: { handle } }));

const { ipcMain } = await import('electron');
const { fileSenderCheck, registerApiHandlers } = await import('../../../main/electron/ipc');
const { createCoreHandlers } = await import('../../../shared/api/handlers');
const { channelFor } = await import('../../../shared/api/contract');

const INDEX = 'file:///opt/Layline/resources/app.asar/dist/renderer/index.html';
type Listener = (event: { senderFrame: { url: string } | null }, ...args: unknown[]) => Promise<unknown>;

function listenerFor(channel: string): Listener {
  const call = handle.mock.calls.find((c) => c[0] === channel);
  if (!call) throw new Error(`no handler registered for ${channel}`);
  return call[1] as Listener;
}

describe('registerApiHandlers', () => {
  beforeEach(() => {
    handle.mockReset();
    registerApiHandlers(ipcMain, createCoreHandlers({ version: '9.9.9', runtime: 'electron', platform: 'linux' }), fileSenderCheck(INDEX));
  });

  it('registers one channel per request of the contract', () => {
    expect(handle.mock.calls.map((c) => c[0])).toContain(channelFor('getAppInfo'));
  });

  it('answers our own page', async () => {
    const info = await listenerFor(channelFor('getAppInfo'))({ senderFrame: { url: INDEX } });
    expect(info).toEqual({ name: 'Layline', version: '9.9.9', runtime: 'electron', platform: 'linux' });
  });

  it('rejects a call whose sender frame is missing', async () => {
    await expect(listenerFor(channelFor('getAppInfo'))({ senderFrame: null })).rejects.toThrow(/no sender frame/);
  });

  it('rejects a call from a page that is not ours', async () => {
    await expect(listenerFor(channelFor('getAppInfo'))({ senderFrame: { url: 'https://example.com/' } })).rejects.toThrow(/untrusted sender/);
    await expect(listenerFor(channelFor('getAppInfo'))({ senderFrame: { url: INDEX + '.evil.html' } })).rejects.toThrow(/untrusted sender/);
  });

  it('rejects a payload that does not match the schema', async () => {
    await expect(listenerFor(channelFor('getAppInfo'))({ senderFrame: { url: INDEX } }, 'unexpected')).rejects.toThrow(/args rejected/);
  });
});
