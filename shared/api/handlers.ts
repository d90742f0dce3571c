// The API's behaviour, assembled once for both hosts.
//
// The Electron main process and the page's Web Worker each pass what differs between
// them: host facts for getAppInfo, and the file/shell requests (real in Electron,
// refused in the page, which uses the browser's own file handling instead).
import { APP_NAME } from '../app-identity';
import type { ApiHandlers } from './contract';
import type { EngineHandlers } from './engine-handlers';
import type { HistoryHandlers } from './history-handlers';

export interface HostInfo {
  readonly version: string;
  readonly runtime: 'electron' | 'web';
  readonly platform: string;
}

export type CoreHandlers = Pick<ApiHandlers, 'getAppInfo'>;
/** The desktop shell's requests: files, dialogs, theme, events. */
export type ShellHandlers = Omit<ApiHandlers, keyof CoreHandlers | keyof EngineHandlers | keyof HistoryHandlers>;

export function createCoreHandlers(host: HostInfo): CoreHandlers {
  return {
    getAppInfo: async () => ({ name: APP_NAME, version: host.version, runtime: host.runtime, platform: host.platform }),
  };
}

function onlyInDesktop(name: string): () => Promise<never> {
  return async () => {
    throw new Error(`${name} is only available in the desktop app; the page uses the browser's own file handling`);
  };
}

/** The shell requests as a plain page answers them: refused, naming the request. */
export function createPageShellHandlers(): ShellHandlers {
  return {
    openWorkspace: onlyInDesktop('openWorkspace'),
    saveWorkspace: onlyInDesktop('saveWorkspace'),
    newWorkspace: onlyInDesktop('newWorkspace'),
    importTripsFile: onlyInDesktop('importTripsFile'),
    chooseHistoryFile: onlyInDesktop('chooseHistoryFile'),
    autosaveWorkspace: onlyInDesktop('autosaveWorkspace'),
    takeRecovery: onlyInDesktop('takeRecovery'),
    discardRecovery: onlyInDesktop('discardRecovery'),
    recentWorkspaces: onlyInDesktop('recentWorkspaces'),
    setDocumentState: onlyInDesktop('setDocumentState'),
    setTheme: onlyInDesktop('setTheme'),
    nextAppEvent: onlyInDesktop('nextAppEvent'),
    openExternal: onlyInDesktop('openExternal'),
    exportReportPdf: onlyInDesktop('exportReportPdf'),
  };
}

export function combineHandlers(core: CoreHandlers, engine: EngineHandlers & HistoryHandlers, shell: ShellHandlers): ApiHandlers {
  return { ...core, ...engine, ...shell };
}
