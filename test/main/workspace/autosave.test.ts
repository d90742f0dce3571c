// Autosave, recovery after a crash, recent documents and window state on real temp folders.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { AutosaveStore } from '../../../main/workspace/autosave';
import { addRecent, MAX_RECENT, RecentDocuments } from '../../../main/workspace/recent-documents';
import { fitToDisplays, WindowStateStore } from '../../../main/workspace/window-state';
import { EMPTY_WORKSPACE } from '../../../shared/workspace/format';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-data-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('AutosaveStore', () => {
  it('finds nothing to recover on a first run', async () => {
    await expect(new AutosaveStore(dir).read()).resolves.toEqual({ kind: 'none' });
  });

  it('offers the autosaved work back to the next session, and forgets it once cleared', async () => {
    const content = { ...EMPTY_WORKSPACE, tripsText: 'unsaved lines' };
    await new AutosaveStore(dir).write(content, '/home/c/offsite.layline', new Date('2026-02-01T09:00:00Z'));
    // A new store stands in for the next start of the app after a crash.
    const next = await new AutosaveStore(dir).read();
    expect(next).toMatchObject({ kind: 'found', recovery: { sourcePath: '/home/c/offsite.layline', savedAt: '2026-02-01T09:00:00.000Z', content } });
    await new AutosaveStore(dir).clear();
    await expect(new AutosaveStore(dir).read()).resolves.toEqual({ kind: 'none' });
  });

  it('reports a damaged recovery file and moves it aside, so the next autosave cannot overwrite it', async () => {
    const store = new AutosaveStore(dir);
    await store.write(EMPTY_WORKSPACE, null, new Date());
    await writeFile(store.file, '{"format":"layline-recovery", "trunc');
    const read = await store.read();
    expect(read.kind).toBe('unreadable');
    if (read.kind !== 'unreadable') return;
    expect(read.file).toMatch(/recovery\.damaged-\d+\.json$/);
    expect(await readFile(read.file, 'utf8')).toContain('trunc');
    await store.write(EMPTY_WORKSPACE, null, new Date());
    expect(await readFile(read.file, 'utf8')).toContain('trunc');
  });
});

describe('recent documents', () => {
  it('puts the newest first without duplicates and keeps at most ten', async () => {
    let list: string[] = [];
    for (let i = 0; i < 12; i++) list = addRecent(list, `/w/${i}.layline`);
    list = addRecent(list, '/w/5.layline');
    expect(list[0]).toBe('/w/5.layline');
    expect(list).toHaveLength(MAX_RECENT);
    expect(new Set(list).size).toBe(list.length);
  });

  it('persists across instances and treats a damaged list as empty', async () => {
    await new RecentDocuments(dir).add('/w/a.layline');
    await new RecentDocuments(dir).add('/w/b.layline');
    expect(await new RecentDocuments(dir).list()).toEqual(['/w/b.layline', '/w/a.layline']);
    await writeFile(path.join(dir, 'recent-workspaces.json'), 'not json');
    expect(await new RecentDocuments(dir).list()).toEqual([]);
  });
});

describe('window state', () => {
  const screen = { x: 0, y: 0, width: 1920, height: 1080 };

  it('restores a window that fits on a display', async () => {
    const store = new WindowStateStore(dir);
    await store.save({ x: 100, y: 80, width: 1200, height: 800, maximized: true });
    const saved = await store.load();
    expect(saved && fitToDisplays(saved, [screen])).toEqual({ x: 100, y: 80, width: 1200, height: 800, maximized: true });
  });

  it('drops a position on a display that is gone, and shrinks one larger than the display', () => {
    expect(fitToDisplays({ x: 2500, y: 100, width: 1000, height: 700, maximized: false }, [screen])).toBeNull();
    expect(fitToDisplays({ x: -10, y: 0, width: 2400, height: 1300, maximized: false }, [screen])).toEqual({ x: 0, y: 0, width: 1920, height: 1080, maximized: false });
  });
});
