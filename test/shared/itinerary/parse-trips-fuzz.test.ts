// Property test: random and hostile text never makes the parser throw, and every non-blank
// line is accounted for (a leg's line, a problem's line, or a context line). Seeded: reproducible.
import { describe, expect, it } from 'vitest';
import { createRng, type Rng } from '../../../shared/inference/rng';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import type { ParsedTrips } from '../../../shared/itinerary/types';

const FRAGMENTS = [
  'traveler,trip,option,flight,from,depart,to,arrive,booking,deadline',
  'Traveller\tFlight\tFrom\tDeparture\tTo\tArrival',
  'flight;from;depart;to;arrive',
  'BEGIN:VCALENDAR', 'END:VCALENDAR', 'BEGIN:VEVENT', 'END:VEVENT', 'BEGIN:VTIMEZONE', 'DTSTART;TZID=America/New_York:20260308T023000', 'DTEND:20260309T055500Z', 'SUMMARY:UA 901 SFO-FRA', ' folded',
  'UA 901', 'LH1166', 'SFO', 'FRA', 'JFK', 'LHR', 'HND', 'HNL', 'QQQ', 'JKF', 'xyz',
  '2026-03-08', '2026-11-01', '2026-02-30', '8 March 2026', 'Sunday, 8 March 2026', '03/08/2026', '20260308',
  '07:05', '7:05 PM', '01:30', '02:30', '24:00', '12:61', '+1', '-1', '+9', '(+1)',
  ',', ',,', '\t', ';', '"', '""', '"a,b"', '→', '-', ':', '#', 'Passenger:', 'Option B', 'Booking reference: QX7T2L',
  '\u0000', '\u202e', '\ufeff', '😀', 'ü', '\\', '\r', '$', '(?:', '.*', 'null', 'undefined', 'NaN', '__proto__', 'constructor',
];

function randomLine(rng: Rng): string {
  const kind = rng.int(4);
  if (kind === 0) {
    // Raw random code points, including controls and astral characters.
    let s = '';
    const n = rng.int(60);
    for (let i = 0; i < n; i++) s += String.fromCodePoint(rng.int(5) === 0 ? rng.int(0x1ffff) : 32 + rng.int(95));
    return s.replace(/[\n\r]/g, ' ');
  }
  const n = 1 + rng.int(kind === 3 ? 12 : 6);
  const parts: string[] = [];
  for (let i = 0; i < n; i++) parts.push(FRAGMENTS[rng.int(FRAGMENTS.length)] ?? '');
  const sep = [' ', ',', '\t', '', '  '][rng.int(5)] ?? ' ';
  return parts.join(sep);
}

function randomDocument(rng: Rng): string {
  const lines: string[] = [];
  const n = rng.int(40);
  for (let i = 0; i < n; i++) lines.push(rng.int(8) === 0 ? '' : randomLine(rng));
  const eol = ['\n', '\r\n', '\r'][rng.int(3)] ?? '\n';
  return lines.join(eol);
}

/** Line numbers that are neither a leg's, a problem's nor a context line. */
function unaccounted(text: string, parsed: ParsedTrips): number[] {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r\n|\r|\n/);
  const used = new Set<number>([...parsed.problems.map((p) => p.line), ...(parsed.contextLines ?? []), ...parsed.trips.flatMap((t) => t.legs.map((l) => l.line))]);
  return lines.flatMap((l, i) => (l.trim() !== '' && !used.has(i + 1) ? [i + 1] : []));
}

function checkInvariants(text: string, parsed: ParsedTrips): void {
  const missing = unaccounted(text, parsed);
  if (missing.length) throw new Error(`lines not accounted for: ${missing.join(', ')}\ninput: ${JSON.stringify(text).slice(0, 2000)}`);
  for (const p of parsed.problems) {
    expect(['error', 'warning']).toContain(p.severity);
    expect(p.code).toMatch(/^[a-z][a-z0-9-]*$/);
    expect(p.code).not.toBe('internal-error');
    expect(p.message.length).toBeGreaterThan(0);
  }
  for (const t of parsed.trips)
    for (const l of t.legs) {
      expect(l.departUtc).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ$/);
      expect(l.departLocal).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d$/);
      expect(l.arriveUtcMs).toBeGreaterThan(l.departUtcMs);
    }
  expect(() => JSON.stringify(parsed)).not.toThrow();
}

describe('parseTrips on hostile input', () => {
  it('never throws and accounts for every non-blank line (250 seeded random documents)', () => {
    const rng = createRng(20260308);
    for (let i = 0; i < 250; i++) {
      const text = randomDocument(rng);
      let parsed: ParsedTrips | undefined;
      expect(() => (parsed = parseTrips(text)), `document ${i}: ${JSON.stringify(text).slice(0, 500)}`).not.toThrow();
      if (parsed) checkInvariants(text, parsed);
    }
  });

  it('accounts for every line of a table whose rows are garbage', () => {
    const rng = createRng(7);
    for (let i = 0; i < 100; i++) {
      const text = ['traveler,trip,option,flight,from,depart,to,arrive,booking,deadline', ...Array.from({ length: 20 }, () => randomLine(rng))].join('\n');
      checkInvariants(text, parseTrips(text));
    }
  });

  it('accounts for every line of a calendar whose events are garbage', () => {
    const rng = createRng(11);
    for (let i = 0; i < 100; i++) {
      const body = Array.from({ length: 20 }, () => (rng.int(3) === 0 ? ['BEGIN:VEVENT', 'END:VEVENT'][rng.int(2)] ?? '' : randomLine(rng)));
      const text = ['BEGIN:VCALENDAR', ...body, 'END:VCALENDAR'].join('\r\n');
      checkInvariants(text, parseTrips(text));
    }
  });

  it('copes with a megabyte on one line and with 5,000 short garbage lines', () => {
    const rng = createRng(3);
    const oneLine = Array.from({ length: 100_000 }, () => randomLine(rng).slice(0, 10)).join(' ').replace(/[\r\n]/g, ' ');
    const big = parseTrips(oneLine);
    checkInvariants(oneLine, big);
    expect(big.problems.map((p) => p.code)).toContain('line-too-long');
    const many = Array.from({ length: 5_000 }, () => randomLine(rng).slice(0, 40)).join('\n');
    checkInvariants(many, parseTrips(many));
  });

  it('does not throw for input that is not a string at all', () => {
    // The IPC boundary validates types, but the parser must not trust its callers either.
    for (const bad of [undefined, null, 42, {}, []]) {
      expect(() => parseTrips(bad as unknown as string)).not.toThrow(); // cast: deliberately breaking the type
    }
  });
});
