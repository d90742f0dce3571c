import logistic from '@stdlib/stats-base-dists-logistic';
import { describe, expect, it } from 'vitest';
import { scoreTrips } from '../../../shared/risk/score-trips';
import type { ScoreOptions } from '../../../shared/risk/types';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';
import { makeTrip, parsedOf, testCountryOf, type LegSpec } from '../../fixtures/risk/trips';

const base: ScoreOptions = { countryOf: testCountryOf, simulations: 2000, seed: 5 };

const ordDenSfo: LegSpec[] = [
  { flight: 'UA100', from: 'ORD', to: 'DEN', depart: '2026-03-08T14:00', arrive: '2026-03-08T16:40' },
  { flight: 'UA200', from: 'DEN', to: 'SFO', depart: '2026-03-08T17:40', arrive: '2026-03-08T20:10' },
];

describe('scoreTrips', () => {
  it('gives a one-connection trip P(all connections) equal to that connection\'s P(make)', () => {
    const scored = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo)]), syntheticSource(), base);
    const trip = scored.trips[0]!;
    const c = trip.connections[0]!;
    expect(c.scored).toBe(true);
    expect(trip.pAllConnections).toBe(c.pMake);
    expect(trip.pAllConnectionsInterval).toEqual(c.pMakeInterval);
    expect(c.mctMinutes).toBe(45);
    expect(c.connectionType).toBe('domestic');
    expect(c.marginMinutes).toBe(c.layoverMinutes - c.minLayoverMinutes!);
  });

  // Reference: A - D ~ Logistic(muA - muD, beta) for Gumbels of equal scale (@stdlib/stats-base-dists-logistic).
  it('matches the logistic closed form for a route pair with fixed Gumbel parameters', () => {
    const source = syntheticSource({
      draws: 8,
      routes: {
        'ORD-DEN:arrival': { mu: 9, beta: 14 },
        'DEN-SFO:departure': { mu: 4, beta: 14 },
        'DEN-SFO:arrival': { mu: 0, beta: 10 },
      },
    });
    const c = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo)]), source, base).trips[0]!.connections[0]!;
    expect(Math.abs(c.pMake! - logistic.cdf(60 - 45, 9 - 4, 14))).toBeLessThan(2e-5);
  });

  it('multiplies connections per draw for a multi-connection trip and stays within each connection', () => {
    const legs: LegSpec[] = [...ordDenSfo, { flight: 'AS300', from: 'SFO', to: 'SEA', depart: '2026-03-08T21:10', arrive: '2026-03-08T23:20' }];
    const trip = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', legs)]), syntheticSource(), base).trips[0]!;
    const [c1, c2] = trip.connections;
    expect(trip.pAllConnections).toBeLessThanOrEqual(Math.min(c1!.pMake!, c2!.pMake!));
    expect(trip.pAllConnections).toBeGreaterThan(0);
  });

  it('produces byte-identical JSON for the same input and seed, and different draws for another seed', () => {
    const input = parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo), makeTrip('Ben Ortiz', 'summit', 'A', ordDenSfo)]);
    const a = JSON.stringify(scoreTrips(input, syntheticSource(), base));
    const b = JSON.stringify(scoreTrips(input, syntheticSource(), base));
    expect(a).toBe(b);
    const c = scoreTrips(input, syntheticSource(), { ...base, seed: 6 });
    expect(c.trips[0]!.expectedArrivalDelayMinutes).not.toBe(JSON.parse(a).trips[0].expectedArrivalDelayMinutes);
    expect(c.trips[0]!.pAllConnections).toBe(JSON.parse(a).trips[0].pAllConnections);
  });

  it('gives identical travellers on the same flights identical outcomes: they miss together', () => {
    const tight: LegSpec[] = [ordDenSfo[0]!, { ...ordDenSfo[1]!, depart: '2026-03-08T17:30' }];
    const input = parsedOf([makeTrip('Ana Quill', 'summit', 'A', tight), makeTrip('Ben Ortiz', 'summit', 'A', tight)]);
    const scored = scoreTrips(input, syntheticSource(), base);
    const [t1, t2] = scored.trips;
    expect(t1!.expectedArrivalDelayMinutes).toBe(t2!.expectedArrivalDelayMinutes);
    expect(t1!.pOnTime).toBe(t2!.pOnTime);
    const dist = scored.group.countDistribution;
    expect(dist).toHaveLength(3);
    expect(dist[1]).toBe(0);
    expect(dist.reduce((s, p) => s + p, 0)).toBeCloseTo(1, 12);
    // Both miss whenever one does: P(at least 2) = P(at least 1), far above independence's P(miss)^2.
    expect(scored.group.pAtLeast['2']).toBe(scored.group.pAtLeast['1']);
    const pMiss = 1 - t1!.connections[0]!.pMake!;
    expect(scored.group.pAtLeast['2']).toBeGreaterThan(pMiss * pMiss * 2);
    expect(Math.abs(scored.group.expectedMisconnecting - 2 * pMiss)).toBeLessThan(5 * scored.group.expectedMisconnectingStdError + 1e-9);
  });

  it('counts each traveller once and sums the count distribution to 1 for a mixed group', () => {
    const trips = [];
    for (let i = 0; i < 7; i++) {
      const shift = i % 3;
      trips.push(makeTrip(`Traveller ${i}`, 'summit', 'A', [ordDenSfo[0]!, { ...ordDenSfo[1]!, flight: `UA2${shift}0`, depart: `2026-03-08T17:${10 + 10 * shift}` }]));
    }
    const group = scoreTrips(parsedOf(trips), syntheticSource(), base).group;
    expect(group.travelers).toBe(7);
    expect(group.countDistribution).toHaveLength(8);
    expect(group.countDistribution.reduce((s, p) => s + p, 0)).toBeCloseTo(1, 12);
    expect(group.pAtLeast['1']).toBeGreaterThanOrEqual(group.pAtLeast['2']);
    expect(group.topConnections[0]!.expectedMisses).toBeGreaterThanOrEqual(group.topConnections[1]!.expectedMisses);
    expect(group.topConnections.reduce((s, c) => s + c.travelers, 0)).toBe(7);
  });

  it('adds rebook gaps to the arrival delay when a connection is certainly missed', () => {
    const source = syntheticSource({
      draws: 4,
      routes: {
        'ORD-DEN:arrival': { mu: 300, beta: 1 },
        'DEN-SFO:departure': { mu: 0, beta: 1 },
        'DEN-SFO:arrival': { mu: 0, beta: 1 },
      },
    });
    // Layover 60, MCT 45: the shortfall is about 300 - 15 = 285 minutes, so two 180-minute gaps.
    const trip = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo)]), source, base).trips[0]!;
    expect(trip.pAllConnections).toBeLessThan(1e-9);
    expect(trip.expectedArrivalDelayMinutes).toBeGreaterThan(360 - 3);
    expect(trip.expectedArrivalDelayMinutes).toBeLessThan(360 + 3);
    const perTrip = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo)]), source, { ...base, rebookGapByTrip: { 'Ana Quill/summit/A': 60 } }).trips[0]!;
    expect(perTrip.rebookGapMinutes).toBe(60);
    expect(perTrip.expectedArrivalDelayMinutes).toBeGreaterThan(300 - 3);
    expect(perTrip.expectedArrivalDelayMinutes).toBeLessThan(300 + 3);
  });

  it('gives P(arrive by deadline) only with a deadline, and uses it as the on-time basis', () => {
    const withDeadline = makeTrip('Ana Quill', 'summit', 'A', ordDenSfo, '2026-03-08T21:00');
    const without = makeTrip('Ben Ortiz', 'summit', 'A', ordDenSfo);
    const [a, b] = scoreTrips(parsedOf([withDeadline, without]), syntheticSource(), base).trips;
    expect(a!.pArriveByDeadline).not.toBeNull();
    expect(a!.onTimeBasis).toBe('deadline');
    expect(a!.pOnTime).toBe(a!.pArriveByDeadline);
    expect(b!.pArriveByDeadline).toBeNull();
    expect(b!.onTimeBasis).toBe('within-15-minutes');
  });

  it('ranks options and marks the Pareto-optimal ones', () => {
    const comfortable: LegSpec[] = [ordDenSfo[0]!, { ...ordDenSfo[1]!, flight: 'UA260', depart: '2026-03-08T19:00', arrive: '2026-03-08T21:30' }];
    const tight: LegSpec[] = [ordDenSfo[0]!, { ...ordDenSfo[1]!, flight: 'UA210', depart: '2026-03-08T17:05', arrive: '2026-03-08T19:35' }];
    const slowAndTight: LegSpec[] = [ordDenSfo[0]!, { ...ordDenSfo[1]!, flight: 'UA220', depart: '2026-03-08T17:05', arrive: '2026-03-08T20:35' }];
    const trips = scoreTrips(
      parsedOf([makeTrip('Ana Quill', 'summit', 'comfortable', comfortable), makeTrip('Ana Quill', 'summit', 'tight', tight), makeTrip('Ana Quill', 'summit', 'slow', slowAndTight)]),
      syntheticSource(),
      base,
    ).trips;
    for (const t of trips) expect(t.optionCount).toBe(3);
    expect(new Set(trips.map((t) => t.optionRank))).toEqual(new Set([1, 2, 3]));
    const byOption = Object.fromEntries(trips.map((t) => [t.option, t]));
    expect(byOption['tight']!.travelMinutes).toBeLessThan(byOption['comfortable']!.travelMinutes);
    // Something must be optimal; an option worse on all three criteria than another is not.
    expect(trips.some((t) => t.paretoOptimal)).toBe(true);
    for (const t of trips) {
      const beaten = trips.some((o) => o !== t && o.pOnTime >= t.pOnTime && o.expectedArrivalDelayMinutes <= t.expectedArrivalDelayMinutes && o.travelMinutes <= t.travelMinutes && (o.pOnTime > t.pOnTime || o.expectedArrivalDelayMinutes < t.expectedArrivalDelayMinutes || o.travelMinutes < t.travelMinutes));
      expect(t.paretoOptimal).toBe(!beaten);
    }
    const best = trips.find((t) => t.optionRank === 1)!;
    for (const t of trips) expect(best.pOnTime).toBeGreaterThanOrEqual(t.pOnTime);
  });

  it('flags below-mct, warns on separate tickets and adds the transfer allowance on an airport change', () => {
    const legs: LegSpec[] = [
      { flight: 'BA100', from: 'LHR', to: 'JFK', depart: '2026-03-08T10:00', arrive: '2026-03-08T18:00', booking: 'QX7P2L' },
      { flight: 'DL200', from: 'LGA', to: 'BOS', depart: '2026-03-08T19:00', arrive: '2026-03-08T20:15', booking: 'RT4M9Z' },
    ];
    const c = scoreTrips(parsedOf([makeTrip('Ana Quill', 'offsite', 'A', legs)]), syntheticSource(), base).trips[0]!.connections[0]!;
    expect(c.connectionType).toBe('international-arrival');
    expect(c.transferMinutes).toBe(90);
    expect(c.mctMinutes).toBe(180);
    expect(c.flags).toEqual(expect.arrayContaining(['airport-change', 'separate-tickets', 'below-mct', 'below-target']));
    expect(c.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['separate-tickets', 'airport-change', 'below-mct']));
    const overridden = scoreTrips(parsedOf([makeTrip('Ana Quill', 'offsite', 'A', legs)]), syntheticSource(), {
      ...base,
      mctRules: [
        { airport: 'JFK', type: 'international-arrival', minutes: 75, line: 2 },
        { airport: 'JFK', type: 'transfer', departAirport: 'LGA', minutes: 70, line: 3 },
      ],
    }).trips[0]!.connections[0]!;
    expect(overridden.mctMinutes).toBe(145);
    expect(overridden.mctSource).toBe('override');
  });

  it('does not score a stopover but keeps it', () => {
    const legs: LegSpec[] = [ordDenSfo[0]!, { ...ordDenSfo[1]!, depart: '2026-03-10T17:40', arrive: '2026-03-10T20:10' }];
    const trip = scoreTrips(parsedOf([makeTrip('Ana Quill', 'summit', 'A', legs)]), syntheticSource(), base).trips[0]!;
    expect(trip.connections[0]!.scored).toBe(false);
    expect(trip.connections[0]!.pMake).toBeNull();
    expect(trip.pAllConnections).toBe(1);
  });

  it('rejects invalid options with a RangeError naming them', () => {
    const input = parsedOf([makeTrip('Ana Quill', 'summit', 'A', ordDenSfo)]);
    expect(() => scoreTrips(input, syntheticSource(), { ...base, target: 1.2 })).toThrow(/target/);
    expect(() => scoreTrips(input, syntheticSource(), { ...base, rebookGapMinutes: 0 })).toThrow(/rebook gap/);
    expect(() => scoreTrips(input, syntheticSource(), { ...base, seed: -1 })).toThrow(/seed/);
  });
});
