import { describe, expect, it } from 'vitest';
import { summariseGroup, topConnections } from '../../../shared/risk/group-summary';
import { scoreTrips } from '../../../shared/risk/score-trips';
import type { TripSimulation } from '../../../shared/risk/trip-simulation';
import { groupTrips } from '../../fixtures/risk/group-trips';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';
import { makeTrip, parsedOf, testCountryOf, type LegSpec } from '../../fixtures/risk/trips';

const ordDenSfo: LegSpec[] = [
  { flight: 'UA100', from: 'ORD', to: 'DEN', depart: '2026-03-08T14:00', arrive: '2026-03-08T16:40' },
  { flight: 'UA200', from: 'DEN', to: 'SFO', depart: '2026-03-08T17:10', arrive: '2026-03-08T19:40' },
];
const sfoDenOrd: LegSpec[] = [
  { flight: 'UA300', from: 'SFO', to: 'DEN', depart: '2026-03-12T08:00', arrive: '2026-03-12T11:30' },
  { flight: 'UA400', from: 'DEN', to: 'ORD', depart: '2026-03-12T12:15', arrive: '2026-03-12T15:40' },
];

// Reference: the count of travellers who miss at least one connection, recounted simulation by
// simulation from the trips' own miss rows (an OR over each traveller's chosen trips).
function naiveCounts(travellers: readonly (readonly TripSimulation[])[], simulations: number): number[] {
  return Array.from({ length: simulations }, (_, i) => travellers.filter((sims) => sims.some((s) => s.missed[i] === 1)).length);
}

describe('summariseGroup', () => {
  it('counts travellers sharing one simulated trip, and a traveller with two trips once, as a naive recount does', () => {
    // Three people on the same flights (one shared simulation), one of them also flying home.
    const parsed = parsedOf([
      makeTrip('Ana Quill', 'summit', 'A', ordDenSfo),
      makeTrip('Bo Marsh', 'summit', 'A', ordDenSfo),
      makeTrip('Cy Vance', 'summit', 'A', ordDenSfo),
      makeTrip('Cy Vance', 'home', 'A', sfoDenOrd),
    ]);
    const simulations = 500;
    const scored = scoreTrips(parsed, syntheticSource(), { countryOf: testCountryOf, simulations, seed: 3 });
    expect(scored.trips).toHaveLength(4);
    // Miss rows of our own making, different for each trip, so the count is known exactly.
    const rows: TripSimulation[] = scored.trips.map((_, k) => ({
      simulations,
      missed: Uint8Array.from({ length: simulations }, (__, i) => ((i * (k + 3)) % 7 < 2 ? 1 : 0)),
      meanArrivalDelay: 0,
      arrivalDelayP50: 0,
      arrivalDelayP90: 0,
      pWithin15: 1,
      pByDeadline: null,
    }));
    // Ana and Bo share one result object, as identical trips do in the simulation.
    rows[1] = rows[0]!;
    const group = summariseGroup(scored.trips, rows, simulations);
    const counts = naiveCounts([[rows[0]!], [rows[1]!], [rows[2]!, rows[3]!]], simulations);
    expect(group.travelers).toBe(3);
    expect(group.expectedMisconnecting).toBeCloseTo(counts.reduce((a, b) => a + b, 0) / simulations, 12);
    const distribution = [0, 1, 2, 3].map((c) => counts.filter((x) => x === c).length / simulations);
    group.countDistribution.forEach((p, c) => expect(p).toBeCloseTo(distribution[c] ?? 0, 12));
    expect(group.countDistribution.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });
});

describe('topConnections', () => {
  it('lists the flight pairs with the most expected misses, as a naive recount does, with or without flight numbers given', () => {
    const scored = scoreTrips(groupTrips(60), syntheticSource(), { countryOf: testCountryOf, simulations: 300, seed: 5 });
    const best = scored.trips.filter((t) => t.optionRank === 1);
    // Reference: distinct travellers per pair of flights (number, local date, route), times P(miss).
    const pairs = new Map<string, { who: Set<string>; pMiss: number; airport: string }>();
    for (const trip of best) {
      for (const c of trip.connections) {
        if (!c.scored) continue;
        const a = trip.legs[c.inboundLeg]!;
        const b = trip.legs[c.inboundLeg + 1]!;
        const key = [a.flight, a.departLocal.slice(0, 10), a.from, a.to, b.flight, b.departLocal.slice(0, 10), b.from, b.to].join('|');
        const entry = pairs.get(key) ?? { who: new Set<string>(), pMiss: 1 - c.pMake!, airport: c.airport };
        entry.who.add(trip.traveler || trip.id);
        pairs.set(key, entry);
      }
    }
    const expected = [...pairs.values()].map((e) => e.who.size * e.pMiss).sort((x, y) => y - x).slice(0, 10);
    const own = topConnections(best);
    expect(own.map((c) => c.expectedMisses)).toEqual(expected);
    expect(own).toEqual(scored.group.topConnections);
    expect(own.length).toBe(Math.min(10, pairs.size));
    expect(topConnections([])).toEqual([]);
  });
});
