// Reads the on-time sample (vega-datasets data/flights-3m.parquet) into flight columns.
//
// It reads column by column with hyparquet's scan API, never object rows: building three
// million row objects alone takes several seconds. The file's pages are ZSTD-compressed,
// which hyparquet leaves to a plug-in codec; fzstd (pure JavaScript) decodes them.
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { decompress as zstdDecompress } from 'fzstd';
import { parquetMetadata, parquetScan } from 'hyparquet';
import type { FlightColumns } from '../../shared/delay/evaluation/flight-columns';

/**
 * The sample inside the installed vega-datasets package, resolved from the working
 * directory (the repository root under npm scripts). The package exports only its code
 * entry, so the data file is found beside that entry rather than through `exports`.
 */
export function defaultFlightsPath(cwd = process.cwd()): string {
  const require = createRequire(path.join(cwd, 'package.json'));
  const entry = require.resolve('vega-datasets');
  return path.join(path.dirname(entry), '..', 'data', 'flights-3m.parquet');
}

const MICROS_PER_DAY = 86_400_000_000;

export interface ReadOptions {
  /** First row to read (inclusive), default 0. */
  readonly rowStart?: number;
  /** Last row to read (exclusive), default all. */
  readonly rowEnd?: number;
}

/**
 * Reads date (actual departure, local), delay (arrival delay, minutes), origin and destination.
 * Throws an Error naming the file when it is not a parquet file or lacks a column.
 */
export async function readFlights(filePath: string, options: ReadOptions = {}): Promise<FlightColumns> {
  let bytes: Uint8Array;
  try {
    bytes = await readFile(filePath);
  } catch (err) {
    throw new Error(`cannot read the flights file ${filePath}: ${err instanceof Error ? err.message : String(err)}`);
  }
  const file = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  let metadata;
  try {
    metadata = parquetMetadata(file);
  } catch (err) {
    throw new Error(`${filePath} is not a readable parquet file: ${err instanceof Error ? err.message : String(err)}`);
  }
  const present = new Set(metadata.schema.map((s) => s.name));
  for (const column of ['date', 'delay', 'origin', 'destination']) {
    if (!present.has(column)) throw new Error(`${filePath} has no '${column}' column; expected the on-time sample's date, delay, origin and destination`);
  }
  const total = Number(metadata.num_rows);
  const rowStart = Math.max(0, options.rowStart ?? 0);
  const rowEnd = Math.min(total, options.rowEnd ?? total);
  const length = Math.max(0, rowEnd - rowStart);
  const scan = await parquetScan({
    file,
    metadata,
    compressors: { ZSTD: (input: Uint8Array, outputLength: number) => zstdDecompress(input, new Uint8Array(outputLength)) },
    // Keep timestamps as plain microsecond numbers instead of Date objects.
    parsers: { timestampFromMicroseconds: (micros: bigint) => Number(micros) },
  });
  const day = new Int32Array(length);
  const delayMinutes = new Float64Array(length);
  const origin = new Uint16Array(length);
  const destination = new Uint16Array(length);
  const airports: string[] = [];
  const airportIndex = new Map<string, number>();
  const codeOf = (code: unknown, row: number): number => {
    if (typeof code !== 'string' || code === '') throw new Error(`${filePath}: row ${row} has no airport code`);
    let k = airportIndex.get(code);
    if (k === undefined) {
      k = airports.length;
      airports.push(code);
      airportIndex.set(code, k);
    }
    return k;
  };
  for (const range of scan.ranges) {
    const start = Math.max(range.rowStart, rowStart);
    const end = Math.min(range.rowEnd, rowEnd);
    if (start >= end) continue;
    const span = { rowStart: start, rowEnd: end };
    const [dates, delays, origins, destinations] = await Promise.all([
      scan.readColumn({ column: 'date', ...span }),
      scan.readColumn({ column: 'delay', ...span }),
      scan.readColumn({ column: 'origin', ...span }),
      scan.readColumn({ column: 'destination', ...span }),
    ]);
    const base = start - rowStart;
    for (let j = 0; j < end - start; j++) {
      const micros = dates[j];
      day[base + j] = typeof micros === 'number' ? Math.floor(micros / MICROS_PER_DAY) : -1;
      const d = delays[j];
      delayMinutes[base + j] = typeof d === 'bigint' || typeof d === 'number' ? Number(d) : NaN;
      origin[base + j] = codeOf(origins[j], start + j);
      destination[base + j] = codeOf(destinations[j], start + j);
    }
  }
  if (airports.length > 65_535) throw new Error(`${filePath}: more airports than the reader can index`);
  return { length, airports, origin, destination, day, delayMinutes };
}
