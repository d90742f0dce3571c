// A ByteSource on a file handle, for the CLI and the Electron engine thread: reads ranges on
// demand, so a history file of any size is streamed. Open and read failures become
// HistoryFileErrors that say what is wrong with the path.
import { open, type FileHandle } from 'node:fs/promises';
import type { ByteSource } from '../../shared/history/byte-source';
import { HistoryFileError } from '../../shared/history/history-file-error';

function describe(path: string, err: unknown): HistoryFileError {
  const code = (err as NodeJS.ErrnoException).code;
  if (code === 'ENOENT') return new HistoryFileError(`no such file: ${path}`);
  if (code === 'EISDIR') return new HistoryFileError(`${path} is a folder, not a file`);
  return new HistoryFileError(`cannot read ${path}: ${(err as Error).message}`);
}

/** Opens `path`, runs `use` on its ByteSource and closes the handle whatever happens. */
export async function withFileSource<T>(path: string, use: (source: ByteSource) => Promise<T>): Promise<T> {
  let handle: FileHandle;
  let size: number;
  try {
    handle = await open(path, 'r');
  } catch (err) {
    throw describe(path, err);
  }
  try {
    try {
      const stat = await handle.stat();
      if (stat.isDirectory()) throw Object.assign(new Error('is a directory'), { code: 'EISDIR' });
      size = stat.size;
    } catch (err) {
      throw describe(path, err);
    }
    const source: ByteSource = {
      name: path,
      size,
      read: async (start, end) => {
        const length = Math.max(0, Math.min(end, size) - start);
        const buffer = new Uint8Array(length);
        let filled = 0;
        try {
          while (filled < length) {
            const { bytesRead } = await handle.read(buffer, filled, length - filled, start + filled);
            if (bytesRead === 0) break;
            filled += bytesRead;
          }
        } catch (err) {
          throw describe(path, err);
        }
        return filled === length ? buffer : buffer.subarray(0, filled);
      },
    };
    return await use(source);
  } finally {
    await handle.close();
  }
}
