// Reads a delay-history Parquet file into a HistoryTable with hyparquet, one row group at a
// time and only the mapped columns, so the file is never held in memory whole.
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { decompress as zstdDecompress } from 'fzstd';
import { asyncBufferFromFile, parquetMetadataAsync, parquetScan, parquetSchema, type Compressors, type FileMetaData } from 'hyparquet';
import { HISTORY_FIELDS, resolveHistoryMapping } from '../../shared/history/columns';
import type { Cell } from '../../shared/history/cells';
import { createHistoryTableBuilder } from '../../shared/history/history-table';
import type { HistoryReadOptions, HistoryReadResult } from './csv-history-reader';
import { HistoryFileError, throwIfAborted } from './history-file-error';

// hyparquet decodes Snappy itself; the other common codecs come from Node's zlib and fzstd
// (the on-time sample in vega-datasets is ZSTD-compressed).
const COMPRESSORS: Compressors = {
  ZSTD: (input, outputLength) => zstdDecompress(input, new Uint8Array(outputLength)),
  GZIP: (input) => new Uint8Array(gunzipSync(input)),
  BROTLI: (input) => new Uint8Array(brotliDecompressSync(input)),
};

async function readMetadata(path: string): Promise<{ file: Awaited<ReturnType<typeof asyncBufferFromFile>>; metadata: FileMetaData }> {
  let file;
  try {
    file = await asyncBufferFromFile(path);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new HistoryFileError(code === 'ENOENT' ? `no such file: ${path}` : `cannot read ${path}: ${(err as Error).message}`);
  }
  try {
    return { file, metadata: await parquetMetadataAsync(file) };
  } catch (err) {
    throw new HistoryFileError(`${path} is not a readable Parquet file: ${(err as Error).message}`);
  }
}

/** The top-level column names of a Parquet file. */
export async function parquetHeader(path: string): Promise<string[]> {
  const { metadata } = await readMetadata(path);
  return parquetSchema(metadata).children.map((c) => c.element.name);
}

export async function readParquetHistory(path: string, options: HistoryReadOptions = {}): Promise<HistoryReadResult> {
  const { file, metadata } = await readMetadata(path);
  const header = parquetSchema(metadata).children.map((c) => c.element.name);
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
    const scan = await parquetScan({ file, metadata, columns: slots.map((s) => s.column), compressors: COMPRESSORS });
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
    throw new HistoryFileError(`${path}: the Parquet data could not be decoded: ${(err as Error).message}`);
  }
  if (builder.rows === 0) throw new HistoryFileError(`${path} holds no rows`);
  return { format: 'parquet', header, mapping, table: builder.finish() };
}
