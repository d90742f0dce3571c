// Crash-safe file replacement: write a temp file beside the target, fsync it, keep the
// previous copy as `<name>.bak`, then rename over the target and fsync the folder.
//
// A crash at any step leaves either the old file or the new one at the target path,
// never a half-written mix (POSIX rename(2) replaces the target atomically).
import { randomBytes } from 'node:crypto';
import * as fsp from 'node:fs/promises';
import path from 'node:path';

/** The file-system calls an atomic write makes, injectable so tests can crash between them. */
export interface AtomicWriteFs {
  readonly open: typeof fsp.open;
  readonly rename: typeof fsp.rename;
  readonly copyFile: typeof fsp.copyFile;
  readonly unlink: typeof fsp.unlink;
}

const realFs: AtomicWriteFs = { open: fsp.open, rename: fsp.rename, copyFile: fsp.copyFile, unlink: fsp.unlink };

export interface AtomicWriteOptions {
  /** Keep the file being replaced as `<target>.bak` (itself written atomically). */
  readonly keepBackup?: boolean;
  readonly fs?: AtomicWriteFs;
}

export function backupPathFor(target: string): string {
  return target + '.bak';
}

function tempPathFor(target: string): string {
  return path.join(path.dirname(target), `.${path.basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
}

async function writeAndSync(fs: AtomicWriteFs, file: string, data: string | Uint8Array): Promise<void> {
  const handle = await fs.open(file, 'wx', 0o644);
  try {
    await handle.writeFile(data);
    await handle.sync();
  } finally {
    await handle.close();
  }
}

async function syncFolder(fs: AtomicWriteFs, folder: string): Promise<void> {
  // Makes the rename itself durable. Windows cannot open a folder for syncing; there the
  // rename is already journalled by NTFS, so the failure is ignored.
  let handle: fsp.FileHandle | null = null;
  try {
    handle = await fs.open(folder, 'r');
    await handle.sync();
  } catch {
    /* see above */
  } finally {
    await handle?.close().catch(() => undefined);
  }
}

async function exists(file: string): Promise<boolean> {
  try {
    await fsp.access(file);
    return true;
  } catch {
    return false;
  }
}

export async function writeFileAtomic(target: string, data: string | Uint8Array, options: AtomicWriteOptions = {}): Promise<void> {
  const fs = options.fs ?? realFs;
  const temp = tempPathFor(target);
  const backupTemp = tempPathFor(backupPathFor(target));
  try {
    await writeAndSync(fs, temp, data);
    if (options.keepBackup && (await exists(target))) {
      await fs.copyFile(target, backupTemp);
      await fs.rename(backupTemp, backupPathFor(target));
    }
    await fs.rename(temp, target);
  } catch (err) {
    for (const leftover of [temp, backupTemp]) await fs.unlink(leftover).catch(() => undefined);
    throw err;
  }
  await syncFolder(fs, path.dirname(target));
}
