// Electron main process: one secure window, the API handlers, nothing else.
//
// Logic lives in shared/ and in plain Node modules; this file only wires Electron to them.
import { app, BrowserWindow, ipcMain } from 'electron';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { createCoreHandlers } from '../../shared/api/handlers';
import { fileSenderCheck, registerApiHandlers } from './ipc';
import { mainWindowOptions } from './window-options';
import { hardenWebContents } from './harden';

const rendererIndex = path.join(__dirname, '..', 'renderer', 'index.html');
const preloadPath = path.join(__dirname, 'preload.cjs');

function createWindow(): BrowserWindow {
  const win = new BrowserWindow(mainWindowOptions(preloadPath));
  hardenWebContents(win.webContents);
  win.once('ready-to-show', () => win.show());
  void win.loadFile(rendererIndex);
  return win;
}

app.whenReady().then(() => {
  registerApiHandlers(
    ipcMain,
    createCoreHandlers({ version: app.getVersion(), runtime: 'electron', platform: process.platform }),
    fileSenderCheck(pathToFileURL(rendererIndex).href),
  );
  createWindow();
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) createWindow();
  });
});

app.on('window-all-closed', () => {
  if (process.platform !== 'darwin') app.quit();
});
