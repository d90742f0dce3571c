import { describe, expect, it } from 'vitest';
import type { Cell } from '../../../shared/history/cells';
import { HISTORY_FIELDS, type HistoryField } from '../../../shared/history/columns';
import { createHistoryTableBuilder, NO_DELAY, SAMPLES_PER_REASON } from '../../../shared/history/history-table';

function cellsOf(row: Partial<Record<HistoryField, Cell>>): Cell[] {
  return HISTORY_FIELDS.map((f) => row[f]);
}

const OK = { date: '2024-05-02', origin: 'ORD', destination: 'ATL', arrivalDelay: '12.00' };

describe('createHistoryTableBuilder', () => {
  it('never counts a cancelled or diverted flight as on time', () => {
    const b = createHistoryTableBuilder();
    b.add(cellsOf({ ...OK, arrivalDelay: '', cancelled: '1.00' }), 2);
    b.add(cellsOf({ ...OK, arrivalDelay: '0.00', cancelled: '1.00' }), 3);
    b.add(cellsOf({ ...OK, arrivalDelay: '', diverted: '1.00', departureDelay: '9' }), 4);
    b.add(cellsOf({ ...OK, arrivalDelay: '', diverted: 'true' }), 5);
    const t = b.finish();
    expect(t.summary).toMatchObject({ rows: 4, flights: 0, cancelled: 2, diverted: 2, divertedDepartures: 1, invalid: 0 });
    expect([...t.arrival]).toEqual([NO_DELAY]);
    expect([...t.departure]).toEqual([9]);
  });

  it('rejects a missing arrival delay when nothing says the flight was cancelled or diverted', () => {
    const b = createHistoryTableBuilder();
    b.add(cellsOf({ ...OK, arrivalDelay: ' ' }), 2);
    expect(b.finish().summary.invalidByReason).toEqual([expect.objectContaining({ reason: 'missing-arrival-delay', count: 1 })]);
  });

  it('drops recording errors by the bundled fit cleaning rule (below -120 or at least 1,380 minutes)', () => {
    const b = createHistoryTableBuilder();
    for (const d of ['-1116', '-121', '-120', '1379', '1380', '2000']) b.add(cellsOf({ ...OK, arrivalDelay: d }), 2);
    const t = b.finish();
    expect([...t.arrival]).toEqual([-120, 1379]);
    expect(t.summary.invalidByReason).toEqual([expect.objectContaining({ reason: 'implausible-arrival-delay', count: 4 })]);
  });

  it('rounds a fractional delay to the minute and says how many it rounded', () => {
    const b = createHistoryTableBuilder();
    b.add(cellsOf({ ...OK, arrivalDelay: '12.4' }), 2);
    b.add(cellsOf({ ...OK, arrivalDelay: 12 }), 3);
    const t = b.finish();
    expect([...t.arrival]).toEqual([12, 12]);
    expect(t.summary.roundedDelays).toBe(1);
  });

  it('keeps at most a few samples per reason but counts them all', () => {
    const b = createHistoryTableBuilder();
    for (let i = 0; i < 40; i++) b.add(cellsOf({ ...OK, origin: `X${i}` }), i + 2);
    const [bad] = b.finish().summary.invalidByReason;
    expect(bad).toMatchObject({ reason: 'bad-origin', count: 40 });
    expect(bad!.samples).toHaveLength(SAMPLES_PER_REASON);
    expect(bad!.samples[0]).toEqual({ row: 2, cells: { date: '2024-05-02', origin: 'X0', destination: 'ATL', arrivalDelay: '12.00' } });
  });

  it('indexes routes and airports, and counts carriers by flights', () => {
    const b = createHistoryTableBuilder();
    b.add(cellsOf({ ...OK, carrier: 'AA' }), 2);
    b.add(cellsOf({ ...OK, origin: 'ATL', destination: 'ORD', carrier: 'DL' }), 3);
    b.add(cellsOf({ ...OK, carrier: 'aa' }), 4);
    const t = b.finish();
    expect(t.routes).toEqual([
      { origin: 'ORD', destination: 'ATL' },
      { origin: 'ATL', destination: 'ORD' },
    ]);
    expect([...t.route]).toEqual([0, 1, 0]);
    expect(t.summary.carriers).toEqual([
      { code: 'AA', flights: 2 },
      { code: 'DL', flights: 1 },
    ]);
  });
});
