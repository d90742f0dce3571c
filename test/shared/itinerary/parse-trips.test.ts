// Trip intake end to end: format detection, the three input formats, and trips with their
// connections. Expected instants are worked out by hand from the IANA tz rules named beside them.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import type { ParsedTrips, Trip } from '../../../shared/itinerary/types';

const fixture = (name: string) => readFileSync(path.join(__dirname, '..', '..', 'fixtures', 'itinerary', name), 'utf8');

function legsOf(trip: Trip | undefined) {
  return (trip?.legs ?? []).map((l) => `${l.flight} ${l.from} ${l.departLocal} ${l.departUtc} → ${l.to} ${l.arriveLocal} ${l.arriveUtc}`);
}

function codes(parsed: ParsedTrips) {
  return parsed.problems.map((p) => `${p.line} ${p.severity} ${p.code}`);
}

describe('CSV with a header row', () => {
  const parsed = parseTrips(fixture('trips.csv'), { fileName: 'trips.csv' });

  it('is detected as CSV and groups legs by traveler, trip and option', () => {
    expect(parsed.format).toBe('csv');
    expect(parsed.trips.map((t) => [t.traveler, t.trip, t.option, t.legs.length])).toEqual([
      ['Mira Castellanos', 'Lisbon summit', 'A', 2],
      ['Mira Castellanos', 'Lisbon summit', 'B', 2],
      ['Tomas Aberline', 'Kestrel offsite', '', 2],
    ]);
    expect(new Set(parsed.trips.map((t) => t.id)).size).toBe(3);
  });

  it('converts local times with each airport zone, after the US switch to PDT on 2026-03-08 (Energy Policy Act of 2005; IANA tz database)', () => {
    expect(legsOf(parsed.trips[0])).toEqual([
      'UA901 SFO 2026-03-08T19:05 2026-03-09T02:05:00Z → FRA 2026-03-09T15:05 2026-03-09T14:05:00Z',
      'LH1166 FRA 2026-03-09T17:10 2026-03-09T16:10:00Z → LIS 2026-03-09T19:05 2026-03-09T19:05:00Z',
    ]);
    expect(parsed.trips[0]?.connections).toEqual([{ airport: 'FRA', departAirport: 'FRA', inboundLeg: 0, layoverMinutes: 125, flags: [] }]);
    expect([parsed.trips[0]?.deadlineLocal, parsed.trips[0]?.deadlineUtc]).toEqual(['2026-03-10T09:00', '2026-03-10T09:00:00Z']);
  });

  it('reads 12-hour times, infers the arrival date, and flags an airport change on separate tickets', () => {
    expect(legsOf(parsed.trips[1])).toEqual([
      'BA286 SFO 2026-03-08T19:35 2026-03-09T02:35:00Z → LHR 2026-03-09T13:30 2026-03-09T13:30:00Z',
      'TP1351 LGW 2026-03-09T16:00 2026-03-09T16:00:00Z → LIS 2026-03-09T18:45 2026-03-09T18:45:00Z',
    ]);
    expect(parsed.trips[1]?.connections).toEqual([{ airport: 'LHR', departAirport: 'LGW', inboundLeg: 0, layoverMinutes: 150, flags: ['airport-change', 'separate-tickets'] }]);
  });

  it('handles an eastbound date-line crossing that arrives the day before (Asia/Tokyo +09, Pacific/Honolulu −10, IANA tz database)', () => {
    expect(legsOf(parsed.trips[2])).toEqual([
      'NH186 HND 2026-03-11T08:00 2026-03-10T23:00:00Z → HNL 2026-03-10T20:50 2026-03-11T06:50:00Z',
      'HA25 HNL 2026-03-11T07:00 2026-03-11T17:00:00Z → PHX 2026-03-11T15:40 2026-03-11T22:40:00Z',
    ]);
    expect(parsed.trips[2]?.connections).toEqual([{ airport: 'HNL', departAirport: 'HNL', inboundLeg: 0, layoverMinutes: 610, flags: ['overnight'] }]);
  });

  it('reports nothing for a clean file, and accounts for the header as context', () => {
    expect(parsed.problems).toEqual([]);
    expect(parsed.contextLines).toEqual([1]);
  });

  it('accepts an explicit -1 day mark the same as the inferred date', () => {
    const r = parseTrips('flight,from,depart,to,arrive\nNH 186,HND,2026-03-11 08:00,HNL,20:50 -1\n');
    expect(r.trips[0]?.legs[0]?.arriveUtc).toBe('2026-03-11T06:50:00Z');
  });

  it('accepts semicolons (European spreadsheet CSV) and quoted cells with commas and doubled quotes (RFC 4180)', () => {
    const r = parseTrips('Passenger;Flight;From;Depart;To;Arrive\n"Halloran, Inez";"LH ""400""";FRA;2026-06-01 13:10;JFK;15:50\n');
    expect(r.format).toBe('csv');
    expect(r.trips[0]?.traveler).toBe('Halloran, Inez');
    expect(r.trips[0]?.legs[0]?.flight).toBe('LH "400"');
    expect(r.trips[0]?.legs[0]?.arriveUtc).toBe('2026-06-01T19:50:00Z');
  });
});

describe('quoted cells over several lines (RFC 4180)', () => {
  it('reads a row whose cell holds a line break, and accounts for the continuation line', () => {
    const r = parseTrips('traveler,flight,from,depart,to,arrive\n"Ada\nLovelace",LH 400,FRA,2026-06-01 13:10,JFK,15:50\n');
    expect(r.trips[0]?.traveler).toBe('Ada\nLovelace');
    expect(r.trips[0]?.legs[0]?.line).toBe(2);
    expect(r.contextLines).toEqual([1, 3]);
  });

  it('reports a quote that never closes instead of swallowing the rest of the file', () => {
    const rows = ['traveler,flight,from,depart,to,arrive', '"Ada,LH 400,FRA,2026-06-01 13:10,JFK,15:50', ...Array.from({ length: 25 }, (_, i) => `Ben,LH ${410 + i},FRA,2026-06-${String(2 + i).padStart(2, '0')} 13:10,JFK,15:50`)];
    const r = parseTrips(rows.join('\n'));
    expect(codes(r)[0]).toBe('2 error unterminated-quote');
    expect(r.trips.flatMap((t) => t.legs).length).toBe(25);
  });
});

describe('TSV pasted from a spreadsheet', () => {
  const parsed = parseTrips(fixture('spreadsheet.tsv'));

  it('finds the header below a title row, with separate date and time columns', () => {
    expect(parsed.format).toBe('tsv');
    expect(parsed.trips).toHaveLength(1);
    expect(legsOf(parsed.trips[0])).toEqual([
      'B61123 BOS 2026-11-01T01:30 2026-11-01T05:30:00Z → JFK 2026-11-01T02:40 2026-11-01T07:40:00Z',
      'AA2401 JFK 2026-11-01T06:15 2026-11-01T11:15:00Z → ORD 2026-11-01T08:05 2026-11-01T14:05:00Z',
    ]);
    expect(parsed.trips[0]?.legs.map((l) => l.booking)).toEqual(['KW3P0Q', 'KW3P0Q']);
  });

  it('warns that 01:30 on 2026-11-01 happens twice in Boston, listing both instants (Energy Policy Act of 2005)', () => {
    const ambiguous = parsed.problems.find((p) => p.code === 'dst-ambiguous');
    expect(ambiguous).toMatchObject({ line: 4, severity: 'warning' });
    expect(ambiguous?.message).toContain('2026-11-01T05:30:00Z');
    expect(ambiguous?.message).toContain('2026-11-01T06:30:00Z');
    expect(ambiguous?.message).toMatch(/used the first/);
  });

  it('reports the title row as ignored, the unused Notes column, and the clock change during the trip', () => {
    expect(codes(parsed)).toEqual(['1 warning ignored-line', '3 warning unknown-column', '4 warning dst-ambiguous', '4 warning dst-change-during-trip']);
    expect(parsed.problems[0]?.text).toBe('Kestrel Works offsite\t\t\t\t\t\t');
    expect(parsed.contextLines).toEqual([3]);
  });
});

describe('free text from an itinerary e-mail', () => {
  const parsed = parseTrips(fixture('email.txt'));

  it('reads legs with the date from the line above and a +1 arrival', () => {
    expect(parsed.format).toBe('text');
    expect(parsed.trips).toHaveLength(1);
    expect(parsed.trips[0]?.traveler).toBe('Mira Castellanos');
    expect(legsOf(parsed.trips[0])).toEqual([
      'UA901 SFO 2026-03-08T19:05 2026-03-09T02:05:00Z → FRA 2026-03-09T15:05 2026-03-09T14:05:00Z',
      'LH1166 FRA 2026-03-09T17:10 2026-03-09T16:10:00Z → LIS 2026-03-09T19:05 2026-03-09T19:05:00Z',
    ]);
    expect(parsed.trips[0]?.legs.map((l) => l.booking)).toEqual(['QX7T2L', 'QX7T2L']);
  });

  it('reports every line that is neither a leg nor a date, and an incomplete leg as an error', () => {
    expect(codes(parsed)).toEqual(['1 warning ignored-line', '10 warning ignored-line', '11 error incomplete-leg', '12 warning ignored-line']);
    expect(parsed.problems.find((p) => p.line === 11)?.message).toMatch(/BA117.*LHR.*1 time/);
    expect(parsed.contextLines).toEqual([2, 3, 5, 7]);
  });

  it('reads a date on the leg line itself, in several written forms', () => {
    for (const line of ['UA 901 08MAR26 SFO 19:05 FRA 15:05+1', 'Sun 8 Mar 2026 UA901 SFO 7:05 PM - FRA 3:05 PM (+1)', 'March 8, 2026: UA 901 from SFO 19:05 to FRA 15:05 +1 day']) {
      const r = parseTrips(line);
      expect(legsOf(r.trips[0]), line).toEqual(['UA901 SFO 2026-03-08T19:05 2026-03-09T02:05:00Z → FRA 2026-03-09T15:05 2026-03-09T14:05:00Z']);
    }
  });

  it('takes the year of a date written without one (08MAR, 30 Dec) from the dates above, rolling into the next year', () => {
    const r = parseTrips('Sunday, 8 March 2026\nBA 117 | Mon 09MAR | LHR 08:25 → JFK 11:05\nLH 400 | 30 Dec | FRA 13:10 JFK 15:50\nAA 1 02 Jan JFK 09:00 LAX 12:15');
    expect(r.trips[0]?.legs.map((l) => `${l.flight} ${l.departLocal}`)).toEqual(['BA117 2026-03-09T08:25', 'LH400 2026-12-30T13:10', 'AA1 2027-01-02T09:00']);
  });

  it('asks for the year when a date without one has nothing above it', () => {
    const r = parseTrips('BA 117 09MAR LHR 08:25 JFK 11:05');
    expect(codes(r)).toEqual(['0 error no-legs', '1 error invalid-date']);
    expect(r.problems[1]?.message).toMatch(/'09MAR' has no year/);
  });

  it('refuses a numeric date whose day and month could be swapped', () => {
    const r = parseTrips('UA 901 03/08/2026 SFO 19:05 FRA 15:05 +1');
    expect(r.trips).toEqual([]);
    expect(codes(r)).toContain('1 error invalid-date');
  });
});

describe('iCalendar (RFC 5545)', () => {
  it('reads the RFC 5545 §4 example with TZID=America/New_York (1998-03-12 08:30 EST is 13:30 UTC)', () => {
    const r = parseTrips(fixture('rfc5545-tzid.ics'), { fileName: 'rfc5545-tzid.ics' });
    expect(r.format).toBe('ics');
    expect(legsOf(r.trips[0])).toEqual(['DL1234 JFK 1998-03-12T08:30 1998-03-12T13:30:00Z → BOS 1998-03-12T09:30 1998-03-12T14:30:00Z']);
    expect(r.trips[0]?.legs[0]?.line).toBe(19);
    expect(r.problems).toEqual([]);
  });

  it('reads UTC times (RFC 5545 §3.6.1) and reports an event that is not a flight', () => {
    const r = parseTrips(fixture('rfc5545-utc.ics'));
    expect(legsOf(r.trips[0])).toEqual(['BA287 LHR 1997-09-03T17:30 1997-09-03T16:30:00Z → SFO 1997-09-03T12:00 1997-09-03T19:00:00Z']);
    expect(codes(r)).toEqual(['13 warning ics-not-a-flight']);
  });

  it("uses the file's own VTIMEZONE for a vendor TZID and reports a DTEND written in another zone than the airport's", () => {
    const r = parseTrips(fixture('custom-zone.ics'));
    const trip = r.trips[0];
    expect([trip?.traveler, trip?.trip, trip?.legs[0]?.booking]).toEqual(['Tomas Aberline', 'Kestrel offsite', 'KW7Z3Q']);
    // 18:30 EDT (US DST began 2026-03-08) = 22:30Z; 07:30 Paris CET = 06:30Z = 06:30 at LHR (GMT).
    expect(legsOf(trip)).toEqual(['AA100 JFK 2026-03-10T18:30 2026-03-10T22:30:00Z → LHR 2026-03-11T06:30 2026-03-11T06:30:00Z']);
    expect(codes(r)).toEqual(['22 warning ics-zone-mismatch']);
    expect(r.problems[0]?.message).toMatch(/Europe\/Paris.*LHR.*Europe\/London/);
  });

  it('reports a departure in a DST gap given with TZID, and keeps the other events', () => {
    const ics = [
      'BEGIN:VCALENDAR',
      'VERSION:2.0',
      'BEGIN:VEVENT',
      'SUMMARY:UA 1 EWR-ORD',
      'DTSTART;TZID=America/New_York:20260308T023000',
      'DTEND;TZID=America/Chicago:20260308T050000',
      'END:VEVENT',
      'BEGIN:VEVENT',
      'SUMMARY:UA 2 ORD-EWR',
      'DTSTART;TZID=America/Chicago:20260309T080000',
      'DTEND;TZID=America/New_York:20260309T111000',
      'END:VEVENT',
      'END:VCALENDAR',
    ].join('\r\n');
    const r = parseTrips(ics);
    expect(codes(r)).toEqual(['3 error dst-gap']);
    expect(legsOf(r.trips[0])).toEqual(['UA2 ORD 2026-03-09T08:00 2026-03-09T13:00:00Z → EWR 2026-03-09T11:10 2026-03-09T15:10:00Z']);
  });

  it('reports a broken event on its BEGIN line and still reads the good one', () => {
    const ics = ['BEGIN:VCALENDAR', 'BEGIN:VEVENT', 'SUMMARY:LH 400 FRA-JFK', 'this is not a content line', 'END:VEVENT', 'BEGIN:VEVENT', 'SUMMARY:LH 401 JFK-FRA', 'DTSTART:20260601T220000Z', 'DTEND:20260602T053000Z', 'END:VEVENT', 'END:VCALENDAR'].join('\n');
    const r = parseTrips(ics);
    expect(codes(r)).toEqual(['2 error ics-unreadable']);
    expect(r.trips[0]?.legs.map((l) => l.flight)).toEqual(['LH401']);
  });
});

describe('iCalendar edge cases (RFC 5545)', () => {
  const cal = (...event: string[]) => ['BEGIN:VCALENDAR', 'VERSION:2.0', 'BEGIN:VEVENT', ...event, 'END:VEVENT', 'END:VCALENDAR'].join('\r\n');

  it('reads floating times as local time at each airport, with a warning (RFC 5545 §3.3.5 form #1)', () => {
    const r = parseTrips(cal('SUMMARY:AF 11 CDG-JFK', 'DTSTART:20260701T103000', 'DTEND:20260701T130000'));
    expect(legsOf(r.trips[0])).toEqual(['AF11 CDG 2026-07-01T10:30 2026-07-01T08:30:00Z → JFK 2026-07-01T13:00 2026-07-01T17:00:00Z']);
    expect(codes(r)).toEqual(['3 warning ics-floating-time', '3 warning ics-floating-time']);
  });

  it('takes the arrival from DURATION when DTEND is missing (RFC 5545 §3.8.2.5)', () => {
    const r = parseTrips(cal('SUMMARY:QF 1 SYD-SIN', 'DTSTART;TZID=Australia/Sydney:20260701T160000', 'DURATION:PT8H20M'));
    // 16:00 AEST = 06:00Z; + 8 h 20 min = 14:20Z = 22:20 in Singapore (+08).
    expect(legsOf(r.trips[0])).toEqual(['QF1 SYD 2026-07-01T16:00 2026-07-01T06:00:00Z → SIN 2026-07-01T22:20 2026-07-01T14:20:00Z']);
  });

  it('reads the airports from LOCATION when SUMMARY names only the destination', () => {
    const r = parseTrips(cal('SUMMARY:Flight to JFK (BA 117)', 'LOCATION:London Heathrow (LHR)', 'DTSTART:20260701T072500Z', 'DTEND:20260701T150500Z'));
    expect(r.trips[0]?.legs.map((l) => `${l.flight} ${l.from}-${l.to}`)).toEqual(['BA117 LHR-JFK']);
  });

  it('rejects all-day events and unknown TZIDs, naming the event line', () => {
    expect(codes(parseTrips(cal('SUMMARY:UA 1 EWR-ORD', 'DTSTART;VALUE=DATE:20260701', 'DTEND;VALUE=DATE:20260702')))).toContain('3 error ics-all-day');
    expect(codes(parseTrips(cal('SUMMARY:UA 1 EWR-ORD', 'DTSTART;TZID=Mars Standard Time:20260701T080000', 'DTEND:20260701T120000Z')))).toContain('3 error ics-unknown-zone');
  });

  it('reads a vendor TZID that ends in an IANA name', () => {
    const r = parseTrips(cal('SUMMARY:UA 1 EWR-ORD', 'DTSTART;TZID=/mozilla.org/20050126_1/America/New_York:20260701T080000', 'DTEND;TZID=America/Chicago:20260701T094500'));
    expect(r.trips[0]?.legs[0]?.departUtc).toBe('2026-07-01T12:00:00Z');
  });
});

describe('trips and connections', () => {
  const csv = (rows: string[]) => parseTrips(['traveler,flight,from,depart,to,arrive,booking', ...rows].join('\n'));

  it('orders legs by time whatever the input order, and a gap over 24 hours is a stopover', () => {
    const r = csv(['Ada,LH 401,JFK,2026-06-05 17:00,FRA,06:55 +1,', 'Ada,LH 400,FRA,2026-06-01 13:10,JFK,15:50,']);
    expect(r.trips[0]?.legs.map((l) => l.flight)).toEqual(['LH400', 'LH401']);
    expect(r.trips[0]?.connections[0]?.flags).toEqual(['stopover', 'overnight']);
    expect(r.trips[0]?.connections[0]?.layoverMinutes).toBe(4 * 1440 + 70);
  });

  it('flags a departure before the previous arrival as a negative layover, with an error naming both lines', () => {
    const r = csv(['Ada,LH 400,FRA,2026-06-01 13:10,JFK,15:50,', 'Ada,AA 1,JFK,2026-06-01 15:20,LAX,18:45,']);
    expect(r.trips[0]?.connections[0]).toMatchObject({ layoverMinutes: -30, flags: ['negative-layover'] });
    expect(codes(r)).toEqual(['3 error negative-layover']);
    expect(r.problems[0]?.message).toMatch(/line 2/);
  });

  it('flags a layover during which the connecting airport changes its clocks (Energy Policy Act of 2005)', () => {
    const r = csv(['Ada,AA 10,LAX,2026-10-31 16:00,JFK,2026-11-01 00:20,', 'Ada,AA 20,JFK,2026-11-01 06:00,BOS,07:15,']);
    const c = r.trips[0]?.connections[0];
    // 00:20 EDT = 04:20Z; 06:00 EST = 11:00Z: 400 minutes, not the 340 the clock faces suggest.
    expect(c?.layoverMinutes).toBe(400);
    expect(c?.flags).toContain('dst-change-during-trip');
  });

  it('counts a repeated leg once and says so', () => {
    const r = csv(['Ada,LH 400,FRA,2026-06-01 13:10,JFK,15:50,', 'Ada,LH 400,FRA,2026-06-01 13:10,JFK,15:50,']);
    expect(r.trips[0]?.legs).toHaveLength(1);
    expect(codes(r)).toEqual(['3 warning duplicate-leg']);
  });

  it('warns when the schedule arrives after the deadline', () => {
    const r = parseTrips('flight,from,depart,to,arrive,deadline\nLH 400,FRA,2026-06-01 13:10,JFK,15:50,15:00\n');
    expect(r.trips[0]?.deadlineLocal).toBe('2026-06-01T15:00');
    expect(codes(r)).toEqual(['2 warning deadline-before-arrival']);
  });
});

describe('errors that name the line', () => {
  const one = (row: string) => parseTrips(`flight,from,depart,to,arrive\n${row}\n`);

  it.each([
    ['XX 1,JKF,2026-06-01 10:00,BOS,11:10', 'unknown-airport', /JKF.*did you mean JFK/],
    ['XX 1,JFK,2026-06-01 10:00,JFK,11:10', 'same-airport', /JFK/],
    ['XX 1,JFK,2026-06-31 10:00,BOS,11:10', 'invalid-time', /not a real calendar date/],
    ['XX 1,JFK,2026-06-01 25:00,BOS,11:10', 'invalid-time', /not a clock time/],
    ['XX 1,JFK,10:00,BOS,11:10', 'missing-date', /no date/],
    ['XX 1,JFK,2026-06-01 10:00,BOS,', 'missing-time', /arrival/],
    ['XX 1,JFK,2026-06-01 10:00,BOS,2026-06-01 09:00', 'arrives-before-departure', /before it departs/],
    ['XX 1,JFK,2026-03-08 02:30,BOS,05:00', 'dst-gap', /does not exist in America\/New_York/],
    ['XX 1,JFK,2026-06-01 10:00,BOS,2026-06-01T11:10Z', 'invalid-time', /UTC offset/],
  ])('%s → %s', (row, code, message) => {
    const r = one(row);
    const p = r.problems.find((x) => x.line === 2);
    expect(p?.code).toBe(code);
    expect(p?.severity).toBe('error');
    expect(p?.message).toMatch(message);
    expect(p?.text).toBe(row);
    expect(r.problems[0]?.code).toBe('no-legs');
  });

  it('warns about an implausible duration but keeps the leg', () => {
    const r = one('XX 1,JFK,2026-06-01 10:00,BOS,10:05');
    expect(r.trips[0]?.legs).toHaveLength(1);
    expect(codes(r)).toEqual(['2 warning implausible-duration']);
  });

  it('warns about a 61-hour flight given with dates, and reports an arrival time alone that fits no day', () => {
    // SYD 10:00 AEST = 00:00Z; LAX 06:00 PDT two days later = 13:00Z.
    expect(codes(one('QF 11,SYD,2026-06-01 10:00,LAX,2026-06-03 06:00'))).toEqual(['2 warning implausible-duration']);
    // Same zone, 30 minutes earlier on the clock: −30 min or 23 h 30 min, neither plausible.
    const none = one('XX 1,BOS,2026-06-01 10:00,JFK,09:30');
    expect(codes(none)).toContain('2 error arrival-date-unresolved');
  });

  it('exits cleanly on empty input', () => {
    expect(parseTrips('')).toMatchObject({ format: 'empty', trips: [], problems: [{ line: 0, code: 'empty-input', severity: 'error' }] });
    expect(parseTrips(' \n\t\n').format).toBe('empty');
  });
});
