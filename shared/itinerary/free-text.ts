// Reads legs from lines copied out of itinerary e-mails: a flight number, two airport codes
// and two times per line, with the date on the line or on a date line above it.
//
// Lines like "Passenger: Ana Ortiz" or "Booking reference: QX7T2L" set the traveler, trip,
// option or booking for the legs below. Every other line is reported, never dropped.
import { findAirport } from '../time/airports';
import { formatWallTime } from '../time/zones';
import { excerpt, isBlank, type InputLine } from './input-lines';
import { findDates, findDatesWithoutYear, findTimes, type CalendarDate, type ClockTime, type Found } from './local-time';
import { LineProblems, tooLongLine, type RawLeg } from './normalise-leg';

/** Airline designator (two characters, at least one a letter) and flight number (IATA style, common practice). */
export const FLIGHT_RE = /(?<![A-Z0-9])((?:[A-Z][A-Z0-9]|[0-9][A-Z]))\s?(\d{1,4}[A-Z]?)(?![A-Z0-9:.])/;
const CODE_RE = /(?<![A-Za-z0-9])[A-Z]{3}(?![A-Za-z0-9])/g;
/** Upper-case words that look like airport codes in e-mails but are not meant as ones. */
const NOT_AIRPORTS = new Set(
  'MON TUE WED THU FRI SAT SUN JAN FEB MAR APR MAY JUN JUL AUG SEP OCT NOV DEC DEP ARR UTC GMT LOC ETA ETD STD STA VIA THE AND FOR NON TBA TBC PNR REF SEAT ECO BUS'.split(' '),
);
const DAY_MARK_RE = /(?:^|[\s(])([+\-−]\s?\d)(?:\s*days?)?\)?(?=\s|$|[,;])/i;

type ContextKey = 'traveler' | 'trip' | 'option' | 'booking';
const CONTEXT_RE =
  /^\s*(passenger|passenger name|traveler|traveller|name|trip|trip name|option|booking|booking ref|booking reference|booking code|pnr|record locator|confirmation|confirmation number|confirmation code|reservation code)\s*[:#]\s*(.{1,120}?)\s*$/i;
const OPTION_RE = /^\s*(?:option|alternative)\s+([A-Za-z0-9]{1,12})\s*:?\s*$/i;

function contextKey(word: string): ContextKey {
  const w = word.toLowerCase();
  if (w.startsWith('pass') || w.startsWith('trav') || w === 'name') return 'traveler';
  if (w.startsWith('trip')) return 'trip';
  if (w === 'option') return 'option';
  return 'booking';
}

export interface FreeTextRead {
  readonly legs: { raw: RawLeg; problems: LineProblems }[];
  readonly problems: LineProblems[];
  readonly contextLines: number[];
}

/** Blanks out [index, index + length) so later searches do not see it, keeping positions. */
function blank(text: string, spans: readonly { index: number; length: number }[]): string {
  let out = text;
  for (const s of spans) out = out.slice(0, s.index) + ' '.repeat(s.length) + out.slice(s.index + s.length);
  return out;
}

function dateText(d: CalendarDate): string {
  return formatWallTime({ ...d, hour: 0, minute: 0 }).slice(0, 10);
}

function timeText(t: ClockTime): string {
  return `${String(t.hour).padStart(2, '0')}:${String(t.minute).padStart(2, '0')}`;
}

export function readFreeText(lines: readonly InputLine[]): FreeTextRead {
  const legs: FreeTextRead['legs'] = [];
  const problems: LineProblems[] = [];
  const contextLines: number[] = [];
  const context: Record<ContextKey, string> = { traveler: '', trip: '', option: '', booking: '' };
  let contextDate: CalendarDate | null = null;
  /** The latest date read on any line, from which a date written without a year takes its year. */
  let latestDate: CalendarDate | null = null;

  for (const line of lines) {
    if (isBlank(line.text)) continue;
    const tooLong = tooLongLine(line);
    if (tooLong) {
      problems.push(tooLong);
      continue;
    }
    const p = new LineProblems(line.number, line.text);
    const text = line.text;

    const option = OPTION_RE.exec(text);
    if (option?.[1]) {
      context.option = option[1];
      contextLines.push(line.number);
      continue;
    }

    const fullDates = findDates(text);
    const dates: Found<CalendarDate>[] = fullDates.length ? fullDates : findDatesWithoutYear(text, latestDate);
    for (const d of dates) if (d.value.ok) latestDate = d.value.value;
    const times = findTimes(blank(text, dates));
    const withoutDatesTimes = blank(text, [...dates, ...times]);
    const flightMatch = FLIGHT_RE.exec(withoutDatesTimes);
    const rest = flightMatch ? blank(withoutDatesTimes, [{ index: flightMatch.index, length: flightMatch[0].length }]) : withoutDatesTimes;
    const codes = [...rest.matchAll(CODE_RE)].map((m) => m[0]).filter((c) => !NOT_AIRPORTS.has(c));
    const known = codes.filter((c) => findAirport(c));

    const kv = CONTEXT_RE.exec(text);
    if (kv?.[1] && kv[2] !== undefined && times.length === 0) {
      context[contextKey(kv[1])] = kv[2];
      contextLines.push(line.number);
      continue;
    }

    if (times.length === 0 && !flightMatch && dates.length > 0) {
      const [d] = dates;
      if (d && dates.length === 1 && d.value.ok) {
        contextDate = d.value.value;
        contextLines.push(line.number);
      } else if (d && !d.value.ok) {
        p.error('invalid-date', d.value.message);
        problems.push(p);
      } else {
        p.warn('ignored-line', `line has several dates but no flight; not read: '${excerpt(text)}'`);
        problems.push(p);
      }
      continue;
    }

    const airports = known.length >= 2 ? known.slice(0, 2) : codes.length === 2 ? codes : null;
    const looksLikeLeg = flightMatch !== null || known.length >= 2 || (times.length >= 2 && codes.length >= 1);
    if (!looksLikeLeg) {
      p.warn('ignored-line', `not a flight or a date; ignored: '${excerpt(text)}'`);
      problems.push(p);
      continue;
    }
    const found = `found ${[flightMatch ? `flight ${flightMatch[1]}${flightMatch[2]}` : 'no flight number', `${codes.length} airport code${codes.length === 1 ? '' : 's'}${codes.length ? ` (${codes.join(', ')})` : ''}`, `${times.length} time${times.length === 1 ? '' : 's'}`].join(', ')}`;
    if (!airports || times.length !== 2) {
      const need = !airports ? (codes.length > 2 ? 'exactly two airport codes, or two known ones' : 'two airport codes') : 'two times (departure and arrival)';
      p.error('incomplete-leg', `looks like a flight but needs ${need}; ${found}`);
      problems.push(p);
      continue;
    }
    if (known.length > 2) p.warn('extra-airports', `more than two airport codes (${known.join(', ')}); used ${airports.join(' → ')}`);
    const badTime = times.find((t) => !t.value.ok);
    if (badTime && !badTime.value.ok) {
      p.error('invalid-time', badTime.value.message);
      problems.push(p);
      continue;
    }
    const badDate = dates.find((d) => !d.value.ok);
    if (badDate && !badDate.value.ok) {
      p.error('invalid-date', badDate.value.message);
      problems.push(p);
      continue;
    }
    const okTimes = times.map((t) => (t.value.ok ? t.value.value : null));
    const okDates = dates.map((d) => (d.value.ok ? d.value.value : null));
    const [depTime, arrTime] = okTimes;
    const arrivalFound = times[1];
    if (!depTime || !arrTime || !arrivalFound) {
      p.error('incomplete-leg', `could not read both times; ${found}`);
      problems.push(p);
      continue;
    }
    const departDate = okDates[0] ?? null;
    const arriveDate = dates.length >= 2 ? (okDates[1] ?? null) : null;
    const afterArrival = withoutDatesTimes.slice(arrivalFound.index + arrivalFound.length);
    const dayMark = dates.length < 2 ? DAY_MARK_RE.exec(afterArrival) : null;
    const depart = departDate ? `${dateText(departDate)} ${timeText(depTime)}` : timeText(depTime);
    const arrive = arriveDate ? `${dateText(arriveDate)} ${timeText(arrTime)}` : `${timeText(arrTime)}${dayMark?.[1] ? ' ' + dayMark[1].replace(/\s/g, '') : ''}`;
    legs.push({
      raw: {
        line: line.number,
        text,
        traveler: context.traveler,
        trip: context.trip,
        option: context.option,
        flight: flightMatch ? `${flightMatch[1]}${flightMatch[2]}` : '',
        booking: context.booking,
        from: airports[0] ?? '',
        to: airports[1] ?? '',
        depart,
        arrive,
        contextDate,
        deadline: '',
      },
      problems: p,
    });
  }
  return { legs, problems, contextLines };
}
