// Finds the API object: the preload's in Electron, otherwise the in-page implementation.
import type { LaylineApi } from '../../shared/api/contract';
import { createInPageApi } from './in-page-api';

declare global {
  interface Window {
    /** Put here by the Electron preload (see shared/api/contract.ts, API_GLOBAL_NAME). */
    readonly layline?: LaylineApi;
  }
}

let cached: LaylineApi | null = null;

export function getApi(): LaylineApi {
  cached ??= window.layline ?? createInPageApi();
  return cached;
}
