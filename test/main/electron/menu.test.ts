// The application menu template: standard roles, accelerators, and reload only in development.
import { describe, expect, it, vi } from 'vitest';
import type { MenuItemConstructorOptions } from 'electron';
import { buildMenuTemplate } from '../../../main/electron/menu';

function flatten(items: readonly MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  return items.flatMap((i) => [i, ...(Array.isArray(i.submenu) ? flatten(i.submenu) : [])]);
}

const base = { recent: [] as string[], send: vi.fn(), openRecent: vi.fn(), clearRecent: vi.fn() };

describe('buildMenuTemplate', () => {
  it('uses the standard roles for editing, zoom and the window', () => {
    const roles = flatten(buildMenuTemplate({ ...base, platform: 'linux', isDevelopment: false })).map((i) => i.role).filter(Boolean);
    expect(roles).toEqual(expect.arrayContaining(['cut', 'copy', 'paste', 'selectAll', 'resetZoom', 'zoomIn', 'zoomOut', 'togglefullscreen', 'windowMenu', 'quit']));
  });

  it('offers reload and developer tools only in development', () => {
    const prod = flatten(buildMenuTemplate({ ...base, platform: 'linux', isDevelopment: false })).map((i) => i.role);
    const dev = flatten(buildMenuTemplate({ ...base, platform: 'linux', isDevelopment: true })).map((i) => i.role);
    expect(prod).not.toContain('reload');
    expect(prod).not.toContain('toggleDevTools');
    expect(dev).toEqual(expect.arrayContaining(['reload', 'toggleDevTools']));
  });

  it('gives open, save, save as, undo and redo their usual accelerators and sends the command', () => {
    const send = vi.fn();
    const items = flatten(buildMenuTemplate({ ...base, send, platform: 'win32', isDevelopment: false }));
    const byLabel = (label: string) => items.find((i) => i.label === label)!;
    expect(byLabel('Open…').accelerator).toBe('CmdOrCtrl+O');
    expect(byLabel('Save').accelerator).toBe('CmdOrCtrl+S');
    expect(byLabel('Save as…').accelerator).toBe('CmdOrCtrl+Shift+S');
    expect(byLabel('Undo').accelerator).toBe('CmdOrCtrl+Z');
    expect(byLabel('Redo').accelerator).toBe('CmdOrCtrl+Y');
    // The page handles these keys itself, so the menu must not swallow them.
    expect(byLabel('Undo').registerAccelerator).toBe(false);
    const click = byLabel('Save as…').click as () => void;
    click();
    expect(send).toHaveBeenCalledWith('save-as');
  });

  it('puts the app menu first on macOS and lists recent workspaces', () => {
    const openRecent = vi.fn();
    const template = buildMenuTemplate({ ...base, openRecent, recent: ['/w/a.layline'], platform: 'darwin', isDevelopment: false });
    expect(template[0]?.label).toBe('Layline');
    const item = flatten(template).find((i) => i.label === '/w/a.layline')!;
    (item.click as () => void)();
    expect(openRecent).toHaveBeenCalledWith('/w/a.layline');
  });
});
