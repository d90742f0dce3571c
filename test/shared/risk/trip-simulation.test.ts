import { describe, expect, it } from 'vitest';
import { sortedQuantile } from './quantile-reference';
import stdlibGumbel from '@stdlib/stats-base-dists-gumbel';
import { gumbelDistribution } from '../../../shared/delay/gumbel';
import type { DelayDistribution, RoutePosterior } from '../../../shared/delay/predictive';
import { RouteTables } from '../../../shared/risk/delay-table';
import { flightStream, MAX_SIMULATED_DELAY_MINUTES, selectQuantiles, simulateTrips, type SimFlight, type SimTrip } from '../../../shared/risk/trip-simulation';
import { createRng } from '../../../shared/inference/rng';

// Reference: Hyndman & Fan (1996) definition 7 (R's quantile type 7) on a fully sorted copy.
function reference(values: Float64Array, p: number): number {
  return sortedQuantile(Float64Array.from(values).sort(), p);
}

describe('selectQuantiles', () => {
  const rng = createRng(17);
  const cases: Record<string, Float64Array> = {
    // Delays like a trip's: a Gumbel bulk, some rebookings of 180 minutes, a few capped at two days.
    'trip delays': Float64Array.from({ length: 2000 }, () => {
      const u = rng.uniform();
      const x = -10 * Math.log(-Math.log(rng.uniform()));
      return u < 0.01 ? 2880 : u < 0.2 ? x + 180 : x;
    }),
    'many ties': Float64Array.from({ length: 999 }, () => Math.floor(rng.uniform() * 5)),
    'one far outlier': Float64Array.from({ length: 500 }, (_, i) => (i === 250 ? 1e9 : rng.normal())),
    'all equal': new Float64Array(300).fill(7),
    'two values': Float64Array.of(5, -1),
    'one value': Float64Array.of(42),
  };
  it.each(Object.entries(cases))('matches definition 7 on a sorted copy (%s)', (_name, values) => {
    const before = Float64Array.from(values);
    const ps = [0, 0.05, 0.1, 0.5, 0.9, 0.95, 0.999, 1];
    const got = selectQuantiles(values, ps);
    ps.forEach((p, k) => expect(got[k], `p=${p}`).toBe(reference(values, p)));
    // The same with the range passed in, as the trip loop does.
    const sorted = Float64Array.from(values).sort();
    expect(selectQuantiles(values, ps, sorted[0], sorted[sorted.length - 1])).toEqual(got);
    expect(values).toEqual(before);
  });

  it('gives NaN for no values', () => {
    expect(selectQuantiles(new Float64Array(0), [0.5])).toEqual([Number.NaN]);
  });
});

// Reference: @stdlib/stats-base-dists-gumbel for the distribution a flight's simulated delays
// must follow; the binomial standard error sqrt(p (1 - p) / n) for the Monte Carlo tolerance.
describe('simulateTrips', () => {
  const posterior = (draw: (s: number) => DelayDistribution): RoutePosterior => ({
    origin: 'MAD', destination: 'LIS', kind: 'arrival', pooling: 'route', flights: 100, derived: false, drawCount: 4, draw,
  });
  const oneFlight = (dist: (s: number) => DelayDistribution, n: number) => {
    const tables = new RouteTables(posterior(dist), 4);
    const flights: SimFlight[] = [{ key: 'TP1027 2026-06-01 MAD-LIS', arrival: tables }];
    const trips: SimTrip[] = [{ connections: [], lastFlight: 0, rebookGapMinutes: 180, deadlineSlackMinutes: 30 }];
    return simulateTrips(flights, trips, n, 4, 7)[0]!;
  };

  it('draws each flight\'s delays from its posterior draws\' distributions', () => {
    const n = 40_000;
    // Four draws with different locations: the delays follow their equal-weight mixture.
    const mus = [-6, -2, 3, 9];
    const sim = oneFlight((s) => gumbelDistribution(mus[s]!, 11), n);
    const mixCdf = (x: number) => mus.reduce((sum, mu) => sum + stdlibGumbel.cdf(x, mu, 11), 0) / mus.length;
    for (const [got, p] of [[sim.pWithin15, mixCdf(15 - 1e-9)], [sim.pByDeadline!, mixCdf(30)]] as const) {
      expect(Math.abs(got - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n));
    }
    // The median: the mixture's CDF there is 1/2 within Monte Carlo error.
    expect(Math.abs(mixCdf(sim.arrivalDelayP50) - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n));
    expect(Math.abs(mixCdf(sim.arrivalDelayP90) - 0.9)).toBeLessThan(4 * Math.sqrt(0.09 / n));
  });

  it('keeps a tail too heavy for the risk tables (samples beyond two days are capped at two days)', () => {
    const n = 20_000;
    // A Gumbel with a scale of 2 days: S(2 days) = 1 - exp(-e^-1), far beyond any table's grid.
    const sim = oneFlight(() => gumbelDistribution(0, MAX_SIMULATED_DELAY_MINUTES), n);
    const p = stdlibGumbel.cdf(MAX_SIMULATED_DELAY_MINUTES, 0, MAX_SIMULATED_DELAY_MINUTES);
    // Every delay is at most the cap; the 90% quantile sits on it when over 10% lies beyond.
    expect(1 - p).toBeGreaterThan(0.1);
    expect(sim.arrivalDelayP90).toBe(MAX_SIMULATED_DELAY_MINUTES);
    expect(Math.abs(sim.pByDeadline! - stdlibGumbel.cdf(30, 0, MAX_SIMULATED_DELAY_MINUTES))).toBeLessThan(0.02);
  });

  it('gives the same delays for a flight whatever else is simulated (common random numbers)', () => {
    const tables = new RouteTables(posterior((s) => gumbelDistribution(s, 12)), 4);
    const other = new RouteTables(posterior((s) => gumbelDistribution(40 + s, 30)), 4);
    const trip: SimTrip = { connections: [], lastFlight: 0, rebookGapMinutes: 180, deadlineSlackMinutes: null };
    const alone = simulateTrips([{ key: 'TP1027 2026-06-01 MAD-LIS', arrival: tables }], [trip], 500, 4, 3)[0]!;
    const withOther = simulateTrips(
      [{ key: 'IB3100 2026-06-01 MAD-LIS', arrival: other }, { key: 'TP1027 2026-06-01 MAD-LIS', arrival: tables }],
      [{ ...trip, lastFlight: 1 }, { ...trip, lastFlight: 0 }],
      500, 4, 3,
    );
    // Trip 0 ends on TP1027, listed second this time.
    expect(withOther[0]).toEqual(alone);
    expect(withOther[1]!.meanArrivalDelay).not.toBe(alone.meanArrivalDelay);
  });

  it('rebooks each missed connection of a long trip onto the first departure it reaches, gaps summed over the trip', () => {
    // Five legs (four connections, so the rows past the third are summed), with tight slacks
    // and a 7-minute gap so that many simulations miss one or more connections. The reference
    // replays each flight's stream by hand (simulation i uses draw i mod 4, in draw order) and
    // applies the rule of the issue: a missed connection costs ceil(shortfall / gap) gaps.
    const n = 3000;
    const draws = 4;
    const seed = 11;
    const route = (kind: 'arrival' | 'departure', mu: number, beta: number) =>
      new RouteTables({ ...posterior((s) => gumbelDistribution(mu + 2 * s, beta + s)), kind, drawCount: draws }, draws);
    const keys = ['TP1 2026-06-01 OPO-LIS', 'TP2 2026-06-01 LIS-MAD', 'IB3 2026-06-01 MAD-BCN', 'VY4 2026-06-01 BCN-PMI', 'VY5 2026-06-01 PMI-IBZ'];
    const flights: SimFlight[] = keys.map((key, k) => ({
      key,
      arrival: route('arrival', 5 * k - 4, 9 + k),
      departure: k > 0 ? route('departure', k - 2, 6 + k) : undefined,
    }));
    const slacks = [10, -5, 25, 0];
    const gap = 7;
    const trip: SimTrip = {
      connections: slacks.map((slackMinutes, k) => ({ inbound: k, outbound: k + 1, slackMinutes })),
      lastFlight: 4,
      rebookGapMinutes: gap,
      deadlineSlackMinutes: 40,
    };
    const sim = simulateTrips(flights, [trip], n, draws, seed)[0]!;

    const replay = (tables: RouteTables, kind: 'arrival' | 'departure', key: string) => {
      const stream = flightStream(seed, key, kind);
      const row = new Float64Array(n);
      for (let t = 0; t < draws; t++) for (let i = t; i < n; i += draws) row[i] = Math.min(MAX_SIMULATED_DELAY_MINUTES, tables.distribution(t).sample(stream));
      return row;
    };
    const arrivals = flights.map((f) => replay(f.arrival!, 'arrival', f.key));
    const departures = flights.map((f) => (f.departure ? replay(f.departure, 'departure', f.key) : new Float64Array(n)));
    const delays = new Float64Array(n);
    let missedCount = 0;
    for (let i = 0; i < n; i++) {
      let rebooked = 0;
      slacks.forEach((slack, k) => {
        const shortfall = arrivals[k]![i]! - departures[k + 1]![i]! - slack;
        if (shortfall > 0) rebooked += Math.ceil(shortfall / gap) * gap;
      });
      delays[i] = rebooked + arrivals[4]![i]!;
      expect(sim.missed[i], `simulation ${i}`).toBe(rebooked > 0 ? 1 : 0);
      missedCount += rebooked > 0 ? 1 : 0;
    }
    // Enough of both outcomes for the check to mean something.
    expect(missedCount).toBeGreaterThan(n / 10);
    expect(missedCount).toBeLessThan(n);
    expect(sim.meanArrivalDelay).toBeCloseTo(delays.reduce((a, b) => a + b, 0) / n, 9);
    expect(sim.pWithin15).toBe(delays.filter((x) => x < 15).length / n);
    expect(sim.pByDeadline).toBe(delays.filter((x) => x <= 40).length / n);
    expect(sim.arrivalDelayP50).toBe(reference(delays, 0.5));
    expect(sim.arrivalDelayP90).toBe(reference(delays, 0.9));
  });
});
