// `layline parse <file|->`: reads trips and prints them, with every problem, as JSON.
//
// The JSON keeps to the documented shape (trips → legs, connections; problems); exit code 0
// when at least one leg was read, 1 when none, 2 for usage errors.
import path from 'node:path';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import type { ParsedTrips } from '../../../shared/itinerary/types';
import { parseFlags, type CliCommand } from '../command';
import { UsageError } from '../io';

const USAGE = `Usage: layline parse <file|->

Reads planned trips and prints them as JSON: every leg with its local and UTC times and zones,
every connection with its layover in minutes and flags, and every problem with its line number.

Input, detected from the content:
  a table with a header row (CSV, or TSV pasted from a spreadsheet) with columns
      traveler, trip, option, flight, from, depart, to, arrive, booking, deadline
  lines copied from itinerary e-mails (flight number, two airport codes, two times)
  an iCalendar file (.ics)

'-' reads standard input. Exit code: 0 when at least one leg was read, 1 when none, 2 for usage errors.
Layovers are computed from the schedule; they are not a prediction of delays.
`;

/** The printed shape: exactly the fields `layline parse` documents. */
export function parseOutput(parsed: ParsedTrips) {
  return {
    trips: parsed.trips.map((t) => ({
      id: t.id,
      traveler: t.traveler,
      trip: t.trip,
      option: t.option,
      legs: t.legs.map((l) => ({
        flight: l.flight,
        from: l.from,
        to: l.to,
        departLocal: l.departLocal,
        arriveLocal: l.arriveLocal,
        departUtc: l.departUtc,
        arriveUtc: l.arriveUtc,
        fromZone: l.fromZone,
        toZone: l.toZone,
        line: l.line,
      })),
      connections: t.connections.map((c) => ({ airport: c.airport, layoverMinutes: c.layoverMinutes, flags: [...c.flags] })),
    })),
    problems: parsed.problems.map((p) => ({ line: p.line, severity: p.severity, code: p.code, message: p.message })),
  };
}

export const parseCommand: CliCommand = {
  name: 'parse',
  summary: 'Read trips from CSV/TSV, e-mail text or iCalendar and print them as JSON',
  usage: USAGE,
  run: async (argv, io) => {
    const { positionals } = parseFlags(argv, {}, 'parse');
    if (positionals.length !== 1) throw new UsageError(positionals.length === 0 ? 'parse: give a file, or - for standard input' : `parse: one input at a time, got ${positionals.length}`);
    const source = positionals[0] ?? '-';
    const text = await io.readInput(source);
    const parsed = parseTrips(text, source === '-' ? {} : { fileName: path.basename(source) });
    io.stdout(JSON.stringify(parseOutput(parsed), null, 2) + '\n');
    const legs = parsed.trips.reduce((n, t) => n + t.legs.length, 0);
    const errors = parsed.problems.filter((p) => p.severity === 'error').length;
    const warnings = parsed.problems.length - errors;
    io.stderr(`read ${legs} leg${legs === 1 ? '' : 's'} in ${parsed.trips.length} trip${parsed.trips.length === 1 ? '' : 's'} (${parsed.format}); ${errors} error${errors === 1 ? '' : 's'}, ${warnings} warning${warnings === 1 ? '' : 's'}\n`);
    return legs > 0 ? 0 : 1;
  },
};
