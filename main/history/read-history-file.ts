// Opens a delay-history file by path, for the CLI and the Electron engine thread: the shared
// readers (shared/history/read-history-source.ts) over a file handle, with Node's codecs.
import { previewHistorySource, readCsvSource, readHistorySource, readParquetSource, type HistoryPreview, type HistoryReadOptions, type HistoryReadResult } from '../../shared/history/read-history-source';
import { withFileSource } from './file-byte-source';
import { NODE_COMPRESSORS } from './node-compressors';

export type { HistoryPreview, HistoryReadOptions, HistoryReadProgress, HistoryReadResult } from '../../shared/history/read-history-source';

function withCodecs(options: HistoryReadOptions): HistoryReadOptions {
  return { ...options, compressors: { ...NODE_COMPRESSORS, ...options.compressors } };
}

/** Reads a history file of either format into a HistoryTable; see HistoryReadOptions. */
export function readHistoryFile(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  return withFileSource(path, (source) => readHistorySource(source, withCodecs(options)));
}

/** Reads a file as delimited text, whatever its first bytes. */
export function readCsvHistory(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  return withFileSource(path, (source) => readCsvSource(source, options));
}

export function readParquetHistory(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  return withFileSource(path, (source) => readParquetSource(source, withCodecs(options)));
}

/** The header, the automatic column mapping and a few rows, without reading the whole file. */
export function previewHistoryFile(path: string): Promise<HistoryPreview> {
  return withFileSource(path, (source) => previewHistorySource(source));
}
