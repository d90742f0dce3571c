import { differenceInCalendarDays, isLastDayOfMonth, lastDayOfMonth, subMonths } from 'date-fns';
import { describe, expect, it } from 'vitest';
import { dayNumber, formatDay } from '../../../shared/history/cells';
import { createHistoryTableBuilder } from '../../../shared/history/history-table';
import { defaultHoldoutAfter, hasDepartureDelays, historyFlightColumns, HoldoutError, parseHoldoutAfter, planHoldout } from '../../../shared/history/holdout';

// Reference: date-fns subMonths / lastDayOfMonth, "one month back" with month-end kept at month-end.
function referenceCutoff(y: number, m: number, d: number): number {
  const date = new Date(y, m - 1, d);
  const back = isLastDayOfMonth(date) ? lastDayOfMonth(subMonths(date, 1)) : subMonths(date, 1);
  return differenceInCalendarDays(back, new Date(1970, 0, 1));
}

function tableOf(rows: readonly (readonly [string, string, string, string, string?])[]) {
  const b = createHistoryTableBuilder();
  // Cells in HISTORY_FIELDS order: date, origin, destination, arrivalDelay, departureDelay, ...
  rows.forEach(([date, o, d, arr, dep], i) => b.add([date, o, d, arr, dep], i + 2));
  return b.finish();
}

describe('defaultHoldoutAfter', () => {
  it.each([
    [2024, 6, 30],
    [2024, 3, 31],
    [2024, 3, 10],
    [2024, 1, 15],
    [2023, 3, 30],
    [2024, 12, 31],
  ])('holds out the last month before %d-%d-%d as date-fns counts months', (y, m, d) => {
    expect(defaultHoldoutAfter(dayNumber(y, m, d))).toBe(referenceCutoff(y, m, d));
  });

  it('holds out exactly June when the data ends on 30 June', () => {
    expect(formatDay(defaultHoldoutAfter(dayNumber(2001, 6, 30)))).toBe('2001-05-31');
  });
});

describe('parseHoldoutAfter', () => {
  it('reads YYYY-MM-DD and rejects impossible or other dates', () => {
    expect(parseHoldoutAfter('2024-05-31')).toBe(dayNumber(2024, 5, 31));
    expect(() => parseHoldoutAfter('2024-02-30')).toThrow(HoldoutError);
    expect(() => parseHoldoutAfter('31/05/2024')).toThrow(/YYYY-MM-DD/);
  });
});

describe('planHoldout', () => {
  const table = tableOf([
    ['2024-04-02', 'ORD', 'ATL', '5', '7'],
    ['2024-05-31', 'ORD', 'ATL', '-3', ''],
    ['2024-06-01', 'ATL', 'ORD', '20', '25'],
    ['2024-06-30', 'ATL', 'ORD', '1', ''],
  ]);

  it('splits at the default cutoff and counts both sides', () => {
    expect(planHoldout(table)).toEqual({ cutoffDay: dayNumber(2024, 5, 31), holdoutAfter: '2024-05-31', defaulted: true, fitFlights: 2, heldOutFlights: 2 });
  });

  it('says which way to move a cutoff that leaves a side empty', () => {
    expect(() => planHoldout(table, dayNumber(2024, 7, 1))).toThrow(/nothing is held out; choose an earlier --holdout-after/);
    expect(() => planHoldout(table, dayNumber(2024, 1, 1))).toThrow(/data runs 2024-04-02 to 2024-06-30.*choose a later/);
  });

  it('gives each delay kind as flight columns, NaN where a flight has none', () => {
    expect(hasDepartureDelays(table)).toBe(true);
    const dep = historyFlightColumns(table, 'departure');
    expect([...dep.delayMinutes]).toEqual([7, NaN, 25, NaN]);
    const arr = historyFlightColumns(table, 'arrival');
    expect([...arr.delayMinutes]).toEqual([5, -3, 20, 1]);
    expect(arr.airports[arr.origin[2]!]).toBe('ATL');
    expect(arr.airports[arr.destination[2]!]).toBe('ORD');
  });
});
