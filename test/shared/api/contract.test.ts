import { describe, expect, it } from 'vitest';
import { createApiClient } from '../../../shared/api/client';
import { ContractError, channelFor } from '../../../shared/api/contract';
import { serveRequest } from '../../../shared/api/server';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { testEngineHost } from '../../fixtures/api/test-engine-host';

const handlers = testEngineHost({ version: '1.2.3', runtime: 'web', platform: 'test' });

describe('the API contract', () => {
  it('round-trips a request from client to server', async () => {
    const api = createApiClient((channel, args) => serveRequest(handlers, channel, args));
    await expect(api.getAppInfo()).resolves.toEqual({ name: 'Layline', version: '1.2.3', runtime: 'web', platform: 'test' });
    const analysis = await api.analyzeTrips('traveler,trip,flight,from,depart,to,arrive\nAda,T,UA 1,DFW,2026-03-08 15:10,ORD,17:35\nAda,T,UA 2,ORD,2026-03-08 18:20,BOS,21:40\n', DEFAULT_ANALYSIS_SETTINGS);
    expect(analysis.trips[0]?.connections[0]?.layoverMinutes).toBe(45);
  });

  it('rejects an unknown channel', async () => {
    await expect(serveRequest(handlers, 'layline:deleteEverything', [])).rejects.toBeInstanceOf(ContractError);
    await expect(serveRequest(handlers, 'other:getAppInfo', [])).rejects.toThrow(/no such request/);
  });

  it('rejects arguments that the schema does not allow', async () => {
    await expect(serveRequest(handlers, channelFor('getAppInfo'), [1, 2])).rejects.toThrow(/args rejected/);
    await expect(serveRequest(handlers, channelFor('getAppInfo'), 'not-an-array')).rejects.toThrow(/args rejected/);
    await expect(serveRequest(handlers, channelFor('analyzeTrips'), ['x', { ...DEFAULT_ANALYSIS_SETTINGS, targetProbability: 2 }])).rejects.toThrow(/args rejected: 1\.targetProbability/);
    await expect(serveRequest(handlers, channelFor('analyzeTrips'), ['x', { ...DEFAULT_ANALYSIS_SETTINGS, evil: true }])).rejects.toThrow(/args rejected/);
    await expect(serveRequest(handlers, channelFor('openWorkspace'), [42])).rejects.toThrow(/args rejected/);
    await expect(serveRequest(handlers, channelFor('saveWorkspace'), [{ tripsText: '' }, false])).rejects.toThrow(/args rejected/);
  });

  it('the client rejects a reply that breaks the result schema', async () => {
    const api = createApiClient(async () => ({ name: 'Layline', version: 3 }));
    await expect(api.getAppInfo()).rejects.toThrow(/result rejected/);
  });

  it('the page refuses the desktop-only requests by name', async () => {
    await expect(serveRequest(handlers, channelFor('recentWorkspaces'), [])).rejects.toThrow(/recentWorkspaces is only available in the desktop app/);
  });
});
