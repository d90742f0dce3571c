// Streams a delay-history CSV (or semicolon, tab or pipe separated) file into a HistoryTable
// without ever holding the file's text: fixed-size chunks are decoded and handed to the pure
// parser (shared/history/csv-history-parser.ts).
//
// Hostile input fails early with a HistoryFileError: NUL bytes (binary), a ZIP or gzip
// archive, a line longer than maxLineLength, a header without the needed columns.
import { open } from 'node:fs/promises';
import type { ColumnOverrides, HistoryMapping } from '../../shared/history/columns';
import { createCsvHistoryParser, sniffBinary } from '../../shared/history/csv-history-parser';
import type { HistoryTable } from '../../shared/history/history-table';
import { HistoryFileError, throwIfAborted } from './history-file-error';

// Re-exported for readers of other delimited files (main/cli/fit/csv-columns.ts).
export { detectDelimiter, sniffBinary, splitCsvLine } from '../../shared/history/csv-history-parser';

export interface HistoryReadProgress {
  /** Share of the file read, 0..1. */
  readonly fraction: number;
  /** Data rows read so far. */
  readonly rows: number;
}

export interface HistoryReadOptions {
  readonly overrides?: ColumnOverrides;
  readonly signal?: AbortSignal;
  readonly onProgress?: (progress: HistoryReadProgress) => void;
  /** The longest line accepted, in UTF-16 code units; default 1 MiB. */
  readonly maxLineLength?: number;
}

export interface HistoryReadResult {
  readonly format: 'csv' | 'parquet';
  readonly header: readonly string[];
  readonly mapping: HistoryMapping;
  readonly table: HistoryTable;
}

const CHUNK_BYTES = 1 << 20;

/** Streams the CSV at `path` into a HistoryTable. */
export async function readCsvHistory(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  let handle;
  try {
    handle = await open(path, 'r');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new HistoryFileError(code === 'ENOENT' ? `no such file: ${path}` : `cannot read ${path}: ${(err as Error).message}`);
  }
  try {
    const totalBytes = (await handle.stat()).size;
    if (totalBytes === 0) throw new HistoryFileError(`${path} is empty`);
    const buffer = Buffer.allocUnsafe(CHUNK_BYTES);
    const decoder = new TextDecoder('utf-8');
    const parser = createCsvHistoryParser({ overrides: options.overrides, maxLineLength: options.maxLineLength, source: path });
    let bytesRead = 0;
    for (;;) {
      throwIfAborted(options.signal);
      const { bytesRead: n } = await handle.read(buffer, 0, CHUNK_BYTES, bytesRead);
      if (n === 0) break;
      const bytes = buffer.subarray(0, n);
      if (bytesRead === 0) {
        const problem = sniffBinary(bytes.subarray(0, 4096));
        if (problem) throw new HistoryFileError(`${path}: ${problem}`);
      } else if (bytes.indexOf(0) !== -1) {
        throw new HistoryFileError(`${path}: binary data (NUL bytes) after byte ${bytesRead}; this is not a delimited text file`);
      }
      bytesRead += n;
      parser.push(decoder.decode(bytes, { stream: true }));
      options.onProgress?.({ fraction: bytesRead / totalBytes, rows: parser.rows });
    }
    parser.push(decoder.decode());
    return { format: 'csv', ...parser.finish() };
  } finally {
    await handle.close();
  }
}
