// Parsers for the cells of a delay-history row: flight dates, delay minutes, flags, codes.
//
// Each takes whatever a reader produced (CSV text, or a Parquet number, boolean, bigint or Date)
// and returns a number, with NaN meaning "not a valid value". Empty cells are told apart
// from bad ones by `isEmptyCell`, so a missing optional value is never counted as an error.

import { isoDate } from '../delay/evaluation/flight-columns';

/** A cell as a reader hands it over. */
export type Cell = string | number | bigint | boolean | Date | null | undefined;

const MS_PER_DAY = 86_400_000;

/** True for a blank cell: null, undefined, '' or only spaces, or a Parquet NaN. */
export function isEmptyCell(cell: Cell): boolean {
  if (cell === null || cell === undefined) return true;
  if (typeof cell === 'string') return cell.trim() === '';
  if (typeof cell === 'number') return Number.isNaN(cell);
  return false;
}

/** Days since 1970-01-01 of a proleptic Gregorian calendar date; NaN for an impossible date. */
export function dayNumber(year: number, month: number, day: number): number {
  if (!Number.isInteger(year) || !Number.isInteger(month) || !Number.isInteger(day)) return NaN;
  if (year < 1900 || year > 2200 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return NaN;
  return Date.UTC(year, month - 1, day) / MS_PER_DAY;
}

export function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** The calendar date of a day number. */
export function dayToDate(dayNumber: number): { year: number; month: number; day: number } {
  const d = new Date(dayNumber * MS_PER_DAY);
  return { year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate() };
}

/** A day number as YYYY-MM-DD (the bundle pipeline's isoDate). */
export const formatDay = isoDate;

const ISO_DATE = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ].*)?$/;
const COMPACT_DATE = /^(\d{4})(\d{2})(\d{2})$/;
// The TranStats download writes FL_DATE as "1/15/2024 12:00:00 AM" (US month/day/year).
const US_DATE = /^(\d{1,2})\/(\d{1,2})\/(\d{4})(?:\s.*)?$/;

/**
 * The flight date of a cell as a day number (days since 1970-01-01); NaN when it is not a date.
 * Accepts YYYY-MM-DD (optionally followed by a time), YYYYMMDD, M/D/YYYY (optionally with a
 * time), and Parquet dates or timestamps, whose calendar date is taken in UTC because Parquet
 * stores local wall-clock timestamps as if they were UTC.
 * @example parseFlightDate('2024-01-15') // returns 19737
 */
export function parseFlightDate(cell: Cell): number {
  if (cell instanceof Date) {
    const t = cell.getTime();
    return Number.isFinite(t) ? dayNumber(cell.getUTCFullYear(), cell.getUTCMonth() + 1, cell.getUTCDate()) : NaN;
  }
  if (typeof cell !== 'string') return NaN;
  const text = cell.trim();
  let m = ISO_DATE.exec(text);
  if (m) return dayNumber(Number(m[1]), Number(m[2]), Number(m[3]));
  m = US_DATE.exec(text);
  if (m) return dayNumber(Number(m[3]), Number(m[1]), Number(m[2]));
  m = COMPACT_DATE.exec(text);
  if (m) return dayNumber(Number(m[1]), Number(m[2]), Number(m[3]));
  return NaN;
}

/**
 * A number from a cell: finite numbers as they are, numeric text such as "-5.00" or "12",
 * bigints within the safe range. NaN for anything else, including an empty cell.
 * @example parseNumberCell(' -5.00 ') // returns -5
 */
export function parseNumberCell(cell: Cell): number {
  if (typeof cell === 'number') return Number.isFinite(cell) ? cell : NaN;
  if (typeof cell === 'bigint') {
    const n = Number(cell);
    return Number.isSafeInteger(n) ? n : NaN;
  }
  if (typeof cell !== 'string') return NaN;
  // Number() alone would read '' as 0, '0x1F' as 31 and 'Infinity' as a number; decimal
  // notation starts with a digit, a sign or a point, and never has x, o or b second.
  const text = cell.length > 0 && (cell.charCodeAt(0) === 32 || cell.charCodeAt(cell.length - 1) === 32) ? cell.trim() : cell;
  if (text.length === 0) return NaN;
  const c0 = text.charCodeAt(0);
  const startsWell = (c0 >= 48 && c0 <= 57) || c0 === 45 || c0 === 43 || c0 === 46;
  if (!startsWell) return NaN;
  const n = Number(text);
  if (!Number.isFinite(n)) return NaN;
  if (text.length > 1 && (c0 === 48 || c0 === 45 || c0 === 43)) {
    const c1 = text.charCodeAt(1) | 32;
    if (c1 === 120 || c1 === 111 || c1 === 98) return NaN;
  }
  return n;
}

/**
 * A yes/no flag: 1/0 (also "1.00"/"0.00" as the BTS download writes them), true/false, yes/no,
 * y/n, t/f in any case, and booleans. NaN for anything else.
 */
export function parseFlag(cell: Cell): number {
  if (cell === '0.00' || cell === '0') return 0;
  if (cell === '1.00' || cell === '1') return 1;
  if (typeof cell === 'boolean') return cell ? 1 : 0;
  const n = parseNumberCell(cell);
  if (n === 0 || n === 1) return n;
  if (typeof cell !== 'string') return NaN;
  switch (cell.trim().toLowerCase()) {
    case 'true':
    case 'yes':
    case 'y':
    case 't':
      return 1;
    case 'false':
    case 'no':
    case 'n':
    case 'f':
      return 0;
    default:
      return NaN;
  }
}

const AIRPORT = /^[A-Z]{3}$/;

/** An IATA airport code (three letters, IATA Airline Coding Directory) upper-cased, or '' when the cell is not one. */
export function parseAirportCode(cell: Cell): string {
  if (typeof cell !== 'string') return '';
  const code = cell.trim().toUpperCase();
  return AIRPORT.test(code) ? code : '';
}

const CARRIER = /^[A-Z0-9]{2,3}$/;

/** A carrier code: the two-character IATA designator, or a three-letter ICAO one; '' when it is neither. */
export function parseCarrierCode(cell: Cell): string {
  if (typeof cell !== 'string') return '';
  const code = cell.trim().toUpperCase();
  return CARRIER.test(code) ? code : '';
}

/**
 * A local scheduled time written hhmm (the BTS CRS times: "0730", "730", "2400" for midnight at
 * the end of the day) as minutes after midnight, 0..1440. NaN when it is not such a time.
 * @example parseHhmm('0730') // returns 450
 */
export function parseHhmm(cell: Cell): number {
  const n = parseNumberCell(cell);
  if (!Number.isInteger(n) || n < 0 || n > 2400) return NaN;
  const hours = Math.floor(n / 100);
  const minutes = n % 100;
  if (minutes > 59 || (hours === 24 && minutes !== 0)) return NaN;
  return hours * 60 + minutes;
}
