// Plain-text formatting of the numbers and times a report shows: percentages, durations,
// and an airport's local time with its weekday, zone and UTC offset.
//
// Pure string work on the fields a Leg already carries (local wall clock, UTC instant, IANA zone).
import { formatOffset } from '../time/zones';

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'] as const;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const;
const LOCAL_PATTERN = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;

/**
 * A probability as a whole-number percentage, keeping "<1%" and ">99%" honest at the ends.
 * @example formatPercent(0.9234) // "92%"
 * @example formatPercent(0.996) // ">99%"
 */
export function formatPercent(p: number): string {
  if (!Number.isFinite(p)) return 'n/a';
  if (p > 0 && p < 0.005) return '<1%';
  if (p < 1 && p > 0.995) return '>99%';
  return `${Math.round(p * 100)}%`;
}

/** A 90% interval of a probability, e.g. "84–95%". */
export function formatPercentRange(lo: number, hi: number): string {
  const a = formatPercent(lo);
  const b = formatPercent(hi);
  if (a === b) return a;
  // "<1%" and ">99%" keep their signs, so the range is written out in full.
  return /[<>]/.test(a + b) ? `${a} to ${b}` : `${a.replace(/%$/, '')}–${b}`;
}

/**
 * Minutes as hours and minutes, with a true minus sign for negative values.
 * @example formatMinutes(95) // "1 h 35 min"
 * @example formatMinutes(-20) // "−20 min"
 */
export function formatMinutes(minutes: number): string {
  if (!Number.isFinite(minutes)) return 'n/a';
  const sign = minutes < 0 ? '−' : '';
  const total = Math.round(Math.abs(minutes));
  const h = Math.floor(total / 60);
  const m = total % 60;
  if (h === 0) return `${sign}${m} min`;
  return m === 0 ? `${sign}${h} h` : `${sign}${h} h ${m} min`;
}

/** A signed margin in minutes, e.g. "+15 min", "−10 min". */
export function formatSignedMinutes(minutes: number): string {
  if (!Number.isFinite(minutes)) return 'n/a';
  return minutes > 0 ? `+${formatMinutes(minutes)}` : formatMinutes(minutes);
}

/** Milliseconds of a local wall-clock string read as if it were UTC; NaN when malformed. */
function wallClockMs(local: string): number {
  const m = LOCAL_PATTERN.exec(local);
  if (!m) return NaN;
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), Number(m[4]), Number(m[5]));
}

/**
 * The UTC offset in force at a local time, from the local wall clock and the UTC instant.
 * @example utcOffsetLabel('2026-03-08T03:30', Date.UTC(2026, 2, 8, 7, 30)) // "UTC−04:00"
 */
export function utcOffsetLabel(local: string, utcMs: number): string {
  const offsetMin = Math.round((wallClockMs(local) - utcMs) / 60_000);
  return Number.isFinite(offsetMin) ? formatOffset(offsetMin) : 'UTC?';
}

/** The parts of a local time a reader needs: weekday and date, clock time, zone. */
export interface LocalTimeParts {
  /** "Tue 3 Mar 2026" */
  readonly day: string;
  /** "18:40" */
  readonly time: string;
  /** "America/Chicago, UTC−6" */
  readonly zone: string;
}

/** Splits a Leg's local time into day, clock time and zone, for tables and briefings. */
export function localTimeParts(local: string, utcMs: number, ianaZone: string): LocalTimeParts {
  const m = LOCAL_PATTERN.exec(local);
  if (!m) return { day: local, time: '', zone: ianaZone };
  const weekday = WEEKDAYS[new Date(wallClockMs(local)).getUTCDay()];
  const month = MONTHS[Number(m[2]) - 1];
  return {
    day: `${weekday} ${Number(m[3])} ${month} ${m[1]}`,
    time: `${m[4]}:${m[5]}`,
    zone: `${ianaZone}, ${utcOffsetLabel(local, utcMs)}`,
  };
}

/** Whole calendar days from one local date to another (the "+1" beside an arrival the next day). */
export function localDayDifference(fromLocal: string, toLocal: string): number {
  const a = wallClockMs(fromLocal.slice(0, 10) + 'T00:00');
  const b = wallClockMs(toLocal.slice(0, 10) + 'T00:00');
  return Math.round((b - a) / 86_400_000);
}
