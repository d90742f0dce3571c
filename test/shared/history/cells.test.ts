import { differenceInCalendarDays } from 'date-fns';
import { describe, expect, it } from 'vitest';
import { formatDay, isEmptyCell, parseAirportCode, parseCarrierCode, parseFlag, parseFlightDate, parseHhmm, parseNumberCell } from '../../../shared/history/cells';

// Reference: date-fns differenceInCalendarDays from 1970-01-01 (a general-purpose date library).
function referenceDay(year: number, month: number, day: number): number {
  return differenceInCalendarDays(new Date(year, month - 1, day), new Date(1970, 0, 1));
}

describe('parseFlightDate', () => {
  it.each([
    ['2024-01-15', 2024, 1, 15],
    ['2024-02-29', 2024, 2, 29],
    ['1/15/2024 12:00:00 AM', 2024, 1, 15],
    ['12/31/2023', 2023, 12, 31],
    ['20010630', 2001, 6, 30],
    ['2001-06-30T23:55:00', 2001, 6, 30],
  ])('reads %s as the day number date-fns gives', (text, y, m, d) => {
    expect(parseFlightDate(text)).toBe(referenceDay(y, m, d));
  });

  it('takes the UTC calendar date of a Parquet timestamp', () => {
    expect(parseFlightDate(new Date(Date.UTC(2001, 0, 31, 23, 59)))).toBe(referenceDay(2001, 1, 31));
  });

  it.each(['2023-02-29', '2024-13-01', '31/12/2023', 'yesterday', '', '2024-1', '0000-01-01'])('rejects %j', (text) => {
    expect(parseFlightDate(text)).toBeNaN();
  });

  it('formats a day number back to YYYY-MM-DD', () => {
    expect(formatDay(referenceDay(2023, 6, 30))).toBe('2023-06-30');
  });
});

describe('parseNumberCell', () => {
  it('reads the BTS delay format and plain numbers', () => {
    expect(parseNumberCell('12.00')).toBe(12);
    expect(parseNumberCell(' -5.00 ')).toBe(-5);
    expect(parseNumberCell(7)).toBe(7);
    expect(parseNumberCell(7n)).toBe(7);
  });

  it.each(['', 'abc', '0x1F', '1,5', 'NaN', 'Infinity', '12 min'])('rejects %j instead of reading it as a number', (text) => {
    expect(parseNumberCell(text)).toBeNaN();
  });
});

describe('parseFlag', () => {
  it.each([
    ['1.00', 1],
    ['0.00', 0],
    ['1', 1],
    ['TRUE', 1],
    ['no', 0],
    [true, 1],
    [0, 0],
  ] as const)('reads %j as %d', (cell, expected) => {
    expect(parseFlag(cell)).toBe(expected);
  });

  it('rejects a value that is neither yes nor no', () => {
    expect(parseFlag('2')).toBeNaN();
    expect(parseFlag('maybe')).toBeNaN();
  });
});

describe('codes and times', () => {
  it('upper-cases three-letter IATA airport codes and rejects others', () => {
    expect(parseAirportCode(' ord ')).toBe('ORD');
    expect(parseAirportCode('XX1')).toBe('');
    expect(parseAirportCode('KORD')).toBe('');
  });

  it('accepts two-character IATA and three-letter ICAO carrier codes', () => {
    expect(parseCarrierCode('B6')).toBe('B6');
    expect(parseCarrierCode('AAL')).toBe('AAL');
    expect(parseCarrierCode('American')).toBe('');
  });

  it('reads CRS times written hhmm, 2400 included (BTS field definitions)', () => {
    expect(parseHhmm('0730')).toBe(450);
    expect(parseHhmm('5')).toBe(5);
    expect(parseHhmm('2400')).toBe(1440);
    expect(parseHhmm('2530')).toBeNaN();
    expect(parseHhmm('0960')).toBeNaN();
  });

  it('treats blanks and Parquet nulls as empty, not as zero', () => {
    expect(isEmptyCell('  ')).toBe(true);
    expect(isEmptyCell(null)).toBe(true);
    expect(isEmptyCell(NaN)).toBe(true);
    expect(isEmptyCell('0')).toBe(false);
  });
});
