import { describe, expect, it } from 'vitest';
import { createApiClient } from '../../../shared/api/client';
import { ContractError, channelFor } from '../../../shared/api/contract';
import { createCoreHandlers } from '../../../shared/api/handlers';
import { serveRequest } from '../../../shared/api/server';

const handlers = createCoreHandlers({ version: '1.2.3', runtime: 'web', platform: 'test' });

describe('the API contract', () => {
  it('round-trips a request from client to server', async () => {
    const api = createApiClient((channel, args) => serveRequest(handlers, channel, args));
    await expect(api.getAppInfo()).resolves.toEqual({ name: 'Layline', version: '1.2.3', runtime: 'web', platform: 'test' });
  });

  it('rejects an unknown channel', async () => {
    await expect(serveRequest(handlers, 'layline:deleteEverything', [])).rejects.toBeInstanceOf(ContractError);
    await expect(serveRequest(handlers, 'other:getAppInfo', [])).rejects.toThrow(/no such request/);
  });

  it('rejects arguments that the schema does not allow', async () => {
    await expect(serveRequest(handlers, channelFor('getAppInfo'), [1, 2])).rejects.toThrow(/args rejected/);
    await expect(serveRequest(handlers, channelFor('getAppInfo'), 'not-an-array')).rejects.toThrow(/args rejected/);
  });

  it('the client rejects a reply that breaks the result schema', async () => {
    const api = createApiClient(async () => ({ name: 'Layline', version: 3 }));
    await expect(api.getAppInfo()).rejects.toThrow(/result rejected/);
  });
});
