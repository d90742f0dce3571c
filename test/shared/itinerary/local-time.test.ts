// Reading typed dates and clock times: the forms the issue lists, and refusals with reasons.
import { describe, expect, it } from 'vitest';
import { addDays, findDates, findTimes, parseLocalDateTime } from '../../../shared/itinerary/local-time';

const value = (text: string) => {
  const r = parseLocalDateTime(text);
  if (!r.ok) throw new Error(`${text}: ${r.message}`);
  return r.value;
};

describe('parseLocalDateTime', () => {
  it.each([
    ['2026-03-08 07:05', { year: 2026, month: 3, day: 8 }, 7, 5, null],
    ['2026-03-08T07:05', { year: 2026, month: 3, day: 8 }, 7, 5, null],
    ['2026-03-08 7:05 PM', { year: 2026, month: 3, day: 8 }, 19, 5, null],
    ['2026-03-08 12:05 am', { year: 2026, month: 3, day: 8 }, 0, 5, null],
    ['2026-03-08 12:30 p.m.', { year: 2026, month: 3, day: 8 }, 12, 30, null],
    ['8 Mar 2026 07:05', { year: 2026, month: 3, day: 8 }, 7, 5, null],
    ['Sunday, 8 March 2026 7:05pm', { year: 2026, month: 3, day: 8 }, 19, 5, null],
    ['March 8, 2026 07:05', { year: 2026, month: 3, day: 8 }, 7, 5, null],
    ['2026-03-08 07:05:00', { year: 2026, month: 3, day: 8 }, 7, 5, null],
    ['15:05', null, 15, 5, null],
    ['15:05 +1', null, 15, 5, 1],
    ['+1 15:05', null, 15, 5, 1],
    ['3:05 PM (+1)', null, 15, 5, 1],
    ['06:40 -1', null, 6, 40, -1],
    ['06:40 −1', null, 6, 40, -1],
  ])('reads %s', (text, date, hour, minute, dayOffset) => {
    expect(value(text)).toEqual({ date, time: { hour, minute }, dayOffset });
  });

  it.each([
    ['', /empty/],
    ['soon', /no clock time/],
    ['2026-03-08', /no clock time/],
    ['2026-02-29 10:00', /not a real calendar date/],
    ['2026-03-08 24:00', /not a clock time/],
    ['2026-03-08 13:05 PM', /1-12/],
    ['2026-03-08 07:05:30', /seconds/],
    ['2026-03-08 07:05 08:10', /more than one time/],
    ['2026-03-08 2026-03-09 07:05', /more than one date/],
    ['2026-03-08 07:05 +1', /both a date and a day mark/],
    ['2026-03-08T07:05Z', /UTC offset/],
    ['2026-03-08T07:05+01:00', /UTC offset/],
    ['03/08/2026 07:05', /day\/month or month\/day/],
    ['2026-03-08 07:05 sharp', /cannot read 'sharp'/],
  ])('refuses %j', (text, message) => {
    const r = parseLocalDateTime(text);
    expect(r.ok).toBe(false);
    expect(r.ok ? '' : r.message).toMatch(message);
  });

  it('reads a numeric date only when day and month cannot be swapped', () => {
    expect(value('25/12/2026 10:00').date).toEqual({ year: 2026, month: 12, day: 25 });
    expect(value('12/25/2026 10:00').date).toEqual({ year: 2026, month: 12, day: 25 });
    expect(value('4.4.2026 10:00').date).toEqual({ year: 2026, month: 4, day: 4 });
  });

  it('accepts 29 February only in leap years (Gregorian calendar)', () => {
    expect(value('2028-02-29 10:00').date).toEqual({ year: 2028, month: 2, day: 29 });
    expect(parseLocalDateTime('2100-02-29 10:00').ok).toBe(false);
    expect(value('2000-02-29 10:00').date).toEqual({ year: 2000, month: 2, day: 29 });
  });
});

describe('searching a line', () => {
  it('finds dates and times in order, without reading flight numbers or years as times', () => {
    const line = 'Sun 8 Mar 2026 UA 901 SFO 7:05 PM - FRA 3:05 PM';
    expect(findDates(line).map((d) => d.value)).toEqual([{ ok: true, value: { year: 2026, month: 3, day: 8 } }]);
    expect(findTimes(line).map((t) => t.value)).toEqual([
      { ok: true, value: { hour: 19, minute: 5 } },
      { ok: true, value: { hour: 15, minute: 5 } },
    ]);
  });

  it('adds days across month, year and leap-day boundaries', () => {
    expect(addDays({ year: 2026, month: 12, day: 31 }, 1)).toEqual({ year: 2027, month: 1, day: 1 });
    expect(addDays({ year: 2028, month: 3, day: 1 }, -1)).toEqual({ year: 2028, month: 2, day: 29 });
    expect(addDays({ year: 2026, month: 3, day: 1 }, -1)).toEqual({ year: 2026, month: 2, day: 28 });
  });
});
