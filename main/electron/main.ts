// Electron main process: one secure window, the contract's handlers, the menu and the
// workspace files. Logic lives in shared/ and in plain Node modules (main/workspace,
// the shell handlers, the engine thread); this file only wires Electron to them.
import { app, BrowserWindow, dialog, ipcMain, Menu, nativeTheme, protocol, screen, shell } from 'electron';
import path from 'node:path';
import { combineHandlers, createCoreHandlers } from '../../shared/api/handlers';
import { WORKSPACE_EXTENSION } from '../../shared/workspace/format';
import { fitToDisplays, WindowStateStore } from '../workspace/window-state';
import { WorkspaceSession } from '../workspace/workspace-session';
import { AppEventQueue } from './app-events';
import { APP_INDEX_URL, APP_SCHEME, APP_SCHEME_PRIVILEGES, createAppProtocolHandler } from './app-protocol';
import { CloseGuard } from './close-guard';
import { createThreadEngine } from './engine-thread-client';
import { hardenWebContents } from './harden';
import { fileSenderCheck, registerApiHandlers } from './ipc';
import { buildMenuTemplate } from './menu';
import { createShellHandlers } from './shell-handlers';
import { HistoryFileGate } from './history-gate';
import { Worker } from 'node:worker_threads';
import { printReportInElectron } from '../report/electron-pdf';
import { mainWindowOptions } from './window-options';

const rendererDir = path.join(__dirname, '..', 'renderer');
const preloadPath = path.join(__dirname, 'preload.cjs');
const engineThreadPath = path.join(__dirname, 'engine-thread.cjs');
const isDevelopment = !app.isPackaged;

// Must happen before the app is ready.
protocol.registerSchemesAsPrivileged([{ scheme: APP_SCHEME, privileges: APP_SCHEME_PRIVILEGES }]);

const events = new AppEventQueue();
let mainWindow: BrowserWindow | null = null;
let guard: CloseGuard | null = null;

const workspaceFilters = [{ name: 'Layline workspace', extensions: [WORKSPACE_EXTENSION] }];

function showOpen(options: Electron.OpenDialogOptions): Promise<Electron.OpenDialogReturnValue> {
  return mainWindow ? dialog.showOpenDialog(mainWindow, options) : dialog.showOpenDialog(options);
}

function showSave(options: Electron.SaveDialogOptions): Promise<Electron.SaveDialogReturnValue> {
  return mainWindow ? dialog.showSaveDialog(mainWindow, options) : dialog.showSaveDialog(options);
}

/** One existing file of the given kind (or any file), or null when the user cancels. */
async function chooseOneFile(title: string, kind: Electron.FileFilter): Promise<string | null> {
  const r = await showOpen({ title, properties: ['openFile'], filters: [kind, { name: 'All files', extensions: ['*'] }] });
  return r.canceled ? null : (r.filePaths[0] ?? null);
}

/** macOS sends open-file before the app is ready; those paths wait here. */
let openFromOs: (filePath: string) => void = (filePath) => earlyOpens.push(filePath);
const earlyOpens: string[] = [];
app.on('open-file', (event, filePath) => {
  event.preventDefault();
  openFromOs(filePath);
});

function installMenu(recent: readonly string[], session: WorkspaceSession): void {
  const template = buildMenuTemplate({
    platform: process.platform,
    isDevelopment,
    recent,
    send: (command) => events.push({ kind: 'menu', command }),
    openRecent: (filePath) => events.push({ kind: 'open-path', path: filePath }),
    clearRecent: () => {
      void (async () => {
        for (const p of await session.recent.list()) await session.recent.remove(p);
        app.clearRecentDocuments();
        installMenu([], session);
      })();
    },
  });
  Menu.setApplicationMenu(Menu.buildFromTemplate(template));
}

async function createWindow(windowState: WindowStateStore): Promise<BrowserWindow> {
  const saved = await windowState.load();
  const fitted = saved && fitToDisplays(saved, screen.getAllDisplays().map((d) => d.workArea));
  const base = mainWindowOptions(preloadPath);
  const win = new BrowserWindow(fitted ? { ...base, x: fitted.x, y: fitted.y, width: fitted.width, height: fitted.height, backgroundColor: nativeTheme.shouldUseDarkColors ? '#171b22' : '#f7f5f0' } : base);
  if (fitted?.maximized) win.maximize();
  hardenWebContents(win.webContents);
  win.once('ready-to-show', () => win.show());
  let saveTimer: NodeJS.Timeout | null = null;
  const rememberBounds = () => {
    if (saveTimer) clearTimeout(saveTimer);
    saveTimer = setTimeout(() => {
      if (win.isDestroyed()) return;
      void windowState.save({ ...win.getNormalBounds(), maximized: win.isMaximized() }).catch(() => undefined);
    }, 500);
  };
  win.on('resize', rememberBounds);
  win.on('move', rememberBounds);
  win.on('close', (event) => {
    if (guard?.shouldPreventClose()) {
      event.preventDefault();
      return;
    }
    void windowState.save({ ...win.getNormalBounds(), maximized: win.isMaximized() }).catch(() => undefined);
  });
  void win.loadURL(APP_INDEX_URL);
  return win;
}

/** A workspace path given on the command line (or by the OS on double-click). */
function workspaceArgument(argv: readonly string[]): string | null {
  return argv.slice(1).find((a) => a.endsWith(`.${WORKSPACE_EXTENSION}`)) ?? null;
}

// A second copy hands its file to the first (see 'second-instance') and quits.
const isPrimary = app.requestSingleInstanceLock();
if (!isPrimary) app.quit();

app.whenReady().then(async () => {
  if (!isPrimary) return;
  protocol.handle(APP_SCHEME, createAppProtocolHandler(rendererDir));
  const dataDir = app.getPath('userData');
  const session = new WorkspaceSession(dataDir);
  const windowState = new WindowStateStore(dataDir);
  const engine = createThreadEngine(engineThreadPath, (file) => new Worker(file, { workerData: { bundleFolder: path.join(dataDir, 'bundles') } }));
  const historyGate = new HistoryFileGate();
  openFromOs = (filePath: string) => {
    session.grantPath(filePath);
    events.push({ kind: 'open-path', path: path.resolve(filePath) });
  };
  for (const early of earlyOpens.splice(0)) openFromOs(early);

  const handlers = combineHandlers(
    createCoreHandlers({ version: app.getVersion(), runtime: 'electron', platform: process.platform }),
    { ...engine, ...historyGate.guard(engine) },
    createShellHandlers({
      session,
      events,
      chooseWorkspaceToOpen: async () => {
        const r = await showOpen({ title: 'Open a workspace', properties: ['openFile'], filters: workspaceFilters });
        return r.canceled ? null : (r.filePaths[0] ?? null);
      },
      chooseWorkspaceToSave: async (current) => {
        const r = await showSave({ title: 'Save the workspace', defaultPath: current ?? path.join(app.getPath('documents'), `workspace.${WORKSPACE_EXTENSION}`), filters: workspaceFilters });
        return r.canceled ? null : (r.filePath ?? null);
      },
      chooseTripsFile: () => chooseOneFile('Import trips', { name: 'Trips (CSV, TSV, text, iCalendar)', extensions: ['csv', 'tsv', 'txt', 'ics'] }),
      chooseHistoryFile: () => chooseOneFile('Choose a delay history file', { name: 'Delay history (CSV, Parquet)', extensions: ['csv', 'tsv', 'txt', 'parquet'] }),
      historyGate,
      setTheme: (theme) => {
        nativeTheme.themeSource = theme;
        return { dark: nativeTheme.shouldUseDarkColors };
      },
      openExternal: (url) => shell.openExternal(url),
      onDirty: (dirty) => guard?.setDirty(dirty),
      onSaveNotDone: () => guard?.saveDidNotHappen(),
      reportHtml: (analysisId, kind) => engine.exportReport(analysisId, kind),
      chooseReportPdfPath: async (suggestedName) => {
        const r = await showSave({ title: 'Save the report as PDF', defaultPath: path.join(app.getPath('documents'), suggestedName), filters: [{ name: 'PDF', extensions: ['pdf'] }] });
        return r.canceled ? null : (r.filePath ?? null);
      },
      printPdf: (html, paper, title) => printReportInElectron(html, paper, title),
      onRecentChanged: (paths) => {
        const latest = paths[0];
        if (latest) app.addRecentDocument(latest);
        installMenu(paths, session);
      },
    }),
  );
  registerApiHandlers(ipcMain, handlers, fileSenderCheck(APP_INDEX_URL));
  installMenu(await session.recent.list(), session);
  nativeTheme.on('updated', () => events.push({ kind: 'theme', dark: nativeTheme.shouldUseDarkColors }));

  mainWindow = await createWindow(windowState);
  guard = new CloseGuard({
    ask: async () => {
      const r = await dialog.showMessageBox(mainWindow!, {
        type: 'warning',
        buttons: ['Save', "Don't save", 'Cancel'],
        defaultId: 0,
        cancelId: 2,
        message: 'Save the changes to this workspace before closing?',
        detail: 'If you do not save, the changes are lost.',
      });
      return r.response === 0 ? 'save' : r.response === 1 ? 'discard' : 'cancel';
    },
    requestSave: () => events.push({ kind: 'menu', command: 'save' }),
    discard: () => session.autosave.clear(),
    close: () => mainWindow?.close(),
  });
  const fromArgs = workspaceArgument(process.argv);
  if (fromArgs) openFromOs(fromArgs);

  app.on('second-instance', (_event, argv) => {
    const file = workspaceArgument(argv);
    if (file) openFromOs(file);
    if (mainWindow) {
      if (mainWindow.isMinimized()) mainWindow.restore();
      mainWindow.focus();
    }
  });
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) void createWindow(windowState).then((w) => (mainWindow = w));
  });
  app.on('before-quit', () => void engine.close());
});

app.on('web-contents-created', (_event, contents) => hardenWebContents(contents));

app.on('window-all-closed', () => {
  if (process.platform !== 'darwin') app.quit();
});
