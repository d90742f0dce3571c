import { readFile, writeFile, mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { decompress } from 'fzstd';
import { parquetReadObjects } from 'hyparquet';
import { describe, expect, it } from 'vitest';
import { defaultFlightsPath, readFlights } from '../../../main/pipeline/read-flights';
import { isoDate } from '../../../shared/delay/evaluation/flight-columns';

// The real sample: vega-datasets data/flights-3m.parquet (BTS On-Time Performance, 2001).
describe('readFlights on the vega-datasets on-time sample', () => {
  it('reads a slice column by column, agreeing row for row with hyparquet object rows', async () => {
    const file = defaultFlightsPath();
    const flights = await readFlights(file, { rowStart: 1000, rowEnd: 1500 });
    expect(flights.length).toBe(500);
    const bytes = await readFile(file);
    const rows = await parquetReadObjects({
      file: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer,
      rowStart: 1000,
      rowEnd: 1500,
      compressors: { ZSTD: (input: Uint8Array, n: number) => decompress(input, new Uint8Array(n)) },
    });
    expect(rows).toHaveLength(500);
    rows.forEach((row, i) => {
      expect(flights.airports[flights.origin[i]!]).toBe(row.origin);
      expect(flights.airports[flights.destination[i]!]).toBe(row.destination);
      expect(flights.delayMinutes[i]).toBe(Number(row.delay));
      expect(isoDate(flights.day[i]!)).toBe((row.date as Date).toISOString().slice(0, 10));
    });
  });

  it('gives the first flight of the sample: LAS to PHL departing 2001-01-01 00:01, 33 minutes late', async () => {
    const flights = await readFlights(defaultFlightsPath(), { rowStart: 0, rowEnd: 1 });
    expect(flights.airports[flights.origin[0]!]).toBe('LAS');
    expect(flights.airports[flights.destination[0]!]).toBe('PHL');
    expect(isoDate(flights.day[0]!)).toBe('2001-01-01');
    expect(flights.delayMinutes[0]).toBe(33);
  });

  it('names the file when it is not parquet', async () => {
    const dir = await mkdtemp(path.join(os.tmpdir(), 'layline-read-'));
    try {
      const bogus = path.join(dir, 'flights.parquet');
      await writeFile(bogus, 'date,delay\n2001-01-01,5\n');
      await expect(readFlights(bogus)).rejects.toThrow(/flights\.parquet is not a readable parquet file/);
      await expect(readFlights(path.join(dir, 'missing.parquet'))).rejects.toThrow(/cannot read the flights file/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
