// Benchmarks of the risk engine (issue 5): scoring a 1,000-traveller group with 3 connections
// each (on one thread and on two, main/scoring/pair-workers.ts), and the minimum layover of one
// connection.
//
// The posteriors are synthetic (typical-plus-disrupted Gumbel mixtures with parameter
// uncertainty, the shape of the bundled models) so the figures do not depend on a fit.
import path from 'node:path';
import { gumbelDistribution } from '../../../shared/delay/gumbel';
import { mixtureDistribution } from '../../../shared/delay/mixture';
import type { DelayDistribution, DelayKind, PosteriorSource, RoutePosterior } from '../../../shared/delay/predictive';
import { loadDefaultPosteriorSource } from '../../../shared/delay/bundle/default-bundle';
import { createRng } from '../../../shared/inference/rng';
import type { Leg, ParsedTrips, Trip } from '../../../shared/itinerary/types';
import { ConnectionPair, minimumLayover } from '../../../shared/risk/connection-probability';
import { RouteTables } from '../../../shared/risk/delay-table';
import { hashKey } from '../../../shared/risk/trip-simulation';
import { MAX_JOINT_DRAWS, scoreTrips } from '../../../shared/risk/score-trips';
import { findAirport } from '../../../shared/time/airports';
import { PairWorker, scoreInParallel, type ParallelReport } from '../../scoring/pair-workers';
import { timeMedian, type BenchSuite } from '../suite';

const DRAWS = 100;
/** Timed runs per scoring case (after one warm-up): the median of more runs is steadier on a busy machine. */
const RUNS = 9;

function mixtureDelay(mu: number, beta: number, w: number, mu2: number, beta2: number): DelayDistribution {
  return mixtureDistribution([gumbelDistribution(mu, beta), gumbelDistribution(mu2, beta2)], [1 - w, w]);
}

/**
 * Synthetic posteriors: per route, draws of a 5-parameter Gumbel mixture. The parameters are drawn
 * when a route is first asked for; each draw's distribution is made when it is first used, as
 * the bundle source does (shared/delay/bundle/posterior-source.ts).
 */
export function benchSource(): PosteriorSource {
  const cache = new Map<string, RoutePosterior>();
  return {
    info: { id: 'bench-synthetic', model: 'gumbel mixture (synthetic)', source: 'main/bench/suites/risk.ts' },
    route(origin: string, destination: string, kind: DelayKind): RoutePosterior {
      const key = `${origin}-${destination}:${kind}`;
      const known = cache.get(key);
      if (known) return known;
      const rng = createRng(hashKey(key));
      const mu = -4 + 8 * rng.uniform();
      const beta = 9 + 6 * rng.uniform();
      const parameters = new Float64Array(5 * DRAWS);
      for (let s = 0; s < DRAWS; s++) {
        parameters.set([mu + 1.5 * rng.normal(), beta * Math.exp(0.06 * rng.normal()), 0.06 + 0.04 * rng.uniform(), 25 + 10 * rng.normal(), 45 + 10 * rng.uniform()], 5 * s);
      }
      const draws = new Array<DelayDistribution | undefined>(DRAWS);
      const draw = (s: number): DelayDistribution => {
        const p = parameters.subarray(5 * s, 5 * s + 5);
        return (draws[s] ??= mixtureDelay(p[0]!, p[1]!, p[2]!, p[3]!, p[4]!));
      };
      const posterior: RoutePosterior = { origin, destination, kind, pooling: 'route', flights: 300, derived: false, drawCount: DRAWS, draw };
      cache.set(key, posterior);
      return posterior;
    },
  };
}

const ORIGINS = ['MSN', 'DSM', 'OMA', 'ICT', 'TUL', 'LIT', 'BOI', 'GEG', 'FAT', 'RNO', 'ABQ', 'ELP', 'SAT', 'MSY', 'BHM', 'CHS', 'ROC', 'SYR', 'ALB', 'PWM'];
const FIRST_HUBS = ['ORD', 'DEN', 'ATL'];
const GATEWAYS = ['JFK', 'BOS'];
const EUROPEAN_HUBS = ['LHR', 'CDG', 'FRA', 'AMS'];

function leg(flight: string, from: string, to: string, departMs: number, minutes: number, line: number): Leg {
  const arriveMs = departMs + minutes * 60000;
  const local = (ms: number) => new Date(ms).toISOString().slice(0, 16);
  return {
    flight, from, to, line, booking: '',
    departLocal: local(departMs), arriveLocal: local(arriveMs),
    departUtc: new Date(departMs).toISOString(), arriveUtc: new Date(arriveMs).toISOString(),
    fromZone: 'UTC', toZone: 'UTC', departUtcMs: departMs, arriveUtcMs: arriveMs,
  };
}

/**
 * 1,000 invented travellers to an all-hands in Lisbon, 4 legs (3 connections) each, over
 * two travel days. Flights are shared the way a group's are: one flight per route and day.
 */
export function benchTrips(travelers = 1000): ParsedTrips {
  const rng = createRng(2026);
  const trips: Trip[] = [];
  const pick = <T>(list: readonly T[]): T => list[rng.int(list.length)] as T;
  for (let i = 0; i < travelers; i++) {
    const day = Date.UTC(2026, 4, 10 + rng.int(2), 11, 0);
    const path = [pick(ORIGINS), pick(FIRST_HUBS), pick(GATEWAYS), pick(EUROPEAN_HUBS), 'LIS'];
    const legs: Leg[] = [];
    let t = day;
    for (let k = 0; k + 1 < path.length; k++) {
      const from = path[k] as string;
      const to = path[k + 1] as string;
      const minutes = k === 2 ? 420 : 70 + (hashKey(from + to) % 120);
      // The same flight for everyone on a route and day: its number and times come from the route.
      const flight = `LX${100 + (hashKey(`${from}${to}`) % 900)}`;
      const depart = Math.max(t + (50 + (hashKey(`${to}${from}`) % 80)) * 60000, day + k * 5 * 3600000);
      legs.push(leg(flight, from, to, depart, minutes, i * 4 + k + 2));
      t = depart + minutes * 60000;
    }
    const connections = legs.slice(0, -1).map((l, k) => {
      const next = legs[k + 1] as Leg;
      return { airport: l.to, departAirport: next.from, inboundLeg: k, layoverMinutes: Math.round((next.departUtcMs - l.arriveUtcMs) / 60000), flags: [] };
    });
    trips.push({ id: `traveller-${i}/all-hands/`, traveler: `Traveller ${i}`, trip: 'all-hands', option: '', legs, connections, deadlineLocal: null, deadlineUtc: null });
  }
  return { format: 'csv', trips, problems: [] };
}

const countryOf = (code: string) => findAirport(code)?.country;

export const riskSuite: BenchSuite = {
  name: 'risk',
  run: async (log) => {
    const parsed = benchTrips();
    const flights = new Set(parsed.trips.flatMap((t) => t.legs.map((l) => `${l.flight} ${l.departLocal.slice(0, 10)}`)));
    log(`group: ${parsed.trips.length} travellers, ${parsed.trips.reduce((n, t) => n + t.connections.length, 0)} connections, ${flights.size} unique flights, ${DRAWS} posterior draws per route (${MAX_JOINT_DRAWS} used)`);
    // Each case on one thread (scoreTrips) and on two (scoreInParallel with a warm helper, as
    // the app's engine thread scores): the same output, checked here, byte for byte.
    const helper = new PairWorker(path.join(__dirname, 'risk-pair-worker.cjs'));
    helper.start();
    const measure = async (makeSource: () => PosteriorSource, spec: string) => {
      const serialJson = JSON.stringify(scoreTrips(parsed, makeSource(), { countryOf, seed: 1 }));
      const parallelJson = JSON.stringify(await scoreInParallel(parsed, makeSource(), spec, { countryOf, seed: 1 }, helper));
      if (serialJson !== parallelJson) throw new Error(`two-thread scoring (${spec}) differs from one thread`);
      let summary = '';
      const oneMs = await timeMedian(() => {
        const scored = scoreTrips(parsed, makeSource(), { countryOf, seed: 1 });
        summary = `expected misconnecting ${scored.group.expectedMisconnecting.toFixed(1)}, ${scored.simulations} simulations`;
      }, RUNS);
      const report: ParallelReport = { here: 0, helper: 0, waitMs: 0 };
      let waited = 0;
      let shared = 0;
      let runs = 0;
      const twoMs = await timeMedian(async () => {
        await scoreInParallel(parsed, makeSource(), spec, { countryOf, seed: 1 }, helper, report);
        if (report.fallback) throw new Error(`the helper failed: ${report.fallback}`);
        waited += report.waitMs;
        shared += report.helper / (report.here + report.helper);
        runs++;
      }, RUNS);
      return { oneMs, twoMs, summary, helperShare: shared / runs, waitMs: waited / runs };
    };
    // A fresh source each run: every route is tabulated again, as in a new scoring of new trips.
    const synthetic = await measure(benchSource, 'synthetic');
    log(synthetic.summary);
    // The same group against the bundled posteriors (Gumbel + Lomax tails): route draws are
    // made once by the source, the tables again in every run.
    const bundled = loadDefaultPosteriorSource();
    const real = await measure(() => bundled, 'bundled');
    log(`${bundled.info.id}: ${real.summary}`);
    await helper.close();
    const twoNotes = (m: typeof synthetic) => `helper solved ${(100 * m.helperShare).toFixed(0)}% of the connection groups; waited ${m.waitMs.toFixed(1)} ms for it; same output as one thread`;

    // Minimum layover of one connection, on route tables already built (once per route per run).
    const source = benchSource();
    const pairs: { arrival: RouteTables; departure: RouteTables }[] = [];
    for (const [a, b, c] of [['ORD', 'JFK', 'LHR'], ['DEN', 'BOS', 'CDG'], ['ATL', 'JFK', 'FRA'], ['MSN', 'ORD', 'JFK'], ['JFK', 'AMS', 'LIS']] as const) {
      const arrival = new RouteTables(source.route(a, b, 'arrival'), MAX_JOINT_DRAWS);
      const departure = new RouteTables(source.route(b, c, 'departure'), MAX_JOINT_DRAWS);
      for (let t = 0; t < MAX_JOINT_DRAWS; t++) {
        arrival.table(t);
        departure.table(t);
      }
      pairs.push({ arrival, departure });
    }
    const searches: number[] = [];
    for (let rep = 0; rep < 40; rep++) {
      const { arrival, departure } = pairs[rep % pairs.length] as (typeof pairs)[number];
      const pair = new ConnectionPair(arrival, departure);
      const start = performance.now();
      minimumLayover(pair, 45 + (rep % 3) * 15, 0.9);
      searches.push(performance.now() - start);
    }
    searches.sort((x, y) => x - y);
    const searchMs = searches[Math.floor(searches.length / 2)] ?? NaN;

    const tabulateMs = await timeMedian(() => {
      const fresh = benchSource();
      const arrival = new RouteTables(fresh.route('ORD', 'JFK', 'arrival'), MAX_JOINT_DRAWS);
      for (let t = 0; t < MAX_JOINT_DRAWS; t++) arrival.table(t);
    }, 5);
    return [
      { name: '1,000 travellers x 3 connections, intervals + group (two threads)', ms: synthetic.twoMs, targetMs: 200, notes: twoNotes(synthetic) },
      { name: '  the same on one thread', ms: synthetic.oneMs, notes: synthetic.summary },
      { name: '1,000 travellers x 3 connections, bundled posteriors (two threads)', ms: real.twoMs, targetMs: 200, notes: twoNotes(real) },
      { name: '  the same on one thread', ms: real.oneMs, notes: real.summary },
      { name: 'minimum layover, one connection (routes tabulated)', ms: searchMs, targetMs: 1, notes: `median of ${searches.length} searches, ${MAX_JOINT_DRAWS} joint draws` },
      { name: 'tabulate one route (all joint draws)', ms: tabulateMs, notes: 'once per route and kind per scoring run' },
    ];
  },
};
