// IPC handlers: sender checks and payload validation, with electron mocked at the boundary.
import { beforeEach, describe, expect, it, vi } from 'vitest';

const handle = vi.fn();
vi.mock('electron', () => ({ ipcMain: { handle } }));

const { ipcMain } = await import('electron');
const { fileSenderCheck, registerApiHandlers } = await import('../../../main/electron/ipc');
const { channelFor, requestNames } = await import('../../../shared/api/contract');
const { DEFAULT_ANALYSIS_SETTINGS } = await import('../../../shared/workspace/settings');
const { testEngineHost } = await import('../../fixtures/api/test-engine-host');

const { APP_INDEX_URL } = await import('../../../main/electron/app-protocol');
const INDEX = APP_INDEX_URL;
type Listener = (event: { senderFrame: { url: string } | null }, ...args: unknown[]) => Promise<unknown>;

function listenerFor(channel: string): Listener {
  const call = handle.mock.calls.find((c) => c[0] === channel);
  if (!call) throw new Error(`no handler registered for ${channel}`);
  return call[1] as Listener;
}

const TRIPS = 'traveler,trip,flight,from,depart,to,arrive\nAda,T,UA 1,DFW,2026-03-08 15:10,ORD,17:35\nAda,T,UA 2,ORD,2026-03-08 18:20,BOS,21:40\n';

describe('registerApiHandlers', () => {
  beforeEach(() => {
    handle.mockReset();
    const handlers = testEngineHost({ version: '9.9.9', runtime: 'electron', platform: 'linux' });
    registerApiHandlers(ipcMain, handlers, fileSenderCheck(INDEX));
  });

  it('registers one channel per request of the contract', () => {
    expect(handle.mock.calls.map((c) => c[0]).sort()).toEqual(requestNames().map(channelFor).sort());
  });

  it('answers our own page', async () => {
    const info = await listenerFor(channelFor('getAppInfo'))({ senderFrame: { url: INDEX } });
    expect(info).toEqual({ name: 'Layline', version: '9.9.9', runtime: 'electron', platform: 'linux' });
    const analysis = (await listenerFor(channelFor('analyzeTrips'))({ senderFrame: { url: `${INDEX}#trips` } }, TRIPS, DEFAULT_ANALYSIS_SETTINGS)) as { trips: unknown[] };
    expect(analysis.trips).toHaveLength(1);
  });

  it.each(requestNames())('rejects %s when the sender frame is missing', async (name) => {
    await expect(listenerFor(channelFor(name))({ senderFrame: null })).rejects.toThrow(/no sender frame/);
  });

  it('rejects a call from a page that is not ours', async () => {
    const analyze = listenerFor(channelFor('analyzeTrips'));
    await expect(analyze({ senderFrame: { url: 'https://example.com/' } }, TRIPS, DEFAULT_ANALYSIS_SETTINGS)).rejects.toThrow(/untrusted sender/);
    await expect(analyze({ senderFrame: { url: INDEX + '.evil.html' } }, TRIPS, DEFAULT_ANALYSIS_SETTINGS)).rejects.toThrow(/untrusted sender/);
    await expect(listenerFor(channelFor('saveWorkspace'))({ senderFrame: { url: 'file:///opt/Layline/resources/app.asar/dist/renderer/index.html' } })).rejects.toThrow(/untrusted sender/);
    await expect(listenerFor(channelFor('saveWorkspace'))({ senderFrame: { url: 'layline-app://other/index.html' } })).rejects.toThrow(/untrusted sender/);
  });

  it('rejects a payload that does not match the schema', async () => {
    const own = { senderFrame: { url: INDEX } };
    await expect(listenerFor(channelFor('getAppInfo'))(own, 'unexpected')).rejects.toThrow(/args rejected/);
    await expect(listenerFor(channelFor('analyzeTrips'))(own, TRIPS, { targetProbability: 0.9 })).rejects.toThrow(/args rejected/);
    await expect(listenerFor(channelFor('analyzeTrips'))(own, 42, DEFAULT_ANALYSIS_SETTINGS)).rejects.toThrow(/args rejected/);
    await expect(listenerFor(channelFor('connectionCurve'))(own, '1', 'trip', -1)).rejects.toThrow(/args rejected/);
    await expect(listenerFor(channelFor('setTheme'))(own, 'purple')).rejects.toThrow(/args rejected/);
  });
});
