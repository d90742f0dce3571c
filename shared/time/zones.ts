// Local wall time in an IANA zone ↔ absolute instant, with DST gaps and overlaps made explicit.
//
// Offsets come from date-fns-tz's formatInTimeZone with the 'xxx' token, which reads the
// offset at a true instant. Nothing here builds a Date from local fields or reads getHours():
// those depend on the machine's own zone, and so would gap and overlap detection.
import { formatInTimeZone } from 'date-fns-tz';

export interface WallTime {
  readonly year: number;
  /** 1-12. */
  readonly month: number;
  readonly day: number;
  readonly hour: number;
  readonly minute: number;
}

export type LocalResolution =
  /** The wall time happens exactly once. */
  | { readonly kind: 'exact'; readonly utcMs: number; readonly offsetMinutes: number }
  /**
   * The wall time happens twice (clocks went back). `utcMs` is the first occurrence, as
   * RFC 5545 §3.3.5 prescribes for iCalendar; `laterUtcMs` is the second.
   */
  | {
      readonly kind: 'ambiguous';
      readonly utcMs: number;
      readonly offsetMinutes: number;
      readonly laterUtcMs: number;
      readonly laterOffsetMinutes: number;
    }
  /**
   * The wall time never happens (clocks went forward). `shiftedUtcMs` reads it with the offset
   * in force before the gap, RFC 5545 §3.3.5's reading, which lands after the gap.
   */
  | { readonly kind: 'gap'; readonly beforeOffsetMinutes: number; readonly afterOffsetMinutes: number; readonly shiftedUtcMs: number }
  | { readonly kind: 'invalid'; readonly reason: string };

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;
/** Offsets in use lie within ±14 h (Pacific/Kiritimati +14, Etc/GMT+12 −12). */
const MAX_OFFSET_MS = 14 * 3_600_000;
/** Instants Layline handles: years 1900-2199; outside that a wall time is rejected as invalid. */
const MIN_MS = Date.UTC(1900, 0, 1);
const MAX_MS = Date.UTC(2200, 0, 1);

const validZones = new Map<string, boolean>();

/** True when the runtime's IANA database knows the zone name. */
export function isValidZone(zone: string): boolean {
  let ok = validZones.get(zone);
  if (ok === undefined) {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone: zone });
      ok = typeof zone === 'string' && zone.length > 0;
    } catch {
      ok = false;
    }
    if (validZones.size < 10_000) validZones.set(zone, ok);
  }
  return ok;
}

function parseOffset(text: string): number {
  if (text === 'Z') return 0;
  const m = /^([+-])(\d{2}):(\d{2})$/.exec(text);
  if (!m) return NaN;
  return (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3]));
}

/** The offset straight from date-fns-tz, uncached. */
function exactOffsetMinutes(zone: string, utcMs: number): number {
  return parseOffset(formatInTimeZone(utcMs, zone, 'xxx'));
}

/** The offset at the start of a year and every change during it, each with the offset it starts. */
interface YearOffsets {
  readonly startOffset: number;
  readonly changes: readonly { readonly atMs: number; readonly offset: number }[];
}

// Per zone and year, found once by sampling every SAMPLE_MS and bisecting to the minute where
// the offset differs. Since 1970 no zone has changed its offset twice within four days (from
// memory of the IANA tz database: the closest pairs are Ramadan suspensions of DST, weeks
// apart), so no change is missed.
const SAMPLE_MS = 4 * DAY_MS;
const yearCache = new Map<string, Map<number, YearOffsets>>();
let cachedYears = 0;

function yearOffsets(zone: string, year: number): YearOffsets {
  let years = yearCache.get(zone);
  if (!years) {
    if (cachedYears > 20_000) {
      // Bound the memory garbage input could make us spend.
      yearCache.clear();
      cachedYears = 0;
    }
    years = new Map();
    yearCache.set(zone, years);
  }
  const hit = years.get(year);
  if (hit) return hit;
  const start = Date.UTC(year, 0, 1);
  const end = Date.UTC(year + 1, 0, 1);
  const startOffset = exactOffsetMinutes(zone, start);
  const changes: { atMs: number; offset: number }[] = [];
  let prevT = start;
  let prev = startOffset;
  for (let t = Math.min(start + SAMPLE_MS, end); ; t = Math.min(t + SAMPLE_MS, end)) {
    const cur = exactOffsetMinutes(zone, t);
    if (cur !== prev) {
      let lo = prevT;
      let hi = t;
      while (hi - lo > MINUTE_MS) {
        const mid = lo + Math.floor((hi - lo) / 2 / MINUTE_MS) * MINUTE_MS;
        if (exactOffsetMinutes(zone, mid) === prev) lo = mid;
        else hi = mid;
      }
      // A change at the very start of next year belongs to next year's table.
      if (hi < end) changes.push({ atMs: hi, offset: cur });
      prev = cur;
    }
    prevT = t;
    if (t >= end) break;
  }
  const entry = { startOffset, changes };
  years.set(year, entry);
  cachedYears++;
  return entry;
}

// Start of each year 1900-2200 in UTC ms, so finding an instant's year allocates nothing.
const YEAR_STARTS = Array.from({ length: 302 }, (_, i) => Date.UTC(1900 + i, 0, 1));

function utcYear(ms: number): number {
  let i = Math.min(301, Math.max(0, Math.floor((ms - MIN_MS) / 31_556_952_000)));
  while (i > 0 && ms < (YEAR_STARTS[i] ?? -Infinity)) i--;
  while (i < 300 && ms >= (YEAR_STARTS[i + 1] ?? Infinity)) i++;
  return 1900 + i;
}

/**
 * UTC offset in minutes of `zone` at the instant `utcMs` (east of Greenwich positive).
 *
 * Returns NaN for an unknown zone or an instant outside 1900-2199.
 * @example offsetMinutesAt('America/New_York', Date.UTC(2026, 6, 1)) // returns -240
 */
export function offsetMinutesAt(zone: string, utcMs: number): number {
  if (!Number.isFinite(utcMs) || utcMs < MIN_MS || utcMs >= MAX_MS || !isValidZone(zone)) return NaN;
  const { startOffset, changes } = yearOffsets(zone, utcYear(utcMs));
  let offset = startOffset;
  for (const c of changes) {
    if (utcMs < c.atMs) break;
    offset = c.offset;
  }
  return offset;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

function isLeapYear(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

/** Days from 1970-01-01 to a proleptic Gregorian date (H. Hinnant's days_from_civil). */
export function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Milliseconds of a wall time read as if it were UTC: the zone-free "local timeline". NaN if it is not a real date and time. */
export function wallTimeMs(w: WallTime): number {
  const { year, month, day, hour, minute } = w;
  if (!Number.isInteger(year) || !Number.isInteger(month) || !Number.isInteger(day) || !Number.isInteger(hour) || !Number.isInteger(minute)) return NaN;
  if (month < 1 || month > 12 || day < 1 || hour < 0 || hour > 23 || minute < 0 || minute > 59) return NaN;
  const monthDays = month === 2 && isLeapYear(year) ? 29 : (DAYS_IN_MONTH[month - 1] ?? 0);
  if (day > monthDays) return NaN;
  return daysFromCivil(year, month, day) * DAY_MS + hour * 3_600_000 + minute * MINUTE_MS;
}

/** The calendar fields of a UTC millisecond count (H. Hinnant's civil_from_days). */
export function fieldsOfMs(ms: number): WallTime & { second: number } {
  const days = Math.floor(ms / DAY_MS);
  const rest = ms - days * DAY_MS;
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  const year = yoe + era * 400 + (month <= 2 ? 1 : 0);
  return { year, month, day, hour: Math.floor(rest / 3_600_000), minute: Math.floor((rest % 3_600_000) / MINUTE_MS), second: Math.floor((rest % MINUTE_MS) / 1000) };
}

/**
 * Resolves a local wall time in `zone` to its instant(s), reporting DST gaps and overlaps.
 *
 * Independent of the process time zone. Returns { kind: 'invalid' } for an unknown zone, an
 * impossible calendar date (31 April), or a year outside 1900-2199.
 * @example resolveLocalTime('America/New_York', { year: 2026, month: 3, day: 8, hour: 2, minute: 30 }).kind // returns 'gap'
 */
export function resolveLocalTime(zone: string, wall: WallTime): LocalResolution {
  if (!isValidZone(zone)) return { kind: 'invalid', reason: `unknown time zone '${zone}'` };
  const wallMs = wallTimeMs(wall);
  if (!Number.isFinite(wallMs)) return { kind: 'invalid', reason: 'not a real calendar date and time' };
  if (wallMs < MIN_MS || wallMs >= MAX_MS) return { kind: 'invalid', reason: 'year outside 1900-2199' };

  // The instant lies within [wallMs − 14 h, wallMs + 12 h]: look for offset changes near it.
  const lo = Math.max(MIN_MS, wallMs - MAX_OFFSET_MS - 3_600_000);
  const hi = Math.min(MAX_MS - 1, wallMs + MAX_OFFSET_MS + 3_600_000);
  const before = offsetMinutesAt(zone, lo);
  if (Number.isNaN(before)) return { kind: 'invalid', reason: `no offset for time zone '${zone}'` };
  const near = offsetChangesBetween(zone, lo, hi);
  if (near.length === 0) return { kind: 'exact', utcMs: wallMs - before * MINUTE_MS, offsetMinutes: before };

  // A change is near: keep every offset in force around it that reproduces the wall time.
  const candidates = new Set<number>([before, ...near.map((t) => offsetMinutesAt(zone, t))]);
  const hits = [...candidates]
    .filter((c) => offsetMinutesAt(zone, wallMs - c * MINUTE_MS) === c)
    .map((c) => ({ utcMs: wallMs - c * MINUTE_MS, offsetMinutes: c }))
    .sort((x, y) => x.utcMs - y.utcMs);
  const [first, later] = hits;
  if (first && later) {
    return { kind: 'ambiguous', utcMs: first.utcMs, offsetMinutes: first.offsetMinutes, laterUtcMs: later.utcMs, laterOffsetMinutes: later.offsetMinutes };
  }
  if (first) return { kind: 'exact', ...first };
  // In a gap: clocks jumped from the offset before the change to the one after it.
  const afterOffsetMinutes = offsetMinutesAt(zone, near[near.length - 1] ?? hi);
  return { kind: 'gap', beforeOffsetMinutes: before, afterOffsetMinutes, shiftedUtcMs: wallMs - before * MINUTE_MS };
}

/** The wall time in `zone` at the instant `utcMs`; null for an unknown zone or a non-finite instant. */
export function wallTimeAt(zone: string, utcMs: number): WallTime | null {
  const offset = offsetMinutesAt(zone, utcMs);
  if (!Number.isFinite(offset)) return null;
  const f = fieldsOfMs(utcMs + offset * MINUTE_MS);
  return { year: f.year, month: f.month, day: f.day, hour: f.hour, minute: f.minute };
}

const pad2 = (n: number): string => (n < 10 ? '0' + n : String(n));

/** `YYYY-MM-DDTHH:MM`, the form every local time takes in Layline's output. */
export function formatWallTime(w: WallTime): string {
  return `${String(w.year).padStart(4, '0')}-${pad2(w.month)}-${pad2(w.day)}T${pad2(w.hour)}:${pad2(w.minute)}`;
}

/** ISO 8601 in UTC with `Z`, to the second: `2026-03-08T12:05:00Z`. */
export function formatUtc(utcMs: number): string {
  if (!Number.isFinite(utcMs)) return 'Invalid Date';
  const f = fieldsOfMs(utcMs);
  return `${String(f.year).padStart(4, '0')}-${pad2(f.month)}-${pad2(f.day)}T${pad2(f.hour)}:${pad2(f.minute)}:${pad2(f.second)}Z`;
}

/** An offset as `UTC−05:00`, for messages. */
export function formatOffset(offsetMinutes: number): string {
  const sign = offsetMinutes < 0 ? '−' : '+';
  const abs = Math.abs(offsetMinutes);
  return `UTC${sign}${pad2(Math.floor(abs / 60))}:${pad2(abs % 60)}`;
}

/**
 * The instants in (fromMs, toMs] at which `zone` changes its UTC offset, found to the minute.
 *
 * Empty for an unknown zone, an empty or non-finite range, or a range over 400 days.
 */
export function offsetChangesBetween(zone: string, fromMs: number, toMs: number): number[] {
  if (!(toMs > fromMs) || toMs - fromMs > 400 * DAY_MS || fromMs < MIN_MS || toMs >= MAX_MS || !isValidZone(zone)) return [];
  const changes: number[] = [];
  for (let year = utcYear(fromMs); year <= utcYear(toMs); year++) {
    for (const c of yearOffsets(zone, year).changes) if (c.atMs > fromMs && c.atMs <= toMs) changes.push(c.atMs);
  }
  return changes;
}
