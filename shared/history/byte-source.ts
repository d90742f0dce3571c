// A file's bytes as the history readers see them: a name for messages, a size, and reads of
// any range. The CLI and the Electron engine thread open one on a file handle, the page's
// worker on a File the user picked, so one reader serves both without holding the file whole.
import type { CancelSignal } from '../inference/fit-types';
import { HistoryFileError } from './history-file-error';

export interface ByteSource {
  /** Shown in messages: the file's path, or the picked file's name. */
  readonly name: string;
  readonly size: number;
  /** The bytes [start, end), clipped to the file; rejects with a HistoryFileError. */
  read(start: number, end: number): Promise<Uint8Array>;
}

/** What a browser File or Blob offers; structural, so shared/ needs no DOM types. */
export interface BlobLike {
  readonly size: number;
  slice(start?: number, end?: number): { arrayBuffer(): Promise<ArrayBuffer> };
}

export function isBlobLike(value: unknown): value is BlobLike {
  if (typeof value !== 'object' || value === null) return false;
  const blob = value as { size?: unknown; slice?: unknown };
  return typeof blob.size === 'number' && Number.isFinite(blob.size) && blob.size >= 0 && typeof blob.slice === 'function';
}

/** A ByteSource over a picked File or a Blob. */
export function blobByteSource(name: string, blob: BlobLike): ByteSource {
  return {
    name,
    size: blob.size,
    read: async (start, end) => {
      try {
        return new Uint8Array(await blob.slice(start, Math.min(end, blob.size)).arrayBuffer());
      } catch (err) {
        // A File changed or removed on disk after it was picked fails its reads (NotReadableError).
        throw new HistoryFileError(`cannot read ${name}: ${err instanceof Error ? err.message : String(err)}; pick the file again`);
      }
    },
  };
}

/** Throws the signal's reason (or a plain Error) once the signal is aborted. */
export function throwIfAborted(signal: CancelSignal | undefined): void {
  if (!signal?.aborted) return;
  if (signal.reason instanceof Error) throw signal.reason;
  const err = new Error('The operation was aborted');
  err.name = 'AbortError';
  throw err;
}
