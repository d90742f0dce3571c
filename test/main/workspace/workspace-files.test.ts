// Opening and saving workspace files on real temp files.
import { mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readWorkspaceFile, writeWorkspaceFile } from '../../../main/workspace/workspace-files';
import { EMPTY_WORKSPACE, type WorkspaceContent } from '../../../shared/workspace/format';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-ws-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

const content: WorkspaceContent = { ...EMPTY_WORKSPACE, tripsText: 'traveler,trip,flight,from,depart,to,arrive\nAda,T1,UA 1,ORD,2026-03-08 07:00,BOS,10:30\n', theme: 'dark' };

describe('workspace files', () => {
  it('saves and reads back the same content', async () => {
    const file = path.join(dir, 'offsite.layline');
    await writeWorkspaceFile(file, content, new Date('2026-02-01T10:00:00Z'));
    const read = await readWorkspaceFile(file);
    expect(read.content).toEqual(content);
    expect(read.savedAt).toBe('2026-02-01T10:00:00.000Z');
  });

  it('a corrupt workspace file gives a clear error and is left untouched by open and by save', async () => {
    const file = path.join(dir, 'damaged.layline');
    const garbage = '{"format":"layline-workspace","version":1,"savedAt":"2026-02-01T10:00:00Z","content":{"tripsText":"Ada,T1';
    await writeFile(file, garbage);
    const before = await stat(file);
    await expect(readWorkspaceFile(file)).rejects.toThrow(/damaged or is not a Layline workspace.*left as it is/);
    await expect(writeWorkspaceFile(file, content, new Date())).rejects.toThrow(/will not overwrite it/);
    expect(await readFile(file, 'utf8')).toBe(garbage);
    expect((await stat(file)).mtimeMs).toBe(before.mtimeMs);
  });

  it('refuses to overwrite a file that is some other program’s JSON', async () => {
    const file = path.join(dir, 'package.json');
    await writeFile(file, '{"name":"not-a-workspace"}');
    await expect(writeWorkspaceFile(file, content, new Date())).rejects.toThrow(/not a readable Layline workspace/);
    expect(await readFile(file, 'utf8')).toBe('{"name":"not-a-workspace"}');
  });

  it('names a missing file in the error', async () => {
    await expect(readWorkspaceFile(path.join(dir, 'nope.layline'))).rejects.toThrow(/Could not read .*nope\.layline/);
  });
});
