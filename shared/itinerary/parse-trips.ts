// The one entry point for trip intake: detects the format (iCalendar, CSV/TSV with a header,
// or free text), reads legs, normalises them to instants and groups them into trips.
//
// Never throws. Every non-blank line ends up in a leg, in `problems`, or in `contextLines`.
import { readDelimited, matchHeader } from './delimited';
import { readFreeText } from './free-text';
import { groupTrips } from './group-trips';
import { readICalendar } from './icalendar';
import { excerpt, isBlank, splitLines, type InputLine } from './input-lines';
import { LineProblems, makeProblem, normaliseLocalLeg, type RawLeg, type ReadLeg } from './normalise-leg';
import type { ParsedTrips, Problem } from './types';

export interface ParseOptions {
  /** The file's name, when there is one: `.ics` picks iCalendar even without a leading BEGIN line. */
  readonly fileName?: string;
}

/** How far down a header row may stand (a title or notes above it are common in spreadsheets). */
const HEADER_SEARCH_LINES = 20;

type Format = ParsedTrips['format'];

function detect(lines: readonly InputLine[], fileName: string): { format: Format; headerIndex: number } {
  const firstIndex = lines.findIndex((l) => !isBlank(l.text));
  const first = lines[firstIndex];
  if (!first) return { format: 'empty', headerIndex: -1 };
  if (/^\s*BEGIN:VCALENDAR\s*$/i.test(first.text) || (/\.(ics|ical|ifb|icalendar)$/i.test(fileName) && lines.some((l) => /^BEGIN:VEVENT\s*$/i.test(l.text)))) {
    return { format: 'ics', headerIndex: -1 };
  }
  let seen = 0;
  for (let i = firstIndex; i < lines.length && seen < HEADER_SEARCH_LINES; i++) {
    const l = lines[i];
    if (!l || isBlank(l.text)) continue;
    seen++;
    const header = matchHeader(l.text);
    if (header) return { format: header.delimiter === '\t' ? 'tsv' : 'csv', headerIndex: i };
  }
  return { format: 'text', headerIndex: -1 };
}

function normaliseAll(entries: readonly { raw: RawLeg; problems: LineProblems }[], problems: Problem[]): ReadLeg[] {
  const out: ReadLeg[] = [];
  for (const { raw, problems: p } of entries) {
    try {
      const leg = normaliseLocalLeg(raw, p);
      if (leg) out.push({ leg, traveler: raw.traveler, trip: raw.trip, option: raw.option, deadline: raw.deadline, text: raw.text });
    } catch (err) {
      p.error('internal-error', `this line could not be read (${err instanceof Error ? err.message : String(err)}); please report it`);
    }
    problems.push(...p.list);
  }
  return out;
}

function byLine(a: Problem, b: Problem): number {
  return a.line - b.line;
}

/**
 * Parses pasted or imported trips.
 *
 * @example parseTrips('flight,from,depart,to,arrive\nBA117,LHR,2026-03-08 08:25,JFK,11:05').trips[0]?.legs[0]?.arriveUtc // returns '2026-03-08T16:05:00Z'
 */
export function parseTrips(text: string, options: ParseOptions = {}): ParsedTrips {
  const input = typeof text === 'string' ? text : '';
  try {
    return parseUnguarded(input, options);
  } catch (err) {
    // A bug must not lose the user's input: report every non-blank line so nothing is silently dropped.
    const reason = err instanceof Error ? err.message : String(err);
    const problems: Problem[] = [makeProblem(0, 'error', 'internal-error', `the input could not be read (${reason}); please report it`)];
    for (const l of splitLines(input)) if (!isBlank(l.text)) problems.push(makeProblem(l.number, 'error', 'not-read', 'not read because of the error above', excerpt(l.text, 200)));
    return { format: 'text', trips: [], problems, contextLines: [] };
  }
}

function parseUnguarded(text: string, options: ParseOptions): ParsedTrips {
  const lines = splitLines(text);
  const { format, headerIndex } = detect(lines, options.fileName ?? '');
  const problems: Problem[] = [];
  const contextLines: number[] = [];
  let legs: ReadLeg[] = [];

  if (format === 'empty') {
    problems.push(makeProblem(0, 'error', 'empty-input', 'the input is empty: paste trips as a table with a header row, as lines from an itinerary e-mail, or as an iCalendar file'));
    return { format, trips: [], problems, contextLines };
  }
  if (format === 'ics') {
    const read = readICalendar(lines);
    legs = read.legs;
    for (const p of read.problems) problems.push(...p.list);
    contextLines.push(...read.contextLines);
  } else if (format === 'csv' || format === 'tsv') {
    // Lines above the header are read as free text, so a leg there is not lost either.
    const before = readFreeText(lines.slice(0, headerIndex));
    const header = matchHeader(lines[headerIndex]?.text ?? '');
    const table = header ? readDelimited(lines, headerIndex, header) : { legs: [], problems: [], contextLines: [] };
    for (const p of [...before.problems, ...table.problems]) problems.push(...p.list);
    contextLines.push(...before.contextLines, ...table.contextLines);
    legs = normaliseAll([...before.legs, ...table.legs], problems);
  } else {
    const read = readFreeText(lines);
    for (const p of read.problems) problems.push(...p.list);
    contextLines.push(...read.contextLines);
    legs = normaliseAll(read.legs, problems);
  }

  const trips = groupTrips(legs, problems);
  if (trips.length === 0) {
    problems.push(makeProblem(0, 'error', 'no-legs', `no flight legs could be read (read as ${formatName(format)}); see the problems on each line`));
  }
  problems.sort(byLine);
  contextLines.sort((a, b) => a - b);
  return { format, trips, problems, contextLines: [...new Set(contextLines)] };
}

function formatName(format: Format): string {
  return { csv: 'CSV', tsv: 'tab-separated table', text: 'free text', ics: 'iCalendar', empty: 'empty input' }[format];
}
