// Reads a delay-history file of either format from a ByteSource into a HistoryTable: Parquet
// (by its PAR1 magic bytes) one row group at a time with hyparquet, or delimited text in fixed
// chunks through the pure CSV parser. Also previews a file's columns and first rows for the
// column-mapping step. The file is never held whole in memory.
//
// Hostile input fails early with a HistoryFileError: NUL bytes (binary), a ZIP or gzip
// archive, a line longer than maxLineLength, a header without the needed columns.
import { decompress as zstdDecompress } from 'fzstd';
import { parquetMetadataAsync, parquetScan, parquetSchema, type AsyncBuffer, type Compressors, type FileMetaData } from 'hyparquet';
import type { CancelSignal } from '../inference/fit-types';
import type { Cell } from './cells';
import { detectHistoryColumns, HISTORY_FIELDS, resolveHistoryMapping, type ColumnDetection, type ColumnOverrides, type HistoryMapping } from './columns';
import { createCsvHistoryParser, detectDelimiter, sniffBinary, splitCsvLine } from './csv-history-parser';
import { throwIfAborted, type ByteSource } from './byte-source';
import { HistoryFileError } from './history-file-error';
import { createHistoryTableBuilder, type HistoryTable } from './history-table';

export interface HistoryReadProgress {
  /** Share of the file read, 0..1. */
  readonly fraction: number;
  /** Data rows read so far. */
  readonly rows: number;
}

export interface HistoryReadOptions {
  readonly overrides?: ColumnOverrides;
  readonly signal?: CancelSignal;
  readonly onProgress?: (progress: HistoryReadProgress) => void;
  /** The longest line accepted, in UTF-16 code units; default 1 MiB. */
  readonly maxLineLength?: number;
  /**
   * Parquet codecs beyond Snappy (hyparquet's own) and ZSTD (fzstd, here): the Node hosts add
   * GZIP and Brotli from zlib. A file using a codec that is missing gets a HistoryFileError.
   */
  readonly compressors?: Compressors;
}

export interface HistoryReadResult {
  readonly format: 'csv' | 'parquet';
  readonly header: readonly string[];
  readonly mapping: HistoryMapping;
  readonly table: HistoryTable;
}

export interface HistoryPreview {
  readonly format: 'csv' | 'parquet';
  readonly detection: ColumnDetection;
  /** Up to 5 data rows as text, for showing beside the mapping (CSV only; empty for Parquet). */
  readonly sampleRows: readonly (readonly string[])[];
}

const CHUNK_BYTES = 1 << 20;
const PREVIEW_BYTES = 64 * 1024;
const PARQUET_MAGIC = [0x50, 0x41, 0x52, 0x31]; // "PAR1"

// The on-time sample in vega-datasets is ZSTD-compressed; fzstd is pure JavaScript.
const BASE_COMPRESSORS: Compressors = {
  ZSTD: (input, outputLength) => zstdDecompress(input, new Uint8Array(outputLength)),
};

function isParquet(head: Uint8Array): boolean {
  return head.length >= 4 && PARQUET_MAGIC.every((b, i) => head[i] === b);
}

/** Reads a history file of either format into a HistoryTable; see HistoryReadOptions. */
export async function readHistorySource(source: ByteSource, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  const head = await source.read(0, 4);
  return isParquet(head) ? readParquetSource(source, options) : readCsvSource(source, options);
}

/** Streams delimited text (comma, semicolon, tab or pipe) into a HistoryTable. */
export async function readCsvSource(source: ByteSource, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  const name = source.name;
  if (source.size === 0) throw new HistoryFileError(`${name} is empty`);
  const decoder = new TextDecoder('utf-8');
  const parser = createCsvHistoryParser({ overrides: options.overrides, maxLineLength: options.maxLineLength, source: name });
  let bytesRead = 0;
  while (bytesRead < source.size) {
    throwIfAborted(options.signal);
    const bytes = await source.read(bytesRead, Math.min(source.size, bytesRead + CHUNK_BYTES));
    if (bytes.length === 0) break;
    if (bytesRead === 0) {
      const problem = sniffBinary(bytes.subarray(0, 4096));
      if (problem) throw new HistoryFileError(`${name}: ${problem}`);
    } else if (bytes.indexOf(0) !== -1) {
      throw new HistoryFileError(`${name}: binary data (NUL bytes) after byte ${bytesRead}; this is not a delimited text file`);
    }
    bytesRead += bytes.length;
    parser.push(decoder.decode(bytes, { stream: true }));
    options.onProgress?.({ fraction: bytesRead / source.size, rows: parser.rows });
  }
  parser.push(decoder.decode());
  return { format: 'csv', ...parser.finish() };
}

function asyncBufferOf(source: ByteSource): AsyncBuffer {
  return {
    byteLength: source.size,
    slice: async (start, end) => {
      const bytes = await source.read(start, end ?? source.size);
      // hyparquet wants an ArrayBuffer of exactly the range.
      return bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? (bytes.buffer as ArrayBuffer) : (bytes.slice().buffer as ArrayBuffer);
    },
  };
}

async function readMetadata(source: ByteSource): Promise<{ file: AsyncBuffer; metadata: FileMetaData }> {
  const file = asyncBufferOf(source);
  try {
    return { file, metadata: await parquetMetadataAsync(file) };
  } catch (err) {
    if (err instanceof HistoryFileError) throw err;
    throw new HistoryFileError(`${source.name} is not a readable Parquet file: ${(err as Error).message}`);
  }
}

function topLevelColumns(metadata: FileMetaData): string[] {
  return parquetSchema(metadata).children.map((c) => c.element.name);
}

/** Reads a Parquet file one row group at a time, only the mapped columns. */
export async function readParquetSource(source: ByteSource, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  const { file, metadata } = await readMetadata(source);
  const header = topLevelColumns(metadata);
  let mapping;
  try {
    mapping = resolveHistoryMapping(header, options.overrides);
  } catch (err) {
    throw new HistoryFileError((err as Error).message);
  }
  const slots: { slot: number; column: string }[] = [];
  HISTORY_FIELDS.forEach((f, slot) => {
    const index = mapping[f];
    if (index !== undefined) slots.push({ slot, column: header[index]! });
  });
  const totalRows = Number(metadata.num_rows);
  const builder = createHistoryTableBuilder();
  const cells: Cell[] = new Array<Cell>(HISTORY_FIELDS.length).fill(undefined);
  try {
    const scan = await parquetScan({ file, metadata, columns: slots.map((s) => s.column), compressors: { ...BASE_COMPRESSORS, ...options.compressors } });
    for (const range of scan.ranges) {
      throwIfAborted(options.signal);
      const columns = await Promise.all(slots.map((s) => scan.readColumn({ column: s.column, rowStart: range.rowStart, rowEnd: range.rowEnd })));
      const length = range.rowEnd - range.rowStart;
      for (let i = 0; i < length; i++) {
        // hyparquet types decoded values loosely; every value it yields for a flat column is a
        // Cell, and anything else (a nested struct) fails the cell parsers and counts as invalid.
        for (let k = 0; k < slots.length; k++) cells[slots[k]!.slot] = columns[k]![i] as Cell;
        builder.add(cells, range.rowStart + i + 1);
      }
      options.onProgress?.({ fraction: totalRows > 0 ? range.rowEnd / totalRows : 1, rows: builder.rows });
    }
  } catch (err) {
    if (err instanceof HistoryFileError || options.signal?.aborted) throw err;
    throw new HistoryFileError(`${source.name}: the Parquet data could not be decoded: ${(err as Error).message}`);
  }
  if (builder.rows === 0) throw new HistoryFileError(`${source.name} holds no rows`);
  return { format: 'parquet', header, mapping, table: builder.finish() };
}

/** The header, the automatic column mapping and a few rows, without reading the whole file. */
export async function previewHistorySource(source: ByteSource): Promise<HistoryPreview> {
  const name = source.name;
  const head = await source.read(0, PREVIEW_BYTES);
  if (isParquet(head)) {
    const { metadata } = await readMetadata(source);
    return { format: 'parquet', detection: detectHistoryColumns(topLevelColumns(metadata)), sampleRows: [] };
  }
  if (head.length === 0) throw new HistoryFileError(`${name} is empty`);
  const problem = sniffBinary(head.subarray(0, 4096));
  if (problem) throw new HistoryFileError(`${name}: ${problem}`);
  const text = new TextDecoder('utf-8').decode(head).replace(/^\uFEFF/, '');
  const lines = text.split(/\r?\n/);
  // The last piece may be cut off by the preview window; drop it unless the file ended there.
  if (head.length === PREVIEW_BYTES && source.size > PREVIEW_BYTES) lines.pop();
  const nonEmpty = lines.filter((l) => l.trim() !== '');
  const headerLine = nonEmpty[0];
  if (headerLine === undefined) throw new HistoryFileError(`${name}: no complete header line in the first ${PREVIEW_BYTES} bytes; this does not look like a delay history file`);
  const delimiter = detectDelimiter(headerLine);
  return {
    format: 'csv',
    detection: detectHistoryColumns(splitCsvLine(headerLine, delimiter).map((h) => h.trim())),
    sampleRows: nonEmpty.slice(1, 6).map((l) => splitCsvLine(l, delimiter)),
  };
}
