// Turns one leg as read from the input (codes and local wall times as text) into a Leg with
// airports, zones and absolute instants, or into problems naming its line. Never throws.
//
// Rules: departure is local time at `from`, arrival local time at `to`; a missing arrival date
// is the one that makes the flight last more than 0 and under 20 hours, if exactly one does.
import { findAirport, suggestAirports, type Airport } from '../time/airports';
import { formatOffset, formatUtc, formatWallTime, offsetMinutesAt, resolveLocalTime, wallTimeMs, type LocalResolution, type WallTime } from '../time/zones';
import { excerpt, MAX_LINE_LENGTH, type InputLine } from './input-lines';
import { addDays, parseLocalDateTime, type CalendarDate, type ClockTime } from './local-time';
import type { Leg, Problem, Severity } from './types';

/** One leg as the input spelled it, with the grouping fields that are not part of a Leg. */
export interface RawLeg {
  readonly line: number;
  readonly text: string;
  readonly traveler: string;
  readonly trip: string;
  readonly option: string;
  readonly flight: string;
  readonly booking: string;
  readonly from: string;
  readonly to: string;
  readonly depart: string;
  readonly arrive: string;
  /** Date used when `depart` has none (free text: the last date line above). */
  readonly contextDate: CalendarDate | null;
  readonly deadline: string;
}

/** A normalised leg with the fields that group it into a trip. */
export interface ReadLeg {
  readonly leg: Leg;
  readonly traveler: string;
  readonly trip: string;
  readonly option: string;
  readonly deadline: string;
  readonly text: string;
}

/** Shortest and longest plausible flight, in minutes (common practice, no source). */
export const MIN_FLIGHT_MINUTES = 15;
export const MAX_FLIGHT_MINUTES = 20 * 60;

export function makeProblem(line: number, severity: Severity, code: string, message: string, text?: string): Problem {
  return text === undefined ? { line, severity, code, message } : { line, severity, code, message, text };
}

/** Collects problems for one input line. */
export class LineProblems {
  readonly list: Problem[] = [];
  constructor(
    readonly line: number,
    readonly text: string,
  ) {}
  error(code: string, message: string): void {
    this.list.push(makeProblem(this.line, 'error', code, message, this.text));
  }
  warn(code: string, message: string): void {
    this.list.push(makeProblem(this.line, 'warning', code, message, this.text));
  }
  get hasError(): boolean {
    return this.list.some((p) => p.severity === 'error');
  }
}

/** An error for a line too long to read, or null when the line is fine (the message keeps only its start). */
export function tooLongLine(line: InputLine): LineProblems | null {
  if (line.text.length <= MAX_LINE_LENGTH) return null;
  const p = new LineProblems(line.number, excerpt(line.text, 200));
  p.error('line-too-long', `line is ${line.text.length} characters long; not read`);
  return p;
}

/** The airport for a code, or an error naming the line with close matches. */
export function lookUpAirport(code: string, role: 'departure' | 'arrival', problems: LineProblems): Airport | null {
  const trimmed = code.trim();
  if (trimmed === '') {
    problems.error('missing-airport', `no ${role} airport`);
    return null;
  }
  const airport = findAirport(trimmed);
  if (airport) return airport;
  if (!/^[A-Za-z]{3}$/.test(trimmed)) {
    const hint = suggestAirports(trimmed, 3);
    const tail = hint.length ? `; did you mean ${hint.map((a) => `${a.iata} (${a.name})`).join(', ')}?` : '';
    problems.error('invalid-airport', `${role} airport '${clip(trimmed)}' is not a three-letter IATA code${tail}`);
    return null;
  }
  const hint = suggestAirports(trimmed, 4);
  const tail = hint.length ? `; did you mean ${hint.map((a) => `${a.iata} (${a.name}, ${a.city})`).join(', ')}?` : '; no close match';
  problems.error('unknown-airport', `${role} airport '${trimmed.toUpperCase()}' is not in the airport table${tail}`);
  return null;
}

function clip(text: string, max = 40): string {
  return text.length > max ? text.slice(0, max - 1) + '…' : text;
}

function wall(date: CalendarDate, time: ClockTime): WallTime {
  return { year: date.year, month: date.month, day: date.day, hour: time.hour, minute: time.minute };
}

function hhmm(w: WallTime): string {
  return formatWallTime(w).slice(11);
}

/**
 * Reports a gap (error) or an overlap (warning) and returns the instant to use, or null.
 *
 * For an overlap the first occurrence is used, as RFC 5545 §3.3.5 does for iCalendar.
 */
export function instantOrProblem(r: LocalResolution, w: WallTime, zone: string, what: string, problems: LineProblems): number | null {
  switch (r.kind) {
    case 'exact':
      return r.utcMs;
    case 'ambiguous':
      problems.warn(
        'dst-ambiguous',
        `${what} ${formatWallTime(w)} happens twice in ${zone} (clocks go back): ${formatUtc(r.utcMs)} (${formatOffset(r.offsetMinutes)}) or ${formatUtc(r.laterUtcMs)} (${formatOffset(r.laterOffsetMinutes)}); used the first, ${formatUtc(r.utcMs)}`,
      );
      return r.utcMs;
    case 'gap':
      problems.error(
        'dst-gap',
        `${what} ${formatWallTime(w)} does not exist in ${zone}: clocks go forward from ${formatOffset(r.beforeOffsetMinutes)} to ${formatOffset(r.afterOffsetMinutes)} then; check the time (read with the earlier offset it would be ${formatUtc(r.shiftedUtcMs)})`,
      );
      return null;
    case 'invalid':
      problems.error('invalid-time', `${what} ${formatWallTime(w)}: ${r.reason}`);
      return null;
  }
}

/** Warns about a flight under 15 minutes or over 20 hours; errors when it arrives before it leaves. */
export function checkDuration(departUtcMs: number, arriveUtcMs: number, problems: LineProblems): boolean {
  const minutes = Math.round((arriveUtcMs - departUtcMs) / 60_000);
  if (minutes <= 0) {
    problems.error('arrives-before-departure', `the flight arrives ${formatUtc(arriveUtcMs)}, ${-minutes} min before it departs ${formatUtc(departUtcMs)} (both converted to UTC)`);
    return false;
  }
  if (minutes < MIN_FLIGHT_MINUTES || minutes > MAX_FLIGHT_MINUTES) {
    problems.warn('implausible-duration', `the flight lasts ${Math.floor(minutes / 60)} h ${minutes % 60} min; check the times (flights are expected to take ${MIN_FLIGHT_MINUTES} min to ${MAX_FLIGHT_MINUTES / 60} h)`);
  }
  return true;
}

/** Normalises a leg read from a table row or a free-text line. Problems go to `problems`. */
export function normaliseLocalLeg(raw: RawLeg, problems: LineProblems): Leg | null {
  const from = lookUpAirport(raw.from, 'departure', problems);
  const to = lookUpAirport(raw.to, 'arrival', problems);
  if (from && to && from.iata === to.iata) problems.error('same-airport', `the flight departs from and arrives at ${from.iata}`);

  const dep = parseLocalDateTime(raw.depart);
  const arr = parseLocalDateTime(raw.arrive);
  if (!dep.ok) problems.error(raw.depart.trim() === '' ? 'missing-time' : 'invalid-time', raw.depart.trim() === '' ? 'no departure time' : `departure: ${dep.message}`);
  if (!arr.ok) problems.error(raw.arrive.trim() === '' ? 'missing-time' : 'invalid-time', raw.arrive.trim() === '' ? 'no arrival time' : `arrival: ${arr.message}`);
  if (!dep.ok || !arr.ok) return null;
  if (dep.value.dayOffset !== null) {
    problems.error('invalid-time', `departure '${raw.depart.trim()}' has a day mark; only the arrival may carry +1/-1`);
    return null;
  }
  const departDate = dep.value.date ?? raw.contextDate;
  if (!departDate) {
    problems.error('missing-date', 'the departure has no date, and no date line stands above it');
    return null;
  }
  if (!from || !to || problems.hasError) return null;

  const departWall = wall(departDate, dep.value.time);
  const departUtcMs = instantOrProblem(resolveLocalTime(from.zone, departWall), departWall, from.zone, `departure at ${from.iata}`, problems);
  if (departUtcMs === null) return null;

  const arrived = resolveArrival(arr.value.date, arr.value.dayOffset, arr.value.time, departDate, departUtcMs, to, problems);
  if (!arrived) return null;
  if (!checkDuration(departUtcMs, arrived.utcMs, problems)) return null;
  return {
    flight: normaliseFlight(raw.flight),
    from: from.iata,
    to: to.iata,
    departLocal: formatWallTime(departWall),
    arriveLocal: formatWallTime(arrived.wall),
    departUtc: formatUtc(departUtcMs),
    arriveUtc: formatUtc(arrived.utcMs),
    fromZone: from.zone,
    toZone: to.zone,
    line: raw.line,
    booking: raw.booking.trim(),
    departUtcMs,
    arriveUtcMs: arrived.utcMs,
  };
}

function resolveArrival(
  date: CalendarDate | null,
  dayOffset: number | null,
  time: ClockTime,
  departDate: CalendarDate,
  departUtcMs: number,
  to: Airport,
  problems: LineProblems,
): { wall: WallTime; utcMs: number } | null {
  const what = `arrival at ${to.iata}`;
  if (date || dayOffset !== null) {
    const w = wall(date ?? addDays(departDate, dayOffset ?? 0), time);
    const utcMs = instantOrProblem(resolveLocalTime(to.zone, w), w, to.zone, what, problems);
    return utcMs === null ? null : { wall: w, utcMs };
  }
  // No date: try the departure date and its neighbours; keep those giving 0 < duration < 20 h.
  // The day before is a real case: eastbound over the date line (Tokyo → Honolulu).
  const fits: { wall: WallTime; utcMs: number; resolution: LocalResolution }[] = [];
  let gapSeen: { w: WallTime; r: LocalResolution } | null = null;
  // Offsets move by at most a few hours, so a day whose rough instant is far outside the window is skipped.
  const roughBase = wallTimeMs(wall(departDate, time)) - offsetMinutesAt(to.zone, departUtcMs) * 60_000;
  for (let offset = -1; offset <= 2; offset++) {
    const rough = roughBase + offset * 86_400_000;
    if (!(rough > departUtcMs - 6 * 3_600_000 && rough < departUtcMs + (MAX_FLIGHT_MINUTES + 6 * 60) * 60_000)) continue;
    const w = wall(addDays(departDate, offset), time);
    const r = resolveLocalTime(to.zone, w);
    const instants = r.kind === 'exact' ? [r.utcMs] : r.kind === 'ambiguous' ? [r.utcMs, r.laterUtcMs] : [];
    if (r.kind === 'gap') gapSeen = { w, r };
    const fit = instants.find((t) => t > departUtcMs && t - departUtcMs < MAX_FLIGHT_MINUTES * 60_000);
    if (fit !== undefined) fits.push({ wall: w, utcMs: fit, resolution: r });
  }
  if (fits.length === 1 && fits[0]) {
    const only = fits[0];
    if (only.resolution.kind === 'ambiguous') {
      // Both readings may fit; report the overlap and use the first that gives a positive duration.
      instantOrProblem(only.resolution, only.wall, to.zone, what, problems);
    }
    return { wall: only.wall, utcMs: only.utcMs };
  }
  if (fits.length === 0) {
    if (gapSeen) {
      instantOrProblem(gapSeen.r, gapSeen.w, to.zone, what, problems);
      return null;
    }
    problems.error('arrival-date-unresolved', `no arrival date makes the flight last under ${MAX_FLIGHT_MINUTES / 60} hours; give the arrival date (or +1/-1)`);
    return null;
  }
  const dates = fits.map((f) => formatWallTime(f.wall).slice(0, 10)).join(' or ');
  problems.error('arrival-date-ambiguous', `the arrival ${hhmm(fits[0]?.wall ?? wall(departDate, time))} could be on ${dates}; give the arrival date (or +1/-1)`);
  return null;
}

/** `ba 117` → `BA117`: airline designator and number without spaces (common practice, no source). */
export function normaliseFlight(flight: string): string {
  const m = /^\s*([A-Za-z0-9]{2}[A-Za-z]?)\s*-?\s*(\d{1,4}[A-Za-z]?)\s*$/.exec(flight);
  if (m && /[A-Za-z]/.test(m[1] ?? '')) return `${(m[1] ?? '').toUpperCase()}${(m[2] ?? '').toUpperCase()}`;
  return flight.trim().replace(/\s+/g, ' ');
}
