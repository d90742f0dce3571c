import { describe, expect, it } from 'vitest';
import { cleanFlights, dayNumber, type FlightColumns } from '../../../../shared/delay/evaluation/flight-columns';
import { compressDelays, indexRoutes, isHeldOutDay, selectByDay } from '../../../../shared/delay/evaluation/weighted-delays';

function flights(rows: [origin: string, destination: string, isoDay: string, delay: number][]): FlightColumns {
  const airports = [...new Set(rows.flatMap((r) => [r[0], r[1]]))];
  const at = (c: string) => airports.indexOf(c);
  return {
    length: rows.length,
    airports,
    origin: Uint16Array.from(rows, (r) => at(r[0])),
    destination: Uint16Array.from(rows, (r) => at(r[1])),
    day: Int32Array.from(rows, (r) => Math.floor(Date.parse(`${r[2]}T00:00:00Z`) / 86_400_000)),
    delayMinutes: Float64Array.from(rows, (r) => r[3]),
  };
}

const sample = flights([
  ['ORD', 'ATL', '2001-01-01', 5],
  ['ORD', 'ATL', '2001-01-01', 5],
  ['ORD', 'ATL', '2001-02-03', 5],
  ['ATL', 'ORD', '2001-01-05', -3],
  ['ATL', 'ORD', '2001-01-05', -1116],
  ['ATL', 'ORD', '2001-01-06', 1420],
  ['ATL', 'ORD', '2001-07-01', 10],
  ['BOS', 'ATL', '2001-01-10', NaN],
]);
const first = dayNumber(2001, 1, 1);
const last = dayNumber(2001, 6, 30);

describe('cleanFlights', () => {
  it('drops missing, impossible-early, day-wrap and out-of-range rows and counts each', () => {
    const { keep, report } = cleanFlights(sample, first, last);
    expect(Array.from(keep)).toEqual([1, 1, 1, 1, 0, 0, 0, 0]);
    expect(report).toEqual({ kept: 4, droppedMissing: 1, droppedTooEarly: 1, droppedTooLate: 1, droppedOutOfRange: 1 });
  });
});

describe('indexRoutes and compressDelays', () => {
  const { keep } = cleanFlights(sample, first, last);
  const index = indexRoutes(sample, keep);

  it('numbers routes in code order, whatever the row order', () => {
    expect(index.routes).toEqual([
      { origin: 'ATL', destination: 'ORD', flights: 1 },
      { origin: 'ORD', destination: 'ATL', flights: 3 },
    ]);
    expect(Array.from(index.routeOf)).toEqual([1, 1, 1, 0, -1, -1, -1, -1]);
  });

  it('collapses repeated (route, month, minute) rows into counts that sum to the flights', () => {
    const data = compressDelays(sample, index, keep, { minDelay: -120, maxDelay: 1379 });
    expect(data.periodLabels).toEqual(['2001-01', '2001-02']);
    expect(Array.from(data.group)).toEqual([0, 1, 1]);
    expect(Array.from(data.period)).toEqual([0, 0, 1]);
    expect(Array.from(data.value)).toEqual([-3, 5, 5]);
    expect(Array.from(data.count)).toEqual([1, 2, 1]);
    expect(data.flights).toBe(4);
  });

  it('refuses a delay that is not a whole minute instead of rounding it', () => {
    const odd = flights([['ORD', 'ATL', '2001-01-01', 5.5]]);
    const k = new Uint8Array([1]);
    expect(() => compressDelays(odd, indexRoutes(odd, k), k, { minDelay: -120, maxDelay: 1379 })).toThrow(/not a whole minute/);
  });
});

describe('held-out days', () => {
  it('holds out every fifth calendar day: the 5th, 10th, ... of the sample', () => {
    const held = Array.from({ length: 12 }, (_, i) => first + i).filter((d) => isHeldOutDay(d, first));
    expect(held).toEqual([first + 4, first + 9]);
  });

  it('selects the kept flights of the chosen days', () => {
    const { keep } = cleanFlights(sample, first, last);
    const mask = selectByDay(sample, keep, (d) => isHeldOutDay(d, first));
    expect(Array.from(mask)).toEqual([0, 0, 0, 1, 0, 0, 0, 0]);
  });
});
