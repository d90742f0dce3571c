// Reading the dates and clock times people type or paste: ISO dates, written-out dates,
// 24-hour and 12-hour (AM/PM) times, and the "+1" day marks of airline timetables.
//
// Pure text → numbers; no zone is involved here (see shared/time/zones.ts for that).
import { daysFromCivil, fieldsOfMs } from '../time/zones';

export interface CalendarDate {
  readonly year: number;
  readonly month: number;
  readonly day: number;
}

export interface ClockTime {
  readonly hour: number;
  readonly minute: number;
}

/** A local date-and-time cell: the date may be missing, and a "+1"/"-1" may stand for it. */
export interface LocalDateTimeText {
  readonly date: CalendarDate | null;
  readonly time: ClockTime;
  /** Days after the departure date, from a "+1" / "-1" mark; null when none was written. */
  readonly dayOffset: number | null;
}

export type Parsed<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly message: string };

const MONTHS: Record<string, number> = {
  jan: 1, january: 1, feb: 2, february: 2, mar: 3, march: 3, apr: 4, april: 4, may: 5, jun: 6, june: 6,
  jul: 7, july: 7, aug: 8, august: 8, sep: 9, sept: 9, september: 9, oct: 10, october: 10, nov: 11, november: 11, dec: 12, december: 12,
};
const MONTH_NAMES = Object.keys(MONTHS).sort((a, b) => b.length - a.length).join('|');
const WEEKDAYS = '(?:mon|tue|tues|wed|thu|thur|thurs|fri|sat|sun)(?:day|sday|nesday|urday|rsday)?\\.?,?';

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function daysInMonth(year: number, month: number): number {
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  return month === 2 && leap ? 29 : (DAYS_IN_MONTH[month - 1] ?? 0);
}

/** A checked calendar date, or null when the day does not exist (31 April, 29 February 2027). */
export function calendarDate(year: number, month: number, day: number): CalendarDate | null {
  if (!Number.isInteger(year) || !Number.isInteger(month) || !Number.isInteger(day)) return null;
  if (year < 1900 || year > 2199 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  return { year, month, day };
}

/** The date `days` after `date` in the proleptic Gregorian calendar. */
export function addDays(date: CalendarDate, days: number): CalendarDate {
  const f = fieldsOfMs((daysFromCivil(date.year, date.month, date.day) + days) * 86_400_000);
  return { year: f.year, month: f.month, day: f.day };
}

function fullYear(text: string): number {
  const n = Number(text);
  return text.length === 2 ? 2000 + n : n;
}

/**
 * Date patterns, each anchored so it can be searched for inside a longer line.
 *
 * Numeric day/month orders other than ISO are read only when they cannot be misread:
 * 8/3/2026 could be 8 March or 3 August, so it is refused with a message.
 */
const DATE_PATTERNS: { re: RegExp; read: (m: RegExpExecArray) => Parsed<CalendarDate> }[] = [
  // 2026-03-08, 2026/03/08
  { re: /\b(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?![\d/])/, read: (m) => checked(Number(m[1]), Number(m[2]), Number(m[3]), m[0]) },
  // 20260308 (the compact ISO 8601 basic form), only as a whole token
  { re: /(?<![\d:])(\d{4})(\d{2})(\d{2})(?![\d:])/, read: (m) => checked(Number(m[1]), Number(m[2]), Number(m[3]), m[0]) },
  // Sunday, 8 March 2026 / 8 Mar 2026 / 08MAR26 / 8-Mar-2026
  {
    re: new RegExp(`\\b(?:${WEEKDAYS}\\s*)?(\\d{1,2})(?:st|nd|rd|th)?[\\s-]*(${MONTH_NAMES})\\.?,?[\\s-]*(\\d{4}(?!\\d)|\\d{2}(?![\\d:]))`, 'i'),
    read: (m) => checked(fullYear(m[3] ?? ''), MONTHS[(m[2] ?? '').toLowerCase()] ?? 0, Number(m[1]), m[0]),
  },
  // Sunday, March 8, 2026 / Mar 8 2026
  {
    re: new RegExp(`\\b(?:${WEEKDAYS}\\s*)?(${MONTH_NAMES})\\.?\\s+(\\d{1,2})(?:st|nd|rd|th)?,?\\s+(\\d{4})(?!\\d)`, 'i'),
    read: (m) => checked(Number(m[3]), MONTHS[(m[1] ?? '').toLowerCase()] ?? 0, Number(m[2]), m[0]),
  },
  // 8/3/2026, 8.3.2026, 03/08/2026: day-month order unknown
  {
    re: /\b(\d{1,2})[/.](\d{1,2})[/.](\d{4})(?![\d/.])/,
    read: (m) => {
      const a = Number(m[1]);
      const b = Number(m[2]);
      const y = Number(m[3]);
      if (a === b || (a > 12 && b > 12)) return a === b ? checked(y, a, b, m[0]) : { ok: false, message: `'${m[0]}' is not a date` };
      if (a > 12) return checked(y, b, a, m[0]);
      if (b > 12) return checked(y, a, b, m[0]);
      return { ok: false, message: `'${m[0]}' could be day/month or month/day; write it as ${y}-MM-DD` };
    },
  },
];

function checked(year: number, month: number, day: number, text: string): Parsed<CalendarDate> {
  const date = calendarDate(year, month, day);
  return date ? { ok: true, value: date } : { ok: false, message: `'${text}' is not a real calendar date` };
}

export interface Found<T> {
  readonly value: Parsed<T>;
  readonly index: number;
  readonly length: number;
}

const GLOBAL_DATE_PATTERNS = DATE_PATTERNS.map(({ re, read }) => ({ re: new RegExp(re.source, re.flags + 'g'), read }));

/** Every date written in `text`, in order of position; overlapping matches keep the earliest pattern's. */
export function findDates(text: string): Found<CalendarDate>[] {
  if (!/\d/.test(text)) return [];
  const found: Found<CalendarDate>[] = [];
  const taken: [number, number][] = [];
  for (const { re, read } of GLOBAL_DATE_PATTERNS) {
    re.lastIndex = 0;
    for (let m = re.exec(text); m; m = re.exec(text)) {
      const start = m.index;
      const end = start + m[0].length;
      if (m[0].length === 0) re.lastIndex++;
      if (taken.some(([s, e]) => start < e && end > s)) continue;
      taken.push([start, end]);
      found.push({ value: read(m), index: start, length: m[0].length });
    }
  }
  return found.sort((a, b) => a.index - b.index);
}

const PARTIAL_DATE_PATTERNS: { re: RegExp; day: number; month: number }[] = [
  // 8 Mar, 08MAR, Sunday 8 March (no year after it)
  { re: new RegExp(`\\b(?:${WEEKDAYS}\\s*)?(\\d{1,2})(?:st|nd|rd|th)?[\\s-]*(${MONTH_NAMES})\\b\\.?(?![\\s-]*\\d)`, 'gi'), day: 1, month: 2 },
  // Mar 8, Sunday, March 8th (no year, and not a clock time after it)
  { re: new RegExp(`\\b(?:${WEEKDAYS}\\s*)?(${MONTH_NAMES})\\.?\\s+(\\d{1,2})(?:st|nd|rd|th)?\\b(?![:.h]?\\d)(?!,?\\s+\\d{4})`, 'gi'), day: 2, month: 1 },
];

/**
 * Dates written without a year ("08MAR", "Sunday 8 March"), as airline e-mails often do.
 *
 * The year comes from `reference` (the latest date above): itineraries run forward, so it is
 * the first such date from a week before the reference on. Without a reference the date is
 * refused with a message asking for the year.
 */
export function findDatesWithoutYear(text: string, reference: CalendarDate | null): Found<CalendarDate>[] {
  if (!/\d/.test(text)) return [];
  const found: Found<CalendarDate>[] = [];
  for (const { re, day, month } of PARTIAL_DATE_PATTERNS) {
    re.lastIndex = 0;
    for (let m = re.exec(text); m; m = re.exec(text)) {
      const start = m.index;
      const end = start + m[0].length;
      if (found.some((f) => start < f.index + f.length && end > f.index)) continue;
      const d = Number(m[day]);
      const mo = MONTHS[(m[month] ?? '').toLowerCase()] ?? 0;
      let value: Parsed<CalendarDate>;
      if (!reference) value = { ok: false, message: `'${m[0].trim()}' has no year; write the year, or put a full date line (e.g. 'Sunday, 8 March 2026') above` };
      else {
        let year = reference.year;
        const days = (c: CalendarDate) => Date.UTC(c.year, c.month - 1, c.day) / 86_400_000;
        if (calendarDate(year, mo, d) && days({ year, month: mo, day: d }) < days(reference) - 7) year++;
        value = checked(year, mo, d, m[0].trim());
      }
      found.push({ value, index: start, length: m[0].length });
    }
  }
  return found.sort((a, b) => a.index - b.index);
}

// 07:05, 7:05 pm, 7:05PM, 7:05 p.m., 19h05, and 7pm; seconds (07:05:00) are allowed and must be zero.
const TIME_RE = /(?<![\d:])(\d{1,2})(?:[:h](\d{2})(?::(\d{2}))?)?\s*(a\.?m\.?|p\.?m\.?)?(?![\d:])/gi;

/** Every clock time in `text`, in order. A bare number counts only with AM/PM after it ("7pm"). */
export function findTimes(text: string): Found<ClockTime>[] {
  const found: Found<ClockTime>[] = [];
  if (!/\d/.test(text)) return found;
  TIME_RE.lastIndex = 0;
  for (let m = TIME_RE.exec(text); m; m = TIME_RE.exec(text)) {
    const [whole, h, min, sec, ampm] = m;
    if (min === undefined && !ampm) continue;
    // Reject words that merely end in "am"/"pm" ("7 pmx") by checking the next character.
    const after = text[m.index + whole.length];
    if (ampm && after && /[a-z]/i.test(after)) continue;
    found.push({ value: clockTime(Number(h), min === undefined ? 0 : Number(min), sec === undefined ? 0 : Number(sec), ampm ?? '', whole.trim()), index: m.index, length: whole.length });
  }
  return found;
}

function clockTime(hour: number, minute: number, second: number, ampm: string, text: string): Parsed<ClockTime> {
  if (minute > 59 || second > 59) return { ok: false, message: `'${text}' is not a clock time` };
  if (second !== 0) return { ok: false, message: `'${text}' has seconds; flight times are to the minute` };
  if (ampm) {
    if (hour < 1 || hour > 12) return { ok: false, message: `'${text}': with AM/PM the hour must be 1-12` };
    const pm = ampm.toLowerCase().startsWith('p');
    return { ok: true, value: { hour: (hour % 12) + (pm ? 12 : 0), minute } };
  }
  if (hour > 23) return { ok: false, message: `'${text}' is not a clock time (hours go to 23)` };
  return { ok: true, value: { hour, minute } };
}

const ISO_DATE_TIME_RE = /^(\d{4})-(\d{2})-(\d{2})[ T](\d{2}):(\d{2})$/;
const TIME_WITH_MARK_RE = /^(\d{1,2}):(\d{2})(?: ([+-])(\d))?$/;

/** The two forms machine-written tables use, read without the general search; null otherwise. */
function quickParse(text: string): Parsed<LocalDateTimeText> | null {
  let m = ISO_DATE_TIME_RE.exec(text);
  if (m) {
    const date = calendarDate(Number(m[1]), Number(m[2]), Number(m[3]));
    const hour = Number(m[4]);
    const minute = Number(m[5]);
    if (!date || hour > 23 || minute > 59) return null;
    return { ok: true, value: { date, time: { hour, minute }, dayOffset: null } };
  }
  m = TIME_WITH_MARK_RE.exec(text);
  if (m) {
    const hour = Number(m[1]);
    const minute = Number(m[2]);
    if (hour > 23 || minute > 59) return null;
    const dayOffset = m[3] ? (m[3] === '-' ? -1 : 1) * Number(m[4]) : null;
    return { ok: true, value: { date: null, time: { hour, minute }, dayOffset } };
  }
  return null;
}

const DAY_OFFSET_RE = /(?:^|[\s(])([+\-−]\s?\d)(?:\s*days?)?\)?(?=\s|$)/i;

/**
 * Reads a date-and-time cell: `2026-03-08 07:05`, `2026-03-08T07:05`, `8 Mar 2026 7:05 PM`,
 * or a time alone, optionally with a day mark (`06:55 +1`, `+1 06:55`).
 */
export function parseLocalDateTime(cell: string): Parsed<LocalDateTimeText> {
  const text = cell.trim();
  if (text === '') return { ok: false, message: 'empty' };
  const quick = quickParse(text);
  if (quick) return quick;
  if (text.length > 80) return { ok: false, message: 'too long for a date and time' };
  // ISO 8601 joins date and time with 'T'; split it so both patterns see word boundaries.
  const spaced = text.replace(/^(\d{4}-\d{1,2}-\d{1,2})T/i, '$1 ').replace(/(?<=\d)Z$/i, ' Z');
  if (/\sZ$|[+-]\d{2}:?\d{2}$/.test(spaced) && /\d{4}-\d/.test(spaced)) {
    return { ok: false, message: `'${text}' carries a UTC offset; write the airport's local time without it` };
  }
  const dates = findDates(spaced);
  if (dates.length > 1) return { ok: false, message: `'${text}' has more than one date` };
  let rest = spaced;
  let date: CalendarDate | null = null;
  const [d] = dates;
  if (d) {
    if (!d.value.ok) return d.value;
    date = d.value.value;
    rest = spaced.slice(0, d.index) + ' ' + spaced.slice(d.index + d.length);
  }
  let dayOffset: number | null = null;
  const off = DAY_OFFSET_RE.exec(rest);
  if (off?.[1]) {
    dayOffset = Number(off[1].replace(/\s/g, '').replace('−', '-'));
    rest = rest.slice(0, off.index) + ' ' + rest.slice(off.index + off[0].length);
  }
  const times = findTimes(rest);
  if (times.length === 0) return { ok: false, message: `no clock time in '${text}'` };
  if (times.length > 1) return { ok: false, message: `'${text}' has more than one time` };
  const [t] = times;
  if (!t) return { ok: false, message: 'no time' };
  if (!t.value.ok) return { ok: false, message: t.value.message };
  const leftover = (rest.slice(0, t.index) + rest.slice(t.index + t.length)).replace(/[\s,;]+/g, '');
  if (leftover !== '') return { ok: false, message: `'${text}': cannot read '${leftover}'` };
  if (date && dayOffset !== null) return { ok: false, message: `'${text}' has both a date and a day mark` };
  return { ok: true, value: { date, time: t.value.value, dayOffset } };
}
