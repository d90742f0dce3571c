// Reads flight legs from an iCalendar file (RFC 5545) with ical.js, one VEVENT at a time so a
// broken event costs only itself. Airports come from SUMMARY, LOCATION or DESCRIPTION; times
// from DTSTART/DTEND (UTC, TZID with an IANA name or the file's own VTIMEZONE, or floating).
import ICAL from 'ical.js';
import { findAirport, type Airport } from '../time/airports';
import { formatOffset, formatUtc, formatWallTime, isValidZone, offsetMinutesAt, resolveLocalTime, wallTimeAt, type WallTime } from '../time/zones';
import { excerpt, type InputLine } from './input-lines';
import { FLIGHT_RE } from './free-text';
import { checkDuration, instantOrProblem, LineProblems, lookUpAirport, normaliseFlight, type ReadLeg } from './normalise-leg';

export interface IcsRead {
  readonly legs: ReadLeg[];
  readonly problems: LineProblems[];
  readonly contextLines: number[];
}

interface Block {
  readonly name: string;
  readonly startLine: InputLine;
  /** Physical line numbers the block spans (non-blank ones). */
  readonly lines: number[];
  readonly text: string;
  readonly closed: boolean;
}

/** Unfolds content lines (RFC 5545 §3.1: a line break followed by a space or tab continues the line). */
function logicalLines(lines: readonly InputLine[]): { first: InputLine; numbers: number[]; text: string }[] {
  const out: { first: InputLine; numbers: number[]; text: string }[] = [];
  for (const line of lines) {
    const prev = out[out.length - 1];
    if (prev && (line.text.startsWith(' ') || line.text.startsWith('\t'))) {
      prev.text += line.text.slice(1);
      prev.numbers.push(line.number);
    } else if (line.text.trim() !== '') out.push({ first: line, numbers: [line.number], text: line.text });
  }
  return out;
}

/** Splits the file into its top-level components inside VCALENDAR. */
function topLevelBlocks(lines: readonly InputLine[], structure: number[], stray: { first: InputLine; numbers: number[] }[]): Block[] {
  const blocks: Block[] = [];
  let current: { name: string; startLine: InputLine; lines: number[]; text: string[]; depth: number } | null = null;
  for (const l of logicalLines(lines)) {
    const begin = /^BEGIN:([A-Z-]+)\s*$/i.exec(l.text);
    const end = /^END:([A-Z-]+)\s*$/i.exec(l.text);
    if (!current) {
      if (begin?.[1] && begin[1].toUpperCase() !== 'VCALENDAR') {
        current = { name: begin[1].toUpperCase(), startLine: l.first, lines: [...l.numbers], text: [l.text], depth: 1 };
      } else if (/^[A-Za-z0-9-]+[;:]/.test(l.text)) structure.push(...l.numbers);
      else stray.push(l);
      continue;
    }
    current.lines.push(...l.numbers);
    current.text.push(l.text);
    if (begin) current.depth++;
    if (end) current.depth--;
    if (current.depth === 0) {
      blocks.push({ name: current.name, startLine: current.startLine, lines: current.lines, text: current.text.join('\r\n'), closed: true });
      current = null;
    }
  }
  if (current) blocks.push({ name: current.name, startLine: current.startLine, lines: current.lines, text: current.text.join('\r\n'), closed: false });
  return blocks;
}

/** The time zone definitions the file carries, by TZID. */
function fileTimezones(blocks: readonly Block[], problems: LineProblems[]): Map<string, ICAL.Timezone> {
  const zones = new Map<string, ICAL.Timezone>();
  for (const b of blocks) {
    if (b.name !== 'VTIMEZONE' || !b.closed) continue;
    try {
      const comp = new ICAL.Component(ICAL.parse(b.text));
      const tzid = comp.getFirstPropertyValue('tzid');
      if (typeof tzid === 'string') zones.set(tzid, new ICAL.Timezone({ component: comp, tzid }));
    } catch (err) {
      const p = new LineProblems(b.startLine.number, b.startLine.text);
      p.warn('ics-bad-timezone', `VTIMEZONE could not be read (${err instanceof Error ? err.message : String(err)}); events using it fall back to its name`);
      problems.push(p);
    }
  }
  return zones;
}

/** Known airport codes in a text, in order of appearance. */
function airportCodes(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/(?<![A-Za-z0-9])[A-Z]{3}(?![A-Za-z0-9])/g)) if (findAirport(m[0]) && !out.includes(m[0])) out.push(m[0]);
  return out;
}

/** Departure and arrival airports from the event's texts (see module comment). */
function eventAirports(summary: string, location: string, description: string): [string, string] | null {
  const s = airportCodes(summary);
  if (s.length >= 2) return [s[0] ?? '', s[1] ?? ''];
  const l = airportCodes(location);
  const [only] = s;
  if (only !== undefined) {
    // "Flight to JFK" with LOCATION "London Heathrow (LHR)": the location is where it leaves from.
    const from = l.find((c) => c !== only);
    if (from) return [from, only];
  }
  if (l.length >= 2) return [l[0] ?? '', l[1] ?? ''];
  const d = airportCodes(description);
  if (d.length >= 2) return [d[0] ?? '', d[1] ?? ''];
  return null;
}

const BOOKING_RE = /\b(?:booking|confirmation|record locator|pnr|reservation)(?:\s*(?:ref(?:erence)?|code|number|no\.?))?\s*[:#]?\s*([A-Z0-9]{5,8})\b/i;

interface EventTime {
  readonly wall: WallTime;
  readonly kind: 'utc' | 'zoned' | 'floating' | 'date';
  readonly tzid: string;
  readonly second: number;
}

function eventTime(prop: ICAL.Property | null): EventTime | null {
  if (!prop) return null;
  const value = prop.getFirstValue();
  if (!(value instanceof ICAL.Time)) return null;
  const wall = { year: value.year, month: value.month, day: value.day, hour: value.hour, minute: value.minute };
  const second = value.second;
  if (value.isDate) return { wall, kind: 'date', tzid: '', second: 0 };
  const tzid = prop.getParameter('tzid');
  if (typeof tzid === 'string' && tzid !== '') return { wall, kind: 'zoned', tzid, second };
  if (value.zone?.tzid === 'UTC') return { wall, kind: 'utc', tzid: 'UTC', second };
  return { wall, kind: 'floating', tzid: '', second };
}

/** An IANA name at the end of a vendor TZID such as "/mozilla.org/20050126_1/America/New_York". */
function ianaSuffix(tzid: string): string | null {
  const m = /([A-Za-z]+\/[A-Za-z_+-]+(?:\/[A-Za-z_+-]+)?)$/.exec(tzid);
  return m?.[1] && isValidZone(m[1]) ? m[1] : null;
}

/** The instant of an event time; reports gaps, overlaps, unknown zones and zone disagreements. */
function eventInstant(t: EventTime, airport: Airport, what: string, zones: Map<string, ICAL.Timezone>, p: LineProblems): number | null {
  const secondsMs = t.second * 1000;
  if (t.kind === 'utc') return Date.UTC(t.wall.year, t.wall.month - 1, t.wall.day, t.wall.hour, t.wall.minute) + secondsMs;
  if (t.kind === 'floating') {
    p.warn('ics-floating-time', `${what} ${formatWallTime(t.wall)} has no time zone; read as local time at ${airport.iata} (${airport.zone})`);
    const r = resolveLocalTime(airport.zone, t.wall);
    const ms = instantOrProblem(r, t.wall, airport.zone, what, p);
    return ms === null ? null : ms + secondsMs;
  }
  let utcMs: number | null;
  let zoneName = t.tzid;
  const iana = isValidZone(t.tzid) ? t.tzid : null;
  const custom = zones.get(t.tzid);
  if (iana) {
    utcMs = instantOrProblem(resolveLocalTime(iana, t.wall), t.wall, iana, what, p);
  } else if (custom) {
    // The file's own VTIMEZONE rules decide, as RFC 5545 §3.2.19 says TZID refers to them.
    const time = ICAL.Time.fromData({ ...t.wall, second: 0, isDate: false }, custom);
    utcMs = Date.UTC(t.wall.year, t.wall.month - 1, t.wall.day, t.wall.hour, t.wall.minute) - custom.utcOffset(time) * 1000;
  } else {
    const suffix = ianaSuffix(t.tzid);
    if (!suffix) {
      p.error('ics-unknown-zone', `${what} uses TZID '${excerpt(t.tzid, 40)}', which is neither an IANA zone nor defined in the file`);
      return null;
    }
    zoneName = suffix;
    utcMs = instantOrProblem(resolveLocalTime(suffix, t.wall), t.wall, suffix, what, p);
  }
  if (utcMs === null) return null;
  utcMs += secondsMs;
  const eventOffset = Math.round((Date.UTC(t.wall.year, t.wall.month - 1, t.wall.day, t.wall.hour, t.wall.minute) + secondsMs - utcMs) / 60_000);
  const airportOffset = offsetMinutesAt(airport.zone, utcMs);
  if (eventOffset !== airportOffset) {
    const local = wallTimeAt(airport.zone, utcMs);
    p.warn(
      'ics-zone-mismatch',
      `${what} is written in ${zoneName} (${formatOffset(eventOffset)}), but ${airport.iata} is in ${airport.zone} (${formatOffset(airportOffset)}); kept the instant ${formatUtc(utcMs)}, which is ${local ? formatWallTime(local) : '?'} at ${airport.iata}`,
    );
  }
  return utcMs;
}

function readEvent(b: Block, zones: Map<string, ICAL.Timezone>, calendarName: string, p: LineProblems): ReadLeg | null {
  if (!b.closed) {
    p.error('ics-unterminated', `BEGIN:${b.name} has no END:${b.name}`);
    return null;
  }
  let comp: ICAL.Component;
  try {
    comp = new ICAL.Component(ICAL.parse(b.text));
  } catch (err) {
    p.error('ics-unreadable', `event could not be read: ${err instanceof Error ? excerpt(err.message, 120) : String(err)}`);
    return null;
  }
  const text = (name: string) => {
    const v = comp.getFirstPropertyValue(name);
    return typeof v === 'string' ? v : '';
  };
  const summary = text('summary');
  const location = text('location');
  const description = text('description');
  const flightMatch = FLIGHT_RE.exec(summary) ?? FLIGHT_RE.exec(description);
  const codes = eventAirports(summary, location, description);
  if (!codes) {
    if (flightMatch) p.error('ics-missing-airports', `event '${excerpt(summary, 50)}' names flight ${flightMatch[1]}${flightMatch[2]} but not two known airport codes in SUMMARY, LOCATION or DESCRIPTION`);
    else p.warn('ics-not-a-flight', `event '${excerpt(summary, 50)}' has no flight number or airport codes; ignored`);
    return null;
  }
  if (comp.getFirstProperty('rrule')) p.warn('ics-recurrence-ignored', 'the event repeats (RRULE); only its first occurrence is read');
  const from = lookUpAirport(codes[0], 'departure', p);
  const to = lookUpAirport(codes[1], 'arrival', p);
  if (!from || !to) return null;

  const start = eventTime(comp.getFirstProperty('dtstart'));
  const end = eventTime(comp.getFirstProperty('dtend'));
  let durationMs = 0;
  if (!end) {
    const duration = comp.getFirstPropertyValue('duration');
    if (duration instanceof ICAL.Duration) durationMs = duration.toSeconds() * 1000;
  }
  if (!start) {
    p.error('ics-missing-time', 'the event has no DTSTART');
    return null;
  }
  if (start.kind === 'date' || end?.kind === 'date') {
    p.error('ics-all-day', 'the event is an all-day event; a flight needs departure and arrival times');
    return null;
  }
  const departUtcMs = eventInstant(start, from, `departure at ${from.iata}`, zones, p);
  if (departUtcMs === null) return null;
  let arriveUtcMs: number | null;
  if (end) arriveUtcMs = eventInstant(end, to, `arrival at ${to.iata}`, zones, p);
  else if (durationMs > 0) arriveUtcMs = departUtcMs + durationMs;
  else {
    p.error('ics-missing-time', 'the event has neither DTEND nor a DURATION');
    return null;
  }
  if (arriveUtcMs === null) return null;
  if (!checkDuration(departUtcMs, arriveUtcMs, p)) return null;
  const departWall = wallTimeAt(from.zone, departUtcMs);
  const arriveWall = wallTimeAt(to.zone, arriveUtcMs);
  if (!departWall || !arriveWall) return null;

  const attendees = comp.getAllProperties('attendee');
  const cn = attendees.length === 1 ? attendees[0]?.getParameter('cn') : undefined;
  const booking = BOOKING_RE.exec(description)?.[1] ?? '';
  return {
    leg: {
      flight: flightMatch ? normaliseFlight(`${flightMatch[1]}${flightMatch[2]}`) : '',
      from: from.iata,
      to: to.iata,
      departLocal: formatWallTime(departWall),
      arriveLocal: formatWallTime(arriveWall),
      departUtc: formatUtc(departUtcMs),
      arriveUtc: formatUtc(arriveUtcMs),
      fromZone: from.zone,
      toZone: to.zone,
      line: b.startLine.number,
      booking,
      departUtcMs,
      arriveUtcMs,
    },
    traveler: typeof cn === 'string' ? cn : '',
    trip: calendarName,
    option: '',
    deadline: '',
    text: b.startLine.text,
  };
}

/** Reads an iCalendar file. Never throws: each event becomes a leg or problems on its BEGIN line. */
export function readICalendar(lines: readonly InputLine[]): IcsRead {
  const problems: LineProblems[] = [];
  const legs: ReadLeg[] = [];
  const contextLines: number[] = [];
  const stray: { first: InputLine; numbers: number[] }[] = [];
  const blocks = topLevelBlocks(lines, contextLines, stray);
  for (const { first, numbers } of stray) {
    const p = new LineProblems(first.number, first.text);
    p.warn('ics-unreadable-line', `not an iCalendar content line; ignored: '${excerpt(first.text)}'`);
    problems.push(p);
    contextLines.push(...numbers.slice(1));
  }
  const zones = fileTimezones(blocks, problems);
  const nameLine = lines.find((l) => /^X-WR-CALNAME[:;]/i.test(l.text));
  const calendarName = nameLine ? nameLine.text.replace(/^[^:]*:/, '').trim() : '';
  for (const b of blocks) {
    const p = new LineProblems(b.startLine.number, b.startLine.text);
    if (b.name === 'VTIMEZONE') {
      contextLines.push(...b.lines);
      continue;
    }
    if (b.name !== 'VEVENT') {
      p.warn('ics-not-an-event', `${b.name} component ignored; only VEVENT entries can be flights`);
      problems.push(p);
      contextLines.push(...b.lines.filter((n) => n !== b.startLine.number));
      continue;
    }
    const leg = readEvent(b, zones, calendarName, p);
    if (leg) legs.push(leg);
    if (p.list.length) problems.push(p);
    contextLines.push(...b.lines.filter((n) => n !== b.startLine.number));
  }
  return { legs, problems, contextLines };
}
