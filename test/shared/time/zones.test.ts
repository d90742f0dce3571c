// Wall time ↔ instant conversion against published DST rules. This file also runs under
// TZ=UTC, America/New_York and Australia/Sydney (vitest projects tz-*): results must not move.
import { describe, expect, it } from 'vitest';
import { formatUtc, formatWallTime, offsetChangesBetween, offsetMinutesAt, resolveLocalTime, wallTimeAt, type WallTime } from '../../../shared/time/zones';

const DAY = 86_400_000;
const w = (year: number, month: number, day: number, hour: number, minute: number): WallTime => ({ year, month, day, hour, minute });

/** Day of month of the n-th Sunday (n = -1: the last) of a month, by UTC calendar arithmetic. */
function sunday(year: number, month: number, n: number): number {
  if (n > 0) {
    const firstDow = new Date(Date.UTC(year, month - 1, 1)).getUTCDay();
    return 1 + ((7 - firstDow) % 7) + (n - 1) * 7;
  }
  const last = new Date(Date.UTC(year, month, 0));
  return last.getUTCDate() - last.getUTCDay();
}

function utcOf(zone: string, wall: WallTime): string {
  const r = resolveLocalTime(zone, wall);
  if (r.kind !== 'exact') throw new Error(`${zone} ${formatWallTime(wall)}: expected an exact time, got ${JSON.stringify(r)}`);
  return formatUtc(r.utcMs);
}

describe('US daylight saving time: second Sunday of March to first Sunday of November, 02:00 local (Energy Policy Act of 2005)', () => {
  const US_ZONES: [string, number][] = [
    ['America/New_York', -5],
    ['America/Chicago', -6],
    ['America/Denver', -7],
    ['America/Los_Angeles', -8],
  ];
  const years = Array.from({ length: 24 }, (_, i) => 2007 + i);

  it.each(US_ZONES)('%s changes offset exactly at those two instants, every year 2007-2030', (zone, standardHours) => {
    for (const year of years) {
      const start = Date.UTC(year, 2, sunday(year, 3, 2), 2 - standardHours); // 02:00 standard time
      const end = Date.UTC(year, 10, sunday(year, 11, 1), 2 - (standardHours + 1)); // 02:00 daylight time
      const found = offsetChangesBetween(zone, Date.UTC(year, 0, 1), Date.UTC(year, 11, 31));
      expect(found.map(formatUtc), `${zone} ${year}`).toEqual([formatUtc(start), formatUtc(end)]);
    }
  });

  it.each(US_ZONES)('%s: 02:30 on the second Sunday of March does not exist (dst-gap)', (zone, standardHours) => {
    for (const year of years) {
      const r = resolveLocalTime(zone, w(year, 3, sunday(year, 3, 2), 2, 30));
      expect(r.kind, `${zone} ${year}`).toBe('gap');
      if (r.kind === 'gap') {
        expect(r.beforeOffsetMinutes).toBe(standardHours * 60);
        expect(r.afterOffsetMinutes).toBe((standardHours + 1) * 60);
        // RFC 5545 §3.3.5: read with the offset before the gap, so 02:30 means 03:30 daylight time.
        expect(r.shiftedUtcMs).toBe(Date.UTC(year, 2, sunday(year, 3, 2), 2 - standardHours, 30));
      }
    }
  });

  it('01:59 and 03:00 around the New York gap are ordinary times one minute apart (Energy Policy Act of 2005)', () => {
    expect(utcOf('America/New_York', w(2026, 3, 8, 1, 59))).toBe('2026-03-08T06:59:00Z');
    expect(utcOf('America/New_York', w(2026, 3, 8, 3, 0))).toBe('2026-03-08T07:00:00Z');
    expect(resolveLocalTime('America/New_York', w(2026, 3, 8, 2, 0)).kind).toBe('gap');
  });

  it('01:30 on the first Sunday of November happens twice; the first (EDT) is used (RFC 5545 §3.3.5)', () => {
    const r = resolveLocalTime('America/New_York', w(2026, 11, 1, 1, 30));
    expect(r).toEqual({ kind: 'ambiguous', utcMs: Date.UTC(2026, 10, 1, 5, 30), offsetMinutes: -240, laterUtcMs: Date.UTC(2026, 10, 1, 6, 30), laterOffsetMinutes: -300 });
  });

  it('RFC 5545 §3.3.5 examples: 2007-11-04 01:30 New York is EDT; 2007-03-11 02:30 falls in the gap and reads as 03:30 EDT', () => {
    const overlap = resolveLocalTime('America/New_York', w(2007, 11, 4, 1, 30));
    expect(overlap.kind).toBe('ambiguous');
    expect(overlap.kind === 'ambiguous' && formatUtc(overlap.utcMs)).toBe('2007-11-04T05:30:00Z');
    const gap = resolveLocalTime('America/New_York', w(2007, 3, 11, 2, 30));
    expect(gap.kind === 'gap' && formatUtc(gap.shiftedUtcMs)).toBe('2007-03-11T07:30:00Z');
  });
});

describe('EU summer time: last Sunday of March to last Sunday of October, 01:00 UTC (Directive 2000/84/EC)', () => {
  const EU_ZONES = ['Europe/London', 'Europe/Lisbon', 'Europe/Paris', 'Europe/Berlin', 'Europe/Madrid', 'Europe/Athens', 'Europe/Helsinki', 'Europe/Dublin'];

  it.each(EU_ZONES)('%s changes at 01:00 UTC on both last Sundays, every year 2002-2030', (zone) => {
    for (let year = 2002; year <= 2030; year++) {
      const found = offsetChangesBetween(zone, Date.UTC(year, 0, 1), Date.UTC(year, 11, 31));
      expect(found.map(formatUtc), `${zone} ${year}`).toEqual([formatUtc(Date.UTC(year, 2, sunday(year, 3, -1), 1)), formatUtc(Date.UTC(year, 9, sunday(year, 10, -1), 1))]);
    }
  });

  it('Paris 02:30 on 2026-03-29 does not exist; 02:30 on 2026-10-25 happens twice', () => {
    expect(resolveLocalTime('Europe/Paris', w(2026, 3, 29, 2, 30)).kind).toBe('gap');
    const r = resolveLocalTime('Europe/Paris', w(2026, 10, 25, 2, 30));
    expect(r.kind).toBe('ambiguous');
    if (r.kind === 'ambiguous') {
      expect(formatUtc(r.utcMs)).toBe('2026-10-25T00:30:00Z');
      expect(formatUtc(r.laterUtcMs)).toBe('2026-10-25T01:30:00Z');
    }
  });

  it('London 01:30 on 2026-03-29 does not exist, 02:00 is BST', () => {
    expect(resolveLocalTime('Europe/London', w(2026, 3, 29, 1, 30)).kind).toBe('gap');
    expect(utcOf('Europe/London', w(2026, 3, 29, 2, 0))).toBe('2026-03-29T01:00:00Z');
  });
});

describe('zones without DST (IANA tz database)', () => {
  it.each([
    ['America/Phoenix', -420],
    ['Pacific/Honolulu', -600],
    ['Asia/Tokyo', 540],
    ['Asia/Kolkata', 330],
  ])('%s keeps one offset all year and has no gaps or overlaps', (zone, offset) => {
    expect(offsetChangesBetween(zone, Date.UTC(2026, 0, 1), Date.UTC(2026, 11, 31))).toEqual([]);
    for (let t = Date.UTC(2026, 0, 1); t < Date.UTC(2027, 0, 1); t += 7 * DAY) expect(offsetMinutesAt(zone, t)).toBe(offset);
    // The US switch days are ordinary days in Phoenix and Honolulu.
    expect(resolveLocalTime(zone, w(2026, 3, 8, 2, 30))).toEqual({ kind: 'exact', utcMs: Date.UTC(2026, 2, 8, 2, 30) - offset * 60_000, offsetMinutes: offset });
    expect(resolveLocalTime(zone, w(2026, 11, 1, 1, 30)).kind).toBe('exact');
  });
});

describe('southern hemisphere and half-hour rules (IANA tz database)', () => {
  it('Sydney: clocks go forward on the first Sunday of October and back on the first Sunday of April', () => {
    expect(resolveLocalTime('Australia/Sydney', w(2026, 10, 4, 2, 30)).kind).toBe('gap');
    const r = resolveLocalTime('Australia/Sydney', w(2026, 4, 5, 2, 30));
    expect(r.kind).toBe('ambiguous');
    expect(r.kind === 'ambiguous' && [formatUtc(r.utcMs), formatUtc(r.laterUtcMs)]).toEqual(['2026-04-04T15:30:00Z', '2026-04-04T16:30:00Z']);
  });

  it('Lord Howe Island moves its clocks by 30 minutes (from memory of the IANA rules for Australia/Lord_Howe)', () => {
    const changes = offsetChangesBetween('Australia/Lord_Howe', Date.UTC(2026, 0, 1), Date.UTC(2026, 11, 31));
    expect(changes).toHaveLength(2);
    const [a] = changes;
    expect(offsetMinutesAt('Australia/Lord_Howe', (a ?? 0) - 60_000) - offsetMinutesAt('Australia/Lord_Howe', a ?? 0)).toBe(30);
  });
});

describe('unusual transitions (IANA tz database; dates from memory of its Pacific/Apia and Africa/Casablanca rules)', () => {
  it('Samoa skipped the whole local day of 2011-12-30 when it crossed the date line', () => {
    expect(resolveLocalTime('Pacific/Apia', w(2011, 12, 30, 12, 0)).kind).toBe('gap');
    expect(resolveLocalTime('Pacific/Apia', w(2011, 12, 29, 23, 59))).toMatchObject({ kind: 'exact', offsetMinutes: -600 });
    expect(resolveLocalTime('Pacific/Apia', w(2011, 12, 31, 0, 0))).toMatchObject({ kind: 'exact', offsetMinutes: 840 });
  });

  it('Morocco sets its clocks back for Ramadan and forward after it, weeks apart', () => {
    const changes = offsetChangesBetween('Africa/Casablanca', Date.UTC(2026, 0, 1), Date.UTC(2026, 11, 31));
    expect(changes).toHaveLength(2);
    const [back, forward] = changes;
    expect(offsetMinutesAt('Africa/Casablanca', (back ?? 0) - 60_000) - offsetMinutesAt('Africa/Casablanca', back ?? 0)).toBe(60);
    expect(offsetMinutesAt('Africa/Casablanca', forward ?? 0) - offsetMinutesAt('Africa/Casablanca', (forward ?? 0) - 60_000)).toBe(60);
    expect((forward ?? 0) - (back ?? 0)).toBeGreaterThan(20 * DAY);
  });
});

describe('wall time at an instant', () => {
  it('converts an instant back to the local wall clock, across the date line (IANA tz database)', () => {
    const t = Date.UTC(2026, 2, 10, 12, 55);
    expect(formatWallTime(wallTimeAt('Asia/Tokyo', t) ?? w(0, 0, 0, 0, 0))).toBe('2026-03-10T21:55');
    expect(formatWallTime(wallTimeAt('Pacific/Honolulu', t) ?? w(0, 0, 0, 0, 0))).toBe('2026-03-10T02:55');
    expect(formatWallTime(wallTimeAt('Pacific/Kiritimati', t) ?? w(0, 0, 0, 0, 0))).toBe('2026-03-11T02:55');
  });

  it('round-trips every half hour of a year in New York and Sydney, except gap times', () => {
    for (const zone of ['America/New_York', 'Australia/Sydney']) {
      for (let t = Date.UTC(2026, 0, 1); t < Date.UTC(2027, 0, 1); t += 30 * 60_000) {
        const wall = wallTimeAt(zone, t);
        if (!wall) throw new Error('no wall time');
        const r = resolveLocalTime(zone, wall);
        const instants = r.kind === 'exact' ? [r.utcMs] : r.kind === 'ambiguous' ? [r.utcMs, r.laterUtcMs] : [];
        if (!instants.includes(t)) throw new Error(`${zone} ${formatUtc(t)} → ${formatWallTime(wall)} → ${JSON.stringify(r)}`);
      }
    }
  });
});

describe('invalid input', () => {
  it('rejects impossible dates, unknown zones and far-off years without throwing', () => {
    expect(resolveLocalTime('America/New_York', w(2026, 2, 30, 10, 0)).kind).toBe('invalid');
    expect(resolveLocalTime('America/New_York', w(2026, 4, 31, 10, 0)).kind).toBe('invalid');
    expect(resolveLocalTime('America/New_York', w(2026, 1, 1, 24, 0)).kind).toBe('invalid');
    expect(resolveLocalTime('America/New_York', w(2026, 1, 1, 10, 60)).kind).toBe('invalid');
    expect(resolveLocalTime('America/New_York', w(2026.5, 1, 1, 10, 0)).kind).toBe('invalid');
    expect(resolveLocalTime('Mars/Olympus_Mons', w(2026, 1, 1, 10, 0)).kind).toBe('invalid');
    expect(resolveLocalTime('Europe/Paris', w(99999, 1, 1, 10, 0)).kind).toBe('invalid');
    expect(offsetMinutesAt('Nowhere/Else', 0)).toBeNaN();
    expect(offsetMinutesAt('Europe/Paris', NaN)).toBeNaN();
    expect(wallTimeAt('Nowhere/Else', 0)).toBeNull();
  });
});
