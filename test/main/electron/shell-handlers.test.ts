// The desktop shell's requests over a real WorkspaceSession on temp files, dialogs faked.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { AppEventQueue } from '../../../main/electron/app-events';
import { createShellHandlers, type ShellDeps } from '../../../main/electron/shell-handlers';
import { HistoryFileGate } from '../../../main/electron/history-gate';
import { WorkspaceSession } from '../../../main/workspace/workspace-session';
import { EMPTY_WORKSPACE } from '../../../shared/workspace/format';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-shell-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

function shell(overrides: Partial<ShellDeps> = {}) {
  const session = new WorkspaceSession(path.join(dir, 'data'), () => new Date('2026-02-01T12:00:00Z'));
  const deps: ShellDeps = {
    session,
    events: new AppEventQueue(),
    chooseWorkspaceToOpen: vi.fn(async () => null),
    chooseWorkspaceToSave: vi.fn(async () => path.join(dir, 'offsite')),
    chooseTripsFile: vi.fn(async () => null),
    chooseHistoryFile: vi.fn(async () => null),
    historyGate: new HistoryFileGate(),
    setTheme: vi.fn(() => ({ dark: true })),
    openExternal: vi.fn(async () => undefined),
    onDirty: vi.fn(),
    onSaveNotDone: vi.fn(),
    onRecentChanged: vi.fn(),
    reportHtml: vi.fn(async (_id: string, kind: 'manager' | 'briefings') => ({ title: `The ${kind} report`, fileName: `layline-${kind}-2026-02-01.html`, mimeType: 'text/html' as const, text: '<!doctype html><p>report</p>' })),
    chooseReportPdfPath: vi.fn(async (name: string) => path.join(dir, name)),
    printPdf: vi.fn(async () => new TextEncoder().encode('%PDF-1.7 fake bytes')),
    ...overrides,
  };
  return { handlers: createShellHandlers(deps), deps, session };
}

const content = { ...EMPTY_WORKSPACE, tripsText: 'Ada,T,UA 1,ORD,2026-03-08 07:00,BOS,10:30' };

describe('shell handlers', () => {
  it('asks where on the first save, then saves to the same file, and opens it back', async () => {
    const { handlers, deps } = shell();
    const first = await handlers.saveWorkspace(content, false);
    expect(first).toEqual({ status: 'saved', filePath: path.join(dir, 'offsite.layline') });
    await handlers.saveWorkspace({ ...content, tripsText: 'second' }, false);
    expect(deps.chooseWorkspaceToSave).toHaveBeenCalledTimes(1);
    expect(JSON.parse(await readFile(path.join(dir, 'offsite.layline.bak'), 'utf8')).content.tripsText).toBe(content.tripsText);
    const reopened = await shell().handlers.openWorkspace(path.join(dir, 'offsite.layline'));
    expect(reopened).toMatchObject({ status: 'opened', content: { tripsText: 'second' } });
    expect(deps.onRecentChanged).toHaveBeenCalledWith([path.join(dir, 'offsite.layline')]);
  });

  it('will not open a path the page names unless it is a recent document', async () => {
    const secret = path.join(dir, 'secret.layline');
    await writeFile(secret, 'x');
    const r = await shell().handlers.openWorkspace(secret);
    expect(r).toMatchObject({ status: 'failed', message: expect.stringMatching(/not a recent workspace/) });
  });

  it('reports a corrupt workspace chosen in the dialog and leaves it alone', async () => {
    const bad = path.join(dir, 'bad.layline');
    await writeFile(bad, '{"format":"layline-workspace"');
    const { handlers } = shell({ chooseWorkspaceToOpen: async () => bad });
    const r = await handlers.openWorkspace(null);
    expect(r).toMatchObject({ status: 'failed', message: expect.stringMatching(/damaged or is not a Layline workspace/) });
    expect(await readFile(bad, 'utf8')).toBe('{"format":"layline-workspace"');
  });

  it('cancels cleanly when the user closes a dialog', async () => {
    const { handlers, deps } = shell({ chooseWorkspaceToSave: async () => null });
    await expect(handlers.saveWorkspace(content, true)).resolves.toEqual({ status: 'cancelled' });
    expect(deps.onSaveNotDone).toHaveBeenCalled();
    await expect(handlers.openWorkspace(null)).resolves.toEqual({ status: 'cancelled' });
    await expect(handlers.importTripsFile()).resolves.toEqual({ status: 'cancelled' });
  });

  it('imports a trips file chosen in the dialog', async () => {
    const file = path.join(dir, 'trips.csv');
    await writeFile(file, 'traveler,trip\n');
    const { handlers } = shell({ chooseTripsFile: async () => file });
    await expect(handlers.importTripsFile()).resolves.toEqual({ status: 'imported', name: 'trips.csv', text: 'traveler,trip\n' });
  });

  it('autosaves, offers the work back after a restart, and forgets it after a save', async () => {
    const { handlers } = shell();
    await handlers.autosaveWorkspace(content);
    const next = shell();
    await expect(next.handlers.takeRecovery()).resolves.toMatchObject({ content, sourcePath: null });
    await next.handlers.saveWorkspace(content, false);
    await expect(shell().handlers.takeRecovery()).resolves.toBeNull();
  });

  it('opens only allow-listed https links and reports dirty state', async () => {
    const { handlers, deps } = shell();
    await expect(handlers.openExternal('https://evil.example/')).resolves.toBe(false);
    await expect(handlers.openExternal('https://www.iana.org/time-zones')).resolves.toBe(true);
    expect(deps.openExternal).toHaveBeenCalledTimes(1);
    await handlers.setDocumentState({ dirty: true });
    expect(deps.onDirty).toHaveBeenCalledWith(true);
  });
});

describe('exportReportPdf', () => {
  it('prints the engine\'s report HTML and writes the PDF where the user chose', async () => {
    const { handlers, deps } = shell();
    const r = await handlers.exportReportPdf('3', 'manager', 'Letter');
    const target = path.join(dir, 'layline-manager-2026-02-01.pdf');
    expect(r).toEqual({ status: 'saved', filePath: target });
    expect(deps.reportHtml).toHaveBeenCalledWith('3', 'manager');
    expect(deps.printPdf).toHaveBeenCalledWith('<!doctype html><p>report</p>', 'Letter', 'The manager report');
    expect(await readFile(target, 'utf8')).toBe('%PDF-1.7 fake bytes');
  });

  it('writes nothing when the user cancels the dialog', async () => {
    const { handlers, deps } = shell({ chooseReportPdfPath: vi.fn(async () => null) });
    expect(await handlers.exportReportPdf('3', 'briefings', 'A4')).toEqual({ status: 'cancelled' });
    expect(deps.printPdf).not.toHaveBeenCalled();
  });

  it('reports a failed print and leaves an existing file untouched', async () => {
    const target = path.join(dir, 'layline-briefings-2026-02-01.pdf');
    await writeFile(target, 'the earlier PDF');
    const { handlers } = shell({
      printPdf: vi.fn(async () => {
        throw new Error('renderer crashed');
      }),
    });
    const r = await handlers.exportReportPdf('3', 'briefings', 'A4');
    expect(r).toEqual({ status: 'failed', message: expect.stringMatching(/not written: renderer crashed/) });
    expect(await readFile(target, 'utf8')).toBe('the earlier PDF');
  });
});
