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

// Offsets at 00:00 UTC of each day, per zone. Since 1970 no zone has changed its offset twice
// within one day (IANA tz database), so when a day's start and the next day's start agree the
// whole day has that offset, and most lookups are one Map hit instead of an Intl call.
const dayStartOffsets = new Map<string, Map<number, number>>();
let cachedDays = 0;

function offsetAtDayStart(zone: string, dayIndex: number): number {
  let days = dayStartOffsets.get(zone);
  if (!days) {
    days = new Map();
    dayStartOffsets.set(zone, days);
  }
  let offset = days.get(dayIndex);
  if (offset === undefined) {
    if (cachedDays > 500_000) {
      // Bound the memory garbage input could make us spend.
      dayStartOffsets.clear();
      cachedDays = 0;
      days = new Map();
      dayStartOffsets.set(zone, days);
    }
    offset = exactOffsetMinutes(zone, dayIndex * DAY_MS);
    days.set(dayIndex, offset);
    cachedDays++;
  }
  return offset;
}

/**
 * UTC offset in minutes of `zone` at the instant `utcMs` (east of Greenwich positive).
 *
 * Returns NaN for an unknown zone or an instant outside 1900-2199.
 * @example offsetMinutesAt('America/New_York', Date.UTC(2026, 6, 1)) // returns -240
 */
export function offsetMinutesAt(zone: string, utcMs: number): number {
  if (!Number.isFinite(utcMs) || utcMs < MIN_MS || utcMs >= MAX_MS || !isValidZone(zone)) return NaN;
  const day = Math.floor(utcMs / DAY_MS);
  const start = offsetAtDayStart(zone, day);
  return start === offsetAtDayStart(zone, day + 1) ? start : exactOffsetMinutes(zone, utcMs);
}

/** Milliseconds of a wall time read as if it were UTC: the zone-free "local timeline". */
export function wallTimeMs(w: WallTime): number {
  if (![w.year, w.month, w.day, w.hour, w.minute].every(Number.isInteger)) return NaN;
  const ms = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute);
  // Date.UTC rolls 31 February over into March; a wall time must name a real calendar day.
  const d = new Date(ms);
  if (d.getUTCFullYear() !== w.year || d.getUTCMonth() !== w.month - 1 || d.getUTCDate() !== w.day || w.hour > 23 || w.minute > 59 || w.hour < 0 || w.minute < 0) return NaN;
  return ms;
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

  // The instant lies within ±14 h of wallMs, so inside [day − 1, day + 2) in UTC days.
  const day = Math.floor(wallMs / DAY_MS);
  const o = [offsetAtDayStart(zone, day - 1), offsetAtDayStart(zone, day), offsetAtDayStart(zone, day + 1), offsetAtDayStart(zone, day + 2)];
  if (o.some(Number.isNaN)) return { kind: 'invalid', reason: `no offset for time zone '${zone}'` };
  if (o[0] === o[1] && o[1] === o[2] && o[2] === o[3]) {
    const offsetMinutes = o[0] ?? 0;
    return { kind: 'exact', utcMs: wallMs - offsetMinutes * MINUTE_MS, offsetMinutes };
  }

  // A transition is near: try every offset seen around it, and keep those that reproduce the wall time.
  const candidates = new Set<number>(o);
  for (const c of [...candidates]) candidates.add(offsetMinutesAt(zone, wallMs - c * MINUTE_MS));
  const hits = [...candidates]
    .filter((c) => Number.isFinite(c) && offsetMinutesAt(zone, wallMs - c * MINUTE_MS) === c)
    .map((c) => ({ utcMs: wallMs - c * MINUTE_MS, offsetMinutes: c }))
    .sort((a, b) => a.utcMs - b.utcMs);
  const [first, later] = hits;
  if (first && later) {
    return { kind: 'ambiguous', utcMs: first.utcMs, offsetMinutes: first.offsetMinutes, laterUtcMs: later.utcMs, laterOffsetMinutes: later.offsetMinutes };
  }
  if (first) return { kind: 'exact', ...first };
  // In a gap: the offset before it is the one in force MAX_OFFSET_MS before the wall time.
  const beforeOffsetMinutes = offsetMinutesAt(zone, wallMs - MAX_OFFSET_MS);
  const afterOffsetMinutes = offsetMinutesAt(zone, wallMs + MAX_OFFSET_MS);
  return { kind: 'gap', beforeOffsetMinutes, afterOffsetMinutes, shiftedUtcMs: wallMs - beforeOffsetMinutes * MINUTE_MS };
}

/** The wall time in `zone` at the instant `utcMs`; null for an unknown zone or a non-finite instant. */
export function wallTimeAt(zone: string, utcMs: number): WallTime | null {
  const offset = offsetMinutesAt(zone, utcMs);
  if (!Number.isFinite(offset)) return null;
  const d = new Date(utcMs + offset * MINUTE_MS);
  return { year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate(), hour: d.getUTCHours(), minute: d.getUTCMinutes() };
}

const pad2 = (n: number) => String(n).padStart(2, '0');

/** `YYYY-MM-DDTHH:MM`, the form every local time takes in Layline's output. */
export function formatWallTime(w: WallTime): string {
  return `${String(w.year).padStart(4, '0')}-${pad2(w.month)}-${pad2(w.day)}T${pad2(w.hour)}:${pad2(w.minute)}`;
}

/** ISO 8601 in UTC with `Z`, to the second: `2026-03-08T12:05:00Z`. */
export function formatUtc(utcMs: number): string {
  return new Date(utcMs).toISOString().replace(/\.\d{3}Z$/, 'Z');
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
  if (!(toMs > fromMs) || toMs - fromMs > 400 * DAY_MS || !Number.isFinite(offsetMinutesAt(zone, fromMs)) || !Number.isFinite(offsetMinutesAt(zone, toMs))) return [];
  const changes: number[] = [];
  for (let day = Math.floor(fromMs / DAY_MS); day <= Math.floor(toMs / DAY_MS); day++) {
    const before = offsetAtDayStart(zone, day);
    if (before === offsetAtDayStart(zone, day + 1)) continue;
    // Bisect to the minute: the offset is `before` on [lo, change) and different from hi on.
    let lo = day * DAY_MS;
    let hi = lo + DAY_MS;
    while (hi - lo > MINUTE_MS) {
      const mid = lo + Math.floor((hi - lo) / 2 / MINUTE_MS) * MINUTE_MS;
      if (exactOffsetMinutes(zone, mid) === before) lo = mid;
      else hi = mid;
    }
    if (hi > fromMs && hi <= toMs) changes.push(hi);
  }
  return changes;
}
