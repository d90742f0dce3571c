// Round trip of the connections CSV, read back with csv-parse (an RFC 4180 reader from the npm
// registry, independent of our writer) and compared field by field with the scored JSON.
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { CONNECTION_CSV_COLUMNS, ConnectionCsvError, connectionFromCsvRecord, connectionsCsv } from '../../../shared/report/connections-csv';
import type { ScoredTrips } from '../../../shared/risk/types';
import { sampleScoredTrips, tomasTrip } from '../../fixtures/report/scored-sample';

function readBack(csv: string): Record<string, string>[] {
  return parse(csv, { columns: true, skip_empty_lines: true, record_delimiter: '\r\n' }) as Record<string, string>[];
}

/** What `layline score --format json` prints, read back as plain data. */
function asJson(scored: ScoredTrips): ScoredTrips {
  return JSON.parse(JSON.stringify(scored)) as ScoredTrips;
}

describe('connectionsCsv', () => {
  it('writes one row per connection under the documented header, with CRLF line ends (RFC 4180)', () => {
    const csv = connectionsCsv(sampleScoredTrips());
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe(CONNECTION_CSV_COLUMNS.join(','));
    expect(lines.filter(Boolean)).toHaveLength(1 + 7);
    expect(csv.endsWith('\r\n')).toBe(true);
  });

  it('parses back to exactly the JSON of every connection', () => {
    const json = asJson(sampleScoredTrips());
    const records = readBack(connectionsCsv(sampleScoredTrips())).map(connectionFromCsvRecord);
    const expected = json.trips.flatMap((t) =>
      t.connections.map(({ inboundLeg: _leg, ...c }, i) => ({ tripId: t.id, traveler: t.traveler, trip: t.trip, option: t.option, connectionIndex: i, connection: c })),
    );
    expect(records).toEqual(expected);
  });

  it('round-trips quotes, commas, line breaks and formula-like text (OWASP CSV injection guard)', () => {
    const scored = sampleScoredTrips();
    const tricky = {
      ...tomasTrip,
      traveler: '=HYPERLINK("http://x") "Tom", Jr.',
      trip: '-offsite\nday 2',
      connections: tomasTrip.connections.map((c) => ({ ...c, warnings: [{ code: 'below-mct', message: '+a "quoted", message' }, { code: 'x', message: 'second' }] })),
    };
    const input = { ...scored, trips: [tricky] };
    const csv = connectionsCsv(input);
    const cells = readBack(csv);
    expect(cells[0]?.traveler).toBe(`'=HYPERLINK("http://x") "Tom", Jr.`);
    const back = cells.map(connectionFromCsvRecord);
    expect(back[0]?.traveler).toBe(tricky.traveler);
    expect(back[0]?.trip).toBe(tricky.trip);
    expect(back[0]?.connection.warnings).toEqual(tricky.connections[0]?.warnings);
  });

  it('writes unscored connections with empty numbers and reads them back as null', () => {
    const scored = sampleScoredTrips();
    const stop = { ...tomasTrip, connections: [{ ...tomasTrip.connections[0]!, scored: false, pMake: null, pMakeInterval: null, minLayoverMinutes: null, marginMinutes: null, inbound: null, outbound: null, flags: ['stopover' as const] }] };
    const [record] = readBack(connectionsCsv({ ...scored, trips: [stop] })).map(connectionFromCsvRecord);
    const { inboundLeg: _leg, ...expected } = stop.connections[0]!;
    expect(record?.connection).toEqual(expected);
  });

  it('rejects a row with a malformed value, naming the column', () => {
    const [row] = readBack(connectionsCsv(sampleScoredTrips()));
    expect(() => connectionFromCsvRecord({ ...row, pMake: 'high' })).toThrow(ConnectionCsvError);
    expect(() => connectionFromCsvRecord({ ...row, pMake: 'high' })).toThrow(/column pMake has the unreadable value 'high'/);
    expect(() => connectionFromCsvRecord({ ...row, connectionType: 'orbital' })).toThrow(/connectionType/);
    const { mctMinutes: _dropped, ...missing } = row ?? {};
    expect(() => connectionFromCsvRecord(missing)).toThrow(/mctMinutes has the unreadable value '\(missing\)'/);
  });
});
