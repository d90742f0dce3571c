import { mkdtemp, rm, writeFile, mkdir } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { parquetWriteFile } from 'hyparquet-writer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { previewHistoryFile, readHistoryFile } from '../../../main/history/read-history-file';

// Parquet files are written with hyparquet-writer (the companion writer of the hyparquet reader).
const FIXTURES = path.resolve(__dirname, '../../fixtures/history');
let dir: string;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-history-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function writeHistoryParquet(file: string, rows: number, rowGroupSize: number): void {
  const days = Array.from({ length: rows }, (_, i) => new Date(Date.UTC(2024, 0, 1 + (i % 60), 8, 30)));
  parquetWriteFile({
    filename: file,
    rowGroupSize,
    columnData: [
      { name: 'FlightDate', data: days, type: 'TIMESTAMP' },
      { name: 'Origin', data: Array.from({ length: rows }, (_, i) => (i % 3 === 0 ? 'SEA' : 'ORD')), type: 'STRING' },
      { name: 'Dest', data: Array.from({ length: rows }, () => 'DEN'), type: 'STRING' },
      { name: 'ArrDelay', data: Array.from({ length: rows }, (_, i) => (i % 10 === 9 ? null : (i % 50) - 10)), type: 'DOUBLE' },
      { name: 'DepDelay', data: Array.from({ length: rows }, (_, i) => (i % 50) - 5), type: 'DOUBLE' },
      { name: 'Cancelled', data: Array.from({ length: rows }, (_, i) => i % 10 === 9), type: 'BOOLEAN' },
    ],
  });
}

describe('readHistoryFile', () => {
  it('reads Parquet by its magic bytes, whatever the file name, row group by row group', async () => {
    const file = path.join(dir, 'history.data');
    writeHistoryParquet(file, 5000, 1000);
    const fractions: number[] = [];
    const { format, table } = await readHistoryFile(file, { onProgress: (p) => fractions.push(p.fraction) });
    expect(format).toBe('parquet');
    expect(table.summary).toMatchObject({ rows: 5000, flights: 4500, cancelled: 500, invalid: 0, firstDate: '2024-01-01', lastDate: '2024-02-28', routes: 2 });
    // 29 February falls only on rows i % 60 === 59, all of them cancelled, so the last flight is on the 28th.
    expect(fractions).toEqual([0.2, 0.4, 0.6, 0.8, 1]);
    let sum = 0;
    for (const d of table.arrival) sum += d;
    let expected = 0;
    for (let i = 0; i < 5000; i++) if (i % 10 !== 9) expected += (i % 50) - 10;
    expect(sum).toBe(expected);
  });

  it('names the missing columns of a Parquet file with the wrong columns', async () => {
    const file = path.join(dir, 'wrong.parquet');
    parquetWriteFile({ filename: file, columnData: [{ name: 'city', data: ['Oslo'], type: 'STRING' }] });
    await expect(readHistoryFile(file)).rejects.toThrow(/no column for the flight date.*'city'/);
  });

  it('refuses a truncated Parquet file clearly', async () => {
    const file = path.join(dir, 'cut.parquet');
    await writeFile(file, Buffer.from('PAR1 this is not really parquet'));
    await expect(readHistoryFile(file)).rejects.toThrow(/not a readable Parquet file/);
  });

  it('reads CSV otherwise, and says so for a folder', async () => {
    expect((await readHistoryFile(path.join(FIXTURES, 'transtats-field-layout.csv'))).format).toBe('csv');
    await mkdir(path.join(dir, 'folder.csv'));
    await expect(readHistoryFile(path.join(dir, 'folder.csv'))).rejects.toThrow(/is a folder/);
  });
});

describe('previewHistoryFile', () => {
  it('shows the detected mapping and the first rows of a BTS file without reading it all', async () => {
    const preview = await previewHistoryFile(path.join(FIXTURES, 'bts-prezipped-layout.csv'));
    expect(preview.format).toBe('csv');
    expect(preview.detection.layout).toBe('bts');
    expect(preview.detection.missing).toEqual([]);
    expect(preview.sampleRows).toHaveLength(5);
    expect(preview.sampleRows[0]![13]).toBe('Chicago, IL');
  });

  it('previews a Parquet file by its schema', async () => {
    const file = path.join(dir, 'preview.parquet');
    writeHistoryParquet(file, 10, 10);
    const preview = await previewHistoryFile(file);
    expect(preview.format).toBe('parquet');
    expect(preview.detection.mapping).toMatchObject({ date: 0, origin: 1, destination: 2, arrivalDelay: 3, departureDelay: 4, cancelled: 5 });
  });
});
