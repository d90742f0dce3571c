import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { createCsvHistoryParser, detectDelimiter, sniffBinary, splitCsvLine } from '../../../shared/history/csv-history-parser';
import { HistoryFileError } from '../../../shared/history/history-file-error';
import { createRng } from '../../../shared/inference/rng';

const FIXTURE = readFileSync(path.resolve(__dirname, '../../fixtures/history/bts-prezipped-layout.csv'), 'utf8');

function parseInChunks(text: string, seed: number) {
  const parser = createCsvHistoryParser({ source: 'test.csv' });
  const rng = createRng(seed);
  for (let p = 0; p < text.length; ) {
    const n = 1 + rng.int(40);
    parser.push(text.slice(p, p + n));
    p += n;
  }
  return parser.finish();
}

describe('createCsvHistoryParser', () => {
  it('gives the same table whatever the chunk boundaries (fixture in the BTS prezipped layout)', () => {
    const whole = createCsvHistoryParser({ source: 'test.csv' });
    whole.push(FIXTURE);
    const expected = whole.finish();
    for (const seed of [1, 2, 3]) {
      const got = parseInChunks(FIXTURE, seed);
      expect(got.table.summary).toEqual(expected.table.summary);
      expect([...got.table.arrival]).toEqual([...expected.table.arrival]);
    }
    expect(expected.table.summary.flights).toBe(10);
  });

  it('keeps a quoted line break inside its field even when a chunk ends inside the quotes', () => {
    const text = 'date,origin,destination,delay,note\n2024-01-02,SEA,SFO,3,"split\nacross"\n2024-01-03,SEA,SFO,4,plain\n';
    for (const seed of [4, 5, 6, 7]) {
      const { table } = parseInChunks(text, seed);
      expect(table.summary).toMatchObject({ rows: 2, flights: 2, invalid: 0 });
    }
  });

  it('throws HistoryFileError for a header without the needed columns', () => {
    const parser = createCsvHistoryParser({ source: 'x.csv' });
    expect(() => parser.push('a,b,c\n1,2,3\n')).toThrow(HistoryFileError);
  });

  it('detects the delimiter outside quotes and splits quoted fields', () => {
    expect(detectDelimiter('"a;b",c,d')).toBe(',');
    expect(detectDelimiter('a\tb\tc')).toBe('\t');
    expect(splitCsvLine('"Chicago, IL",ORD,', ',')).toEqual(['Chicago, IL', 'ORD', '']);
  });

  it('recognises archives and binary content from the first bytes', () => {
    expect(sniffBinary(Uint8Array.of(0x1f, 0x8b, 8, 0))).toMatch(/gzip/);
    expect(sniffBinary(new TextEncoder().encode('FlightDate,Origin\n'))).toBeNull();
  });
});
