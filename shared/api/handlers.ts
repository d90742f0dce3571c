// The API's behaviour, written once for both hosts.
//
// The Electron main process and the page's Web Worker each build their handlers here,
// passing only what differs between them (runtime name, version, platform).
import { APP_NAME } from '../app-identity';
import type { ApiHandlers } from './contract';

export interface HostInfo {
  readonly version: string;
  readonly runtime: 'electron' | 'web';
  readonly platform: string;
}

export function createCoreHandlers(host: HostInfo): ApiHandlers {
  return {
    getAppInfo: async () => ({ name: APP_NAME, version: host.version, runtime: host.runtime, platform: host.platform }),
  };
}
