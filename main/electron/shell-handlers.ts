// The desktop shell's side of the contract: workspaces, import, recovery, theme, events and
// external links. Electron's dialogs, nativeTheme and shell are passed in, so this runs and
// is tested without Electron.
import type { ShellHandlers } from '../../shared/api/handlers';
import type { ThemeChoice } from '../../shared/workspace/settings';
import type { WorkspaceSession } from '../workspace/workspace-session';
import type { AppEventQueue } from './app-events';
import { isAllowedExternal } from './external-links';

export interface ShellDeps {
  readonly session: WorkspaceSession;
  readonly events: AppEventQueue;
  /** Native dialogs; each resolves null when the user cancels. */
  readonly chooseWorkspaceToOpen: () => Promise<string | null>;
  readonly chooseWorkspaceToSave: (suggestedPath: string | null) => Promise<string | null>;
  readonly chooseTripsFile: () => Promise<string | null>;
  readonly setTheme: (theme: ThemeChoice) => { dark: boolean };
  readonly openExternal: (url: string) => Promise<void>;
  /** The page's unsaved-changes state, for the prompt on close. */
  readonly onDirty: (dirty: boolean) => void;
  /** A save was asked for and did not happen (cancelled or failed). */
  readonly onSaveNotDone: () => void;
  /** Called after the recent list changes (to rebuild the menu). */
  readonly onRecentChanged: (paths: string[]) => void;
}

export function createShellHandlers(deps: ShellDeps): ShellHandlers {
  const { session } = deps;
  const recentChanged = async () => deps.onRecentChanged(await session.recent.list());
  return {
    openWorkspace: async (filePath) => {
      let chosen = filePath;
      if (chosen === null) chosen = await deps.chooseWorkspaceToOpen();
      else if (!(await session.mayOpen(chosen))) return { status: 'failed', filePath: chosen, message: `${chosen} is not a recent workspace; open it with File › Open.` };
      if (chosen === null) return { status: 'cancelled' };
      const result = await session.open(chosen);
      await recentChanged();
      return result;
    },
    saveWorkspace: async (content, saveAs) => {
      let target: string | null = null;
      if (saveAs || session.filePath === null) {
        target = await deps.chooseWorkspaceToSave(session.filePath);
        if (target === null) {
          deps.onSaveNotDone();
          return { status: 'cancelled' };
        }
      }
      const result = await session.save(content, target);
      if (result.status !== 'saved') deps.onSaveNotDone();
      await recentChanged();
      return result;
    },
    newWorkspace: async () => {
      session.reset();
      return null;
    },
    importTripsFile: async () => {
      const file = await deps.chooseTripsFile();
      return file === null ? { status: 'cancelled' } : session.importTrips(file);
    },
    autosaveWorkspace: async (content) => {
      await session.writeAutosave(content);
      return null;
    },
    takeRecovery: () => session.takeRecovery(),
    discardRecovery: async () => {
      await session.autosave.clear();
      return null;
    },
    recentWorkspaces: () => session.recent.list(),
    setDocumentState: async ({ dirty }) => {
      deps.onDirty(dirty);
      return null;
    },
    setTheme: async (theme) => deps.setTheme(theme),
    nextAppEvent: () => deps.events.next(),
    openExternal: async (url) => {
      if (!isAllowedExternal(url)) return false;
      await deps.openExternal(url);
      return true;
    },
  };
}
