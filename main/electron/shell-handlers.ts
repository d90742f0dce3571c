// The desktop shell's side of the contract: workspaces, import, recovery, theme, events and
// external links. Electron's dialogs, nativeTheme and shell are passed in, so this runs and
// is tested without Electron.
import type { ShellHandlers } from '../../shared/api/handlers';
import type { ThemeChoice } from '../../shared/workspace/settings';
import type { WorkspaceSession } from '../workspace/workspace-session';
import type { AppEventQueue } from './app-events';
import type { ReportExport } from '../../shared/api/contract';
import type { PaperSize } from '../../shared/report/print-layout';
import { writeFileAtomic } from '../workspace/atomic-write';
import { isAllowedExternal } from './external-links';
import type { HistoryFileGate } from './history-gate';

export interface ShellDeps {
  readonly session: WorkspaceSession;
  readonly events: AppEventQueue;
  /** Native dialogs; each resolves null when the user cancels. */
  readonly chooseWorkspaceToOpen: () => Promise<string | null>;
  readonly chooseWorkspaceToSave: (suggestedPath: string | null) => Promise<string | null>;
  readonly chooseTripsFile: () => Promise<string | null>;
  readonly chooseHistoryFile: () => Promise<string | null>;
  /** Where a chosen history path is recorded as readable by the engine. */
  readonly historyGate: HistoryFileGate;
  readonly setTheme: (theme: ThemeChoice) => { dark: boolean };
  readonly openExternal: (url: string) => Promise<void>;
  /** The page's unsaved-changes state, for the prompt on close. */
  readonly onDirty: (dirty: boolean) => void;
  /** A save was asked for and did not happen (cancelled or failed). */
  readonly onSaveNotDone: () => void;
  /** Called after the recent list changes (to rebuild the menu). */
  readonly onRecentChanged: (paths: string[]) => void;
  /** A report of an analysis as HTML, from the engine (its exportReport request). */
  readonly reportHtml: (analysisId: string, kind: 'manager' | 'briefings') => Promise<ReportExport>;
  /** Asks where to save a PDF; null when the user cancels. */
  readonly chooseReportPdfPath: (suggestedName: string) => Promise<string | null>;
  /** Prints standalone HTML to PDF bytes (main/report/electron-pdf.ts in the app). */
  readonly printPdf: (html: string, paper: PaperSize, title: string) => Promise<Uint8Array>;
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
    chooseHistoryFile: async () => {
      const file = await deps.chooseHistoryFile();
      return file === null ? { status: 'cancelled' } : deps.historyGate.grant(file);
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
    exportReportPdf: async (analysisId, kind, paper) => {
      try {
        const report = await deps.reportHtml(analysisId, kind);
        const target = await deps.chooseReportPdfPath(report.fileName.replace(/\.html$/, '.pdf'));
        if (target === null) return { status: 'cancelled' };
        const pdf = await deps.printPdf(report.text, paper, report.title);
        await writeFileAtomic(target, pdf);
        return { status: 'saved', filePath: target };
      } catch (err) {
        return { status: 'failed', message: `The PDF was not written: ${err instanceof Error ? err.message : String(err)}` };
      }
    },
    openExternal: async (url) => {
      if (!isAllowedExternal(url)) return false;
      await deps.openExternal(url);
      return true;
    },
  };
}
