// The preload: exposes exactly one typed object, never ipcRenderer itself.
//
// It runs sandboxed, so it is bundled into one CommonJS file that needs only `electron`.
import { contextBridge, ipcRenderer } from 'electron';
import { API_GLOBAL_NAME } from '../../shared/api/contract';
import { createApiClient } from '../../shared/api/client';

contextBridge.exposeInMainWorld(API_GLOBAL_NAME, createApiClient((channel, args) => ipcRenderer.invoke(channel, ...args)));
