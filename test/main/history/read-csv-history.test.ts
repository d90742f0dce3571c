import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { NO_DELAY } from '../../../shared/history/history-table';
import { splitCsvLine } from '../../../shared/history/csv-history-parser';
import { readCsvHistory } from '../../../main/history/read-history-file';
import { HistoryFileError } from '../../../shared/history/history-file-error';

const FIXTURES = path.resolve(__dirname, '../../fixtures/history');
let dir: string;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-csv-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function write(name: string, content: string | Uint8Array): Promise<string> {
  const file = path.join(dir, name);
  await writeFile(file, content);
  return file;
}

describe('readCsvHistory on the BTS prezipped column layout (fixture, see test/fixtures/history/README.md)', () => {
  it('keeps the valid flights and counts cancelled, diverted and invalid rows apart', async () => {
    const { table, format } = await readCsvHistory(path.join(FIXTURES, 'bts-prezipped-layout.csv'));
    const s = table.summary;
    expect(format).toBe('csv');
    expect(s.rows).toBe(18);
    expect(s.flights).toBe(10);
    expect(s.cancelled).toBe(2);
    expect(s.diverted).toBe(1);
    expect(s.divertedDepartures).toBe(1);
    expect(s.departureDelays).toBe(10);
    expect(s.invalid).toBe(5);
    expect(Object.fromEntries(s.invalidByReason.map((r) => [r.reason, r.count]))).toEqual({
      'too-few-fields': 1,
      'bad-origin': 1,
      'missing-arrival-delay': 1,
      'bad-arrival-delay': 1,
      'bad-scheduled-departure': 1,
    });
    expect(s.firstDate).toBe('2023-05-02');
    expect(s.lastDate).toBe('2023-06-30');
    expect(s.routes).toBe(3);
    expect(s.carriers.map((c) => c.code).sort()).toEqual(['AA', 'DL', 'UA']);
  });

  it('shows a sample of each invalid row with its row number and cells', async () => {
    const { table } = await readCsvHistory(path.join(FIXTURES, 'bts-prezipped-layout.csv'));
    const bad = table.summary.invalidByReason.find((r) => r.reason === 'bad-arrival-delay')!;
    expect(bad.samples).toEqual([expect.objectContaining({ row: 18, cells: expect.objectContaining({ arrivalDelay: 'abc', origin: 'LAX' }) })]);
    const origin = table.summary.invalidByReason.find((r) => r.reason === 'bad-origin')!;
    expect(origin.samples[0]!.row).toBe(8);
  });

  it('stores delays as recorded: early arrivals negative, never floored at 0', async () => {
    const { table } = await readCsvHistory(path.join(FIXTURES, 'bts-prezipped-layout.csv'));
    const arrivals = [...table.arrival].filter((d) => d !== NO_DELAY).sort((a, b) => a - b);
    expect(arrivals).toEqual([-12, -9, -8, -6, -4, 7, 15, 41, 72, 112]);
    // The diverted ATL-LAX flight has a departure delay and no arrival delay.
    const divertedAt = [...table.arrival].findIndex((d) => d === NO_DELAY);
    expect(table.departure[divertedAt]).toBe(5);
  });
});

describe('readCsvHistory on the TranStats field-selection layout', () => {
  it('reads FL_DATE written M/D/YYYY with a time, and the upper-case names', async () => {
    const { table } = await readCsvHistory(path.join(FIXTURES, 'transtats-field-layout.csv'));
    expect(table.summary).toMatchObject({ rows: 4, flights: 3, cancelled: 1, invalid: 0, firstDate: '2024-01-15', lastDate: '2024-02-01' });
  });
});

describe('readCsvHistory on other text files', () => {
  it('handles CRLF line ends, a BOM, semicolons, quoted delimiters and a quoted line break', async () => {
    const file = await write('semi.csv', '\uFEFFdate;origin;destination;arr_delay;note\r\n2024-03-01;SEA;SFO;-3;"a; b"\r\n2024-03-02;SEA;SFO;17;"two\r\nlines"\r\n2024-03-03;SFO;SEA;4;x');
    const { table } = await readCsvHistory(file);
    expect(table.summary).toMatchObject({ rows: 3, flights: 3, invalid: 0 });
    expect([...table.arrival]).toEqual([-3, 17, 4]);
  });

  it('splits a line with escaped quotes as RFC 4180 says', () => {
    expect(splitCsvLine('a,"b ""c"", d",e', ',')).toEqual(['a', 'b "c", d', 'e']);
  });

  it('reads across chunk boundaries exactly', async () => {
    const lines = ['FlightDate,Origin,Dest,ArrDelay'];
    for (let i = 0; i < 60_000; i++) lines.push(`2024-04-${String((i % 28) + 1).padStart(2, '0')},ORD,"DEN",${(i % 97) - 20}`);
    const file = await write('long.csv', lines.join('\n') + '\n');
    const { table } = await readCsvHistory(file);
    expect(table.summary.flights).toBe(60_000);
    let sum = 0;
    for (const d of table.arrival) sum += d;
    let expected = 0;
    for (let i = 0; i < 60_000; i++) expected += (i % 97) - 20;
    expect(sum).toBe(expected);
  });
});

describe('readCsvHistory on hostile files', () => {
  it('names the missing columns of a file with the wrong columns', async () => {
    const file = await write('wrong.csv', 'name,age,city\nAda,36,London\n');
    await expect(readCsvHistory(file)).rejects.toThrow(HistoryFileError);
    await expect(readCsvHistory(file)).rejects.toThrow(/no column for the flight date, origin airport, destination airport, arrival delay.*'name', 'age', 'city'/);
  });

  it('refuses binary garbage', async () => {
    const bytes = new Uint8Array(10_000);
    let x = 12345;
    for (let i = 0; i < bytes.length; i++) bytes[i] = (x = (x * 1103515245 + 12345) >>> 0) >>> 24;
    await expect(readCsvHistory(await write('garbage.bin', bytes))).rejects.toThrow(/binary data/);
  });

  it('refuses a ZIP archive with a hint to unzip it', async () => {
    await expect(readCsvHistory(await write('download.zip', Uint8Array.of(0x50, 0x4b, 0x03, 0x04, 1, 2, 3)))).rejects.toThrow(/ZIP archive.*unzip/);
  });

  it('refuses a huge single line without reading it all', async () => {
    const file = await write('one-line.csv', 'FlightDate,' + 'x'.repeat(3 * 1024 * 1024));
    await expect(readCsvHistory(file)).rejects.toThrow(/row 1 is longer than 1048576 characters/);
  });

  it('refuses an empty file and a header with no rows', async () => {
    await expect(readCsvHistory(await write('empty.csv', ''))).rejects.toThrow(/is empty/);
    await expect(readCsvHistory(await write('header.csv', 'FlightDate,Origin,Dest,ArrDelay\n'))).rejects.toThrow(/no data rows/);
  });

  it('reports a missing file clearly', async () => {
    await expect(readCsvHistory(path.join(dir, 'nope.csv'))).rejects.toThrow(/no such file/);
  });

  it('stops when its signal is aborted', async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(readCsvHistory(path.join(FIXTURES, 'bts-prezipped-layout.csv'), { signal: controller.signal })).rejects.toThrow(/abort/i);
  });
});
