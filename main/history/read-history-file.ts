// Opens a delay-history file of either format: Parquet (by its PAR1 magic bytes) or delimited
// text. Also previews a file's columns and first rows for a column-mapping step.
import { open } from 'node:fs/promises';
import { detectHistoryColumns, type ColumnDetection } from '../../shared/history/columns';
import { detectDelimiter, sniffBinary, splitCsvLine } from '../../shared/history/csv-history-parser';
import { readCsvHistory, type HistoryReadOptions, type HistoryReadResult } from './csv-history-reader';
import { HistoryFileError } from './history-file-error';
import { parquetHeader, readParquetHistory } from './parquet-history-reader';

const PREVIEW_BYTES = 64 * 1024;

async function readHead(path: string, bytes: number): Promise<Buffer> {
  let handle;
  try {
    handle = await open(path, 'r');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new HistoryFileError(code === 'ENOENT' ? `no such file: ${path}` : code === 'EISDIR' ? `${path} is a folder, not a file` : `cannot read ${path}: ${(err as Error).message}`);
  }
  try {
    const buffer = Buffer.alloc(bytes);
    const { bytesRead } = await handle.read(buffer, 0, bytes, 0);
    return buffer.subarray(0, bytesRead);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new HistoryFileError(code === 'EISDIR' ? `${path} is a folder, not a file` : `cannot read ${path}: ${(err as Error).message}`);
  } finally {
    await handle.close();
  }
}

function isParquet(head: Buffer): boolean {
  return head.length >= 4 && head.toString('latin1', 0, 4) === 'PAR1';
}

/** Reads a history file of either format into a HistoryTable; see HistoryReadOptions. */
export async function readHistoryFile(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  const head = await readHead(path, 4);
  return isParquet(head) ? readParquetHistory(path, options) : readCsvHistory(path, options);
}

export interface HistoryPreview {
  readonly format: 'csv' | 'parquet';
  readonly detection: ColumnDetection;
  /** Up to 5 data rows as text, for showing beside the mapping (CSV only; empty for Parquet). */
  readonly sampleRows: readonly (readonly string[])[];
}

/** The header, the automatic column mapping and a few rows, without reading the whole file. */
export async function previewHistoryFile(path: string): Promise<HistoryPreview> {
  const head = await readHead(path, PREVIEW_BYTES);
  if (isParquet(head)) return { format: 'parquet', detection: detectHistoryColumns(await parquetHeader(path)), sampleRows: [] };
  if (head.length === 0) throw new HistoryFileError(`${path} is empty`);
  const problem = sniffBinary(head.subarray(0, 4096));
  if (problem) throw new HistoryFileError(`${path}: ${problem}`);
  const text = new TextDecoder('utf-8').decode(head).replace(/^\uFEFF/, '');
  const lines = text.split(/\r?\n/);
  // The last piece may be cut off by the preview window; drop it unless the file ended there.
  if (head.length === PREVIEW_BYTES) lines.pop();
  const nonEmpty = lines.filter((l) => l.trim() !== '');
  const headerLine = nonEmpty[0];
  if (headerLine === undefined) throw new HistoryFileError(`${path}: no complete header line in the first ${PREVIEW_BYTES} bytes; this does not look like a delay history file`);
  const delimiter = detectDelimiter(headerLine);
  return {
    format: 'csv',
    detection: detectHistoryColumns(splitCsvLine(headerLine, delimiter).map((h) => h.trim())),
    sampleRows: nonEmpty.slice(1, 6).map((l) => splitCsvLine(l, delimiter)),
  };
}
