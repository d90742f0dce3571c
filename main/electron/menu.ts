// The application menu as a plain template: standard roles for the edit, view and window
// items, accelerators for the workspace commands, reload and devtools only in development.
//
// Undo, Redo and Save show their accelerators without registering them: the page handles
// those keys itself (its undo covers the whole workspace, not just one text field), so the
// menu only sends the same command when clicked.
import type { MenuItemConstructorOptions } from 'electron';
import type { MenuCommand } from '../../shared/api/contract';
import { APP_NAME } from '../../shared/app-identity';

export interface MenuOptions {
  readonly platform: NodeJS.Platform;
  readonly isDevelopment: boolean;
  readonly recent: readonly string[];
  readonly send: (command: MenuCommand) => void;
  readonly openRecent: (filePath: string) => void;
  readonly clearRecent: () => void;
}

export function buildMenuTemplate(o: MenuOptions): MenuItemConstructorOptions[] {
  const mac = o.platform === 'darwin';
  const command = (label: string, cmd: MenuCommand, accelerator?: string, pageHandlesKey = false): MenuItemConstructorOptions => ({
    label,
    accelerator,
    registerAccelerator: accelerator ? !pageHandlesKey : undefined,
    click: () => o.send(cmd),
  });
  const recentItems: MenuItemConstructorOptions[] = o.recent.length
    ? [...o.recent.map((p) => ({ label: p, click: () => o.openRecent(p) })), { type: 'separator' }, { label: 'Clear the list', click: o.clearRecent }]
    : [{ label: 'No recent workspaces', enabled: false }];
  const file: MenuItemConstructorOptions = {
    label: '&File',
    submenu: [
      command('New workspace', 'new', 'CmdOrCtrl+N'),
      command('Open…', 'open', 'CmdOrCtrl+O', true),
      { label: 'Open recent', role: mac ? 'recentDocuments' : undefined, submenu: recentItems },
      { type: 'separator' },
      command('Save', 'save', 'CmdOrCtrl+S', true),
      command('Save as…', 'save-as', 'CmdOrCtrl+Shift+S', true),
      { type: 'separator' },
      command('Import trips…', 'import', 'CmdOrCtrl+I'),
      command('Load the demo workspace', 'load-demo'),
      ...(mac ? [] : [{ type: 'separator' } as const, command('Settings', 'show-settings', 'CmdOrCtrl+,'), { type: 'separator' } as const, { role: 'quit' } as const]),
    ],
  };
  const edit: MenuItemConstructorOptions = {
    label: '&Edit',
    submenu: [
      command('Undo', 'undo', 'CmdOrCtrl+Z', true),
      command('Redo', 'redo', mac ? 'Shift+CmdOrCtrl+Z' : 'CmdOrCtrl+Y', true),
      { type: 'separator' },
      { role: 'cut' },
      { role: 'copy' },
      { role: 'paste' },
      { role: 'selectAll' },
      { type: 'separator' },
      command('Find a traveler', 'find', 'CmdOrCtrl+F', true),
    ],
  };
  const view: MenuItemConstructorOptions = {
    label: '&View',
    submenu: [
      ...(o.isDevelopment ? [{ role: 'reload' } as const, { role: 'forceReload' } as const, { role: 'toggleDevTools' } as const, { type: 'separator' } as const] : []),
      { role: 'resetZoom' },
      { role: 'zoomIn' },
      { role: 'zoomOut' },
      { type: 'separator' },
      { role: 'togglefullscreen' },
    ],
  };
  const windowMenu: MenuItemConstructorOptions = { role: 'windowMenu' };
  const appMenu: MenuItemConstructorOptions[] = mac
    ? [{ label: APP_NAME, submenu: [{ role: 'about' }, { type: 'separator' }, command('Settings…', 'show-settings', 'Cmd+,'), { type: 'separator' }, { role: 'hide' }, { role: 'hideOthers' }, { role: 'unhide' }, { type: 'separator' }, { role: 'quit' }] }]
    : [];
  return [...appMenu, file, edit, view, windowMenu];
}
