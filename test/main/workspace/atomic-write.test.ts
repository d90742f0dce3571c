// Atomic writes on real temp files, with crashes injected between the steps.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import * as fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { backupPathFor, writeFileAtomic, type AtomicWriteFs } from '../../../main/workspace/atomic-write';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-atomic-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

class SimulatedCrash extends Error {}

/** Real fs, except that the named step throws, as if the process died there. */
function crashingFs(step: 'write' | 'rename-target' | 'backup'): AtomicWriteFs {
  return {
    open: (async (file: string, flags: string, mode?: number) => {
      const handle = await fsp.open(file, flags, mode);
      if (step !== 'write' || flags !== 'wx') return handle;
      // Write half of what was asked, then "die" before fsync.
      const realWriteFile = handle.writeFile.bind(handle);
      return Object.assign(handle, {
        writeFile: async (data: string | Uint8Array) => {
          await realWriteFile(typeof data === 'string' ? data.slice(0, data.length / 2) : data.slice(0, data.length / 2));
          throw new SimulatedCrash('power lost mid-write');
        },
      });
    }) as AtomicWriteFs['open'],
    rename: (async (from: string, to: string) => {
      if (step === 'rename-target' && !to.endsWith('.bak')) throw new SimulatedCrash('killed before rename');
      if (step === 'backup' && to.endsWith('.bak')) throw new SimulatedCrash('killed while keeping the backup');
      return fsp.rename(from, to);
    }) as AtomicWriteFs['rename'],
    copyFile: fsp.copyFile,
    unlink: fsp.unlink,
  };
}

describe('writeFileAtomic', () => {
  it('creates a new file with exactly the given content', async () => {
    const target = path.join(dir, 'trip.layline');
    await writeFileAtomic(target, 'hello\n', { keepBackup: true });
    expect(await readFile(target, 'utf8')).toBe('hello\n');
    expect(await readdir(dir)).toEqual(['trip.layline']);
  });

  it('keeps the previous copy as a .bak file', async () => {
    const target = path.join(dir, 'trip.layline');
    await writeFile(target, 'version one');
    await writeFileAtomic(target, 'version two', { keepBackup: true });
    expect(await readFile(target, 'utf8')).toBe('version two');
    expect(await readFile(backupPathFor(target), 'utf8')).toBe('version one');
  });

  it.each(['write', 'backup', 'rename-target'] as const)('a crash at the %s step leaves the previous file intact and no temp file', async (step) => {
    const target = path.join(dir, 'trip.layline');
    const previous = JSON.stringify({ precious: 'x'.repeat(10_000) });
    await writeFile(target, previous);
    await expect(writeFileAtomic(target, 'y'.repeat(20_000), { keepBackup: true, fs: crashingFs(step) })).rejects.toBeInstanceOf(SimulatedCrash);
    expect(await readFile(target, 'utf8')).toBe(previous);
    const left = (await readdir(dir)).filter((f) => f.endsWith('.tmp'));
    expect(left).toEqual([]);
  });
});
