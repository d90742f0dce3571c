// The demo workspace, read by the real parser: clean, 20-40 travelers, and every case the
// demo promises (tight evening hub connection, options, DST change, self-transfer, shared flights).
import { describe, expect, it } from 'vitest';
import { DEMO_TRAVELER_COUNT, DEMO_TRIPS_TEXT, DEMO_WORKSPACE } from '../../../shared/demo/demo-workspace';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import { parseWorkspace, serializeWorkspace } from '../../../shared/workspace/format';

const parsed = parseTrips(DEMO_TRIPS_TEXT);

describe('the demo workspace', () => {
  it('parses without errors into 20 to 40 travelers', () => {
    expect(parsed.problems.filter((p) => p.severity === 'error')).toEqual([]);
    const travelers = new Set(parsed.trips.map((t) => t.traveler));
    expect(travelers.size).toBe(DEMO_TRAVELER_COUNT);
    expect(DEMO_TRAVELER_COUNT).toBeGreaterThanOrEqual(20);
    expect(DEMO_TRAVELER_COUNT).toBeLessThanOrEqual(40);
    // Every non-blank line but the header became a leg.
    const legLines = DEMO_TRIPS_TEXT.trim().split('\n').length - 1;
    expect(parsed.trips.reduce((n, t) => n + t.legs.length, 0)).toBe(legLines);
  });

  it('has a connection of at most 50 minutes between 17:00 and 21:00 local at ORD', () => {
    const tight = parsed.trips.flatMap((t) =>
      t.connections.filter((c) => {
        const hour = Number(t.legs[c.inboundLeg]?.arriveLocal.slice(11, 13));
        return c.airport === 'ORD' && c.layoverMinutes <= 50 && hour >= 17 && hour < 21;
      }),
    );
    expect(tight.length).toBeGreaterThan(0);
  });

  it('has a trip with two options, a DST change, separate tickets and shared flights', () => {
    const options = new Map<string, Set<string>>();
    for (const t of parsed.trips) options.set(`${t.traveler}/${t.trip}`, (options.get(`${t.traveler}/${t.trip}`) ?? new Set()).add(t.option));
    expect([...options.values()].some((o) => o.size === 2)).toBe(true);
    const flags = parsed.trips.flatMap((t) => t.connections.flatMap((c) => c.flags));
    // The parser reports a clock change as a connection flag or as a warning on the trip's line.
    expect([...flags, ...parsed.problems.map((p) => p.code)]).toContain('dst-change-during-trip');
    expect(flags).toContain('separate-tickets');
    const byFlight = new Map<string, Set<string>>();
    for (const t of parsed.trips) for (const l of t.legs) byFlight.set(`${l.flight}/${l.departUtc}`, (byFlight.get(`${l.flight}/${l.departUtc}`) ?? new Set()).add(t.traveler));
    expect(Math.max(...[...byFlight.values()].map((s) => s.size))).toBeGreaterThanOrEqual(5);
  });

  it('is a valid workspace', () => {
    expect(parseWorkspace(serializeWorkspace(DEMO_WORKSPACE, new Date())).content).toEqual(DEMO_WORKSPACE);
  });
});
