// Scores parsed trips against a posterior source: every connection, every trip, the ranking of
// alternative options, and the group of travellers.
//
// Connection numbers (P(make), intervals, minimum layover) and P(all connections) come from
// quadrature per posterior draw and are free of simulation noise; arrival delays, deadlines and
// the group come from the seeded joint simulation in trip-simulation.ts.
import type { PosteriorSource, RoutePosterior } from '../delay/predictive';
import type { Connection, Leg, ParsedTrips, Problem, Trip } from '../itinerary/types';
import { centralInterval, mean } from './connection-probability';
import { RouteTables } from './delay-table';
import { connectionType, DEFAULT_TRANSFER_MINUTES, resolveMct, type ResolvedMct } from './mct';
import { rankOptions, type OptionRank } from './option-ranking';
import { groupCounts, topConnections } from './group-summary';
import { answerAt, groupJobs, solvePlan, type PairAnswer, type PairJob, type PairPlan } from './pair-jobs';
import { flightKey, simulateTrips, type SimConnection, type SimFlight, type SimTrip, type TripSimulation } from './trip-simulation';
import {
  RISK_CAUTION,
  type ConnectionType,
  type GroupSummary,
  type RiskFlag,
  type RiskWarning,
  type RouteEvidence,
  type ScoredConnection,
  type ScoredTrip,
  type ScoredTrips,
  type ScoreOptions,
} from './types';

/** Joint posterior draws used at most; fewer when a route has fewer. */
export const MAX_JOINT_DRAWS = 64;
export const DEFAULT_TARGET = 0.9;
export const DEFAULT_INTERVAL_LEVEL = 0.9;
export const DEFAULT_REBOOK_GAP_MINUTES = 180;
export const DEFAULT_SIMULATIONS = 2000;
export const DEFAULT_SEED = 1;

interface RouteSlot {
  readonly posterior: RoutePosterior;
  tables?: RouteTables;
}

/** Validated numeric options; a bad value is a RangeError naming the option. */
export function resolveScoreSettings(options: ScoreOptions) {
  const target = options.target ?? DEFAULT_TARGET;
  if (!(target > 0 && target < 1)) throw new RangeError(`target must lie strictly between 0 and 1, got ${target}`);
  const intervalLevel = options.intervalLevel ?? DEFAULT_INTERVAL_LEVEL;
  if (!(intervalLevel > 0 && intervalLevel < 1)) throw new RangeError(`interval level must lie strictly between 0 and 1, got ${intervalLevel}`);
  const rebookGap = options.rebookGapMinutes ?? DEFAULT_REBOOK_GAP_MINUTES;
  checkGap(rebookGap, 'rebook gap');
  for (const [trip, gap] of Object.entries(options.rebookGapByTrip ?? {})) checkGap(gap, `rebook gap of trip ${trip}`);
  const simulations = options.simulations ?? DEFAULT_SIMULATIONS;
  if (!Number.isInteger(simulations) || simulations < 100 || simulations > 1_000_000) throw new RangeError(`simulations must be a whole number from 100 to 1000000, got ${simulations}`);
  const seed = options.seed ?? DEFAULT_SEED;
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) throw new RangeError(`seed must be a whole number from 0 to 4294967295, got ${seed}`);
  const transferMinutes = options.transferMinutes ?? DEFAULT_TRANSFER_MINUTES;
  if (!Number.isInteger(transferMinutes) || transferMinutes < 0 || transferMinutes > 1440) throw new RangeError(`transfer allowance must be whole minutes from 0 to 1440, got ${transferMinutes}`);
  return { target, intervalLevel, rebookGap, simulations, seed, transferMinutes };
}

function checkGap(gap: number, what: string): void {
  if (!Number.isInteger(gap) || gap < 1 || gap > 2880) throw new RangeError(`${what} must be whole minutes from 1 to 2880, got ${gap}`);
}

interface RoutePair {
  readonly type: ConnectionType;
  readonly mct: ResolvedMct;
  arrival?: RoutePosterior;
  departure?: RoutePosterior;
  inbound?: RouteEvidence;
  outbound?: RouteEvidence;
  /** Undefined until searched; null when the target is out of reach. */
  minLayover?: number | null;
}

/**
 * A connection's record; `score` null for one that is not scored (a stopover). Every field is
 * spelled out, in the parsed connection's order: a spread followed by more fields took V8's
 * slow path for each of them, 3,000 times per 1,000 travellers.
 */
function connectionRecord(
  c: Connection,
  inbound: Leg,
  outbound: Leg,
  info: RoutePair,
  flags: RiskFlag[],
  score: { pMake: number; interval: [number, number]; minLayover: number | null; warnings: RiskWarning[] } | null,
): ScoredConnection {
  const minLayover = score ? score.minLayover : null;
  return {
    airport: c.airport,
    departAirport: c.departAirport,
    inboundLeg: c.inboundLeg,
    layoverMinutes: c.layoverMinutes,
    flags,
    inboundFlight: inbound.flight,
    outboundFlight: outbound.flight,
    connectionType: info.type,
    mctMinutes: info.mct.mctMinutes,
    mctSource: info.mct.source,
    transferMinutes: info.mct.transferMinutes,
    scored: score !== null,
    pMake: score ? score.pMake : null,
    pMakeInterval: score ? score.interval : null,
    minLayoverMinutes: minLayover,
    marginMinutes: minLayover === null ? null : c.layoverMinutes - minLayover,
    warnings: score ? score.warnings : [],
    inbound: score ? (info.inbound ?? null) : null,
    outbound: score ? (info.outbound ?? null) : null,
  };
}

function evidence(tables: RouteTables): RouteEvidence {
  const p = tables.posterior;
  return { origin: p.origin, destination: p.destination, kind: p.kind, pooling: p.pooling, flights: p.flights, derived: p.derived, drawsUsed: tables.draws };
}

/**
 * Scores every trip. Throws a RangeError for invalid options, and an Error naming the leg when
 * the posterior source has no posterior for one of its airports.
 */
export function scoreTrips(parsed: ParsedTrips, source: PosteriorSource, options: ScoreOptions): ScoredTrips {
  const prepared = prepareScoring(parsed, source, options);
  const answers = solvePlan(source, prepared.plan);
  return assembleScoring(prepared, answers, simulateScoring(prepared));
}

/**
 * A scoring run up to its two independent parts: the connection work (`plan`, solved by
 * solvePlan here or group by group on other threads) and the simulation (simulateScoring).
 * assembleScoring puts the answers together; whoever solved the plan, the result is the same.
 */
export interface PreparedScoring {
  readonly plan: PairPlan;
  /** @internal The rest of the run's state, for simulateScoring and assembleScoring. */
  readonly state: ScoringState;
}

interface ScoringState {
  readonly parsed: ParsedTrips;
  readonly source: PosteriorSource;
  readonly settings: ReturnType<typeof resolveScoreSettings>;
  readonly problems: Problem[];
  readonly draws: number;
  readonly isScored: (trip: Trip, k: number) => boolean;
  /** Each trip's connections' route pairs, and each scored pair's job. */
  readonly pairsOfTrips: RoutePair[][];
  readonly jobOf: Map<RoutePair, number>;
  readonly flights: SimFlight[];
  /** Each trip's legs' flights, as indices into flights. */
  readonly legFlights: Int32Array[];
  readonly simTrips: SimTrip[];
  readonly overrides: number;
}

/** Validates the options, resolves every route and MCT, and plans the connection work. */
export function prepareScoring(parsed: ParsedTrips, source: PosteriorSource, options: ScoreOptions): PreparedScoring {
  const settings = resolveScoreSettings(options);
  const rules = options.mctRules ?? [];
  const problems: Problem[] = [...parsed.problems];

  // Every leg's route and flight as small numbers, worked out once per leg: keys built from
  // codes and dates and hashed afresh at every use cost more than the rest of the bookkeeping.
  const routeIds = new Map<string, number>();
  const flightIndex = new Map<string, number>();
  const flights: { key: string; arrival?: RouteTables; departure?: RouteTables }[] = [];
  const legRoutes: Int32Array[] = [];
  const legFlights: Int32Array[] = [];
  for (const trip of parsed.trips) {
    const routesOfTrip = new Int32Array(trip.legs.length);
    const flightsOfTrip = new Int32Array(trip.legs.length);
    trip.legs.forEach((leg, k) => {
      const route = `${leg.from}-${leg.to}`;
      let id = routeIds.get(route);
      if (id === undefined) routeIds.set(route, (id = routeIds.size));
      routesOfTrip[k] = id;
      const key = flightKey(leg);
      let index = flightIndex.get(key);
      if (index === undefined) {
        index = flights.length;
        flightIndex.set(key, index);
        flights.push({ key });
      }
      flightsOfTrip[k] = index;
    });
    legRoutes.push(routesOfTrip);
    legFlights.push(flightsOfTrip);
  }

  // Which route posteriors are needed: arrivals of inbound and final legs, departures of outbound
  // legs; slot 2 * route for arrivals, 2 * route + 1 for departures.
  const slots: (RouteSlot | undefined)[] = [];
  const routeSlot = (leg: Leg, route: number, kind: 'arrival' | 'departure'): RouteSlot => {
    const at = 2 * route + (kind === 'arrival' ? 0 : 1);
    let slot = slots[at];
    if (!slot) {
      let posterior: RoutePosterior;
      try {
        posterior = source.route(leg.from, leg.to, kind);
      } catch (err) {
        throw new Error(`no ${kind} posterior for ${leg.flight} ${leg.from}-${leg.to} (line ${leg.line}): ${err instanceof Error ? err.message : String(err)}`);
      }
      slot = { posterior };
      slots[at] = slot;
    }
    return slot;
  };
  const isScored = (trip: Trip, k: number) => !(trip.connections[k]?.flags.includes('stopover') ?? true);
  parsed.trips.forEach((trip, t) => {
    const routesOfTrip = legRoutes[t]!;
    const lastIndex = trip.legs.length - 1;
    const last = trip.legs[lastIndex];
    if (last) routeSlot(last, routesOfTrip[lastIndex]!, 'arrival');
    trip.connections.forEach((c, k) => {
      if (!isScored(trip, k)) return;
      const inbound = trip.legs[c.inboundLeg];
      const outbound = trip.legs[c.inboundLeg + 1];
      if (inbound) routeSlot(inbound, routesOfTrip[c.inboundLeg]!, 'arrival');
      if (outbound) routeSlot(outbound, routesOfTrip[c.inboundLeg + 1]!, 'departure');
    });
  });
  let draws = MAX_JOINT_DRAWS;
  for (const slot of slots) if (slot) draws = Math.min(draws, slot.posterior.drawCount);
  const tablesOf = (slot: RouteSlot): RouteTables => (slot.tables ??= new RouteTables(slot.posterior, draws));

  const unknownCountry = new Set<string>();
  const countryOf = (code: string): string => {
    const country = options.countryOf(code);
    if (country) return country;
    if (!unknownCountry.has(code)) {
      unknownCountry.add(code);
      problems.push({ line: 0, severity: 'warning', code: 'no-country', message: `no country known for airport ${code}: its connections are treated as international arrivals (the longest default MCT)` });
    }
    return `?${code}`;
  };

  // What every connection between the same two routes shares (travellers on the same flights
  // and on different days alike): the connection type and MCT, the routes' evidence, and one
  // job for the connection work: its P(make) by slack and its minimum layover.
  const routePairs = new Map<number, RoutePair>();
  const jobOf = new Map<RoutePair, number>();
  const jobs: { job: PairJob; slacks: Set<number>; airport: string }[] = [];
  const routePairOf = (inbound: Leg, outbound: Leg, inRoute: number, outRoute: number): RoutePair => {
    const key = inRoute * routeIds.size + outRoute;
    let info = routePairs.get(key);
    if (!info) {
      const type = connectionType(countryOf(inbound.from), countryOf(inbound.to), countryOf(outbound.from), countryOf(outbound.to));
      info = { type, mct: resolveMct(rules, inbound.to, outbound.from, type, settings.transferMinutes) };
      routePairs.set(key, info);
    }
    return info;
  };
  const pairsOfTrips = parsed.trips.map((trip, tripIndex) => {
    const routesOfTrip = legRoutes[tripIndex]!;
    return trip.connections.map((c, k) => {
      const inbound = trip.legs[c.inboundLeg] as Leg;
      const outbound = trip.legs[c.inboundLeg + 1] as Leg;
      const inRoute = routesOfTrip[c.inboundLeg]!;
      const outRoute = routesOfTrip[c.inboundLeg + 1]!;
      const info = routePairOf(inbound, outbound, inRoute, outRoute);
      if (isScored(trip, k)) {
        let job = jobOf.get(info);
        if (job === undefined) {
          job = jobs.length;
          jobOf.set(info, job);
          const arrival = tablesOf(routeSlot(inbound, inRoute, 'arrival'));
          const departure = tablesOf(routeSlot(outbound, outRoute, 'departure'));
          info.arrival = arrival.posterior;
          info.departure = departure.posterior;
          info.inbound = evidence(arrival);
          info.outbound = evidence(departure);
          const route = (leg: Leg) => ({ origin: leg.from, destination: leg.to });
          jobs.push({ job: { inbound: route(inbound), outbound: route(outbound), slacks: [], mctMinutes: info.mct.mctMinutes }, slacks: new Set(), airport: inbound.to });
        }
        jobs[job]!.slacks.add(c.layoverMinutes - info.mct.mctMinutes);
      }
      return info;
    });
  });
  const pairJobs = jobs.map(({ job, slacks }) => ({ ...job, slacks: [...slacks].sort((a, b) => (Number.isNaN(a) ? 1 : Number.isNaN(b) ? -1 : a - b)) }));
  const plan: PairPlan = { draws, target: settings.target, jobs: pairJobs, groups: groupJobs(pairJobs, (k) => jobs[k]!.airport) };

  // A flight's routes for the simulation, set when some trip needs them.
  const flightOf = (leg: Leg, t: number, k: number, kind: 'arrival' | 'departure'): number => {
    const index = legFlights[t]![k]!;
    const flight = flights[index]!;
    flight[kind] ??= tablesOf(routeSlot(leg, legRoutes[t]![k]!, kind));
    return index;
  };
  const simTrips: SimTrip[] = parsed.trips.map((trip, tripIndex) => {
    const pairsOfTrip = pairsOfTrips[tripIndex]!;
    const connections: SimConnection[] = [];
    trip.connections.forEach((c, k) => {
      if (!isScored(trip, k)) return;
      const slackMinutes = c.layoverMinutes - pairsOfTrip[k]!.mct.mctMinutes;
      connections.push({ inbound: flightOf(trip.legs[c.inboundLeg] as Leg, tripIndex, c.inboundLeg, 'arrival'), outbound: flightOf(trip.legs[c.inboundLeg + 1] as Leg, tripIndex, c.inboundLeg + 1, 'departure'), slackMinutes });
    });
    const last = trip.legs[trip.legs.length - 1] as Leg;
    const deadlineMs = trip.deadlineUtc ? Date.parse(trip.deadlineUtc) : NaN;
    return {
      connections,
      lastFlight: flightOf(last, tripIndex, trip.legs.length - 1, 'arrival'),
      rebookGapMinutes: options.rebookGapByTrip?.[trip.id] ?? settings.rebookGap,
      deadlineSlackMinutes: Number.isFinite(deadlineMs) ? (deadlineMs - last.arriveUtcMs) / 60000 : null,
    };
  });
  return { plan, state: { parsed, source, settings, problems, draws, isScored, pairsOfTrips, jobOf, flights, legFlights, simTrips, overrides: rules.length } };
}

/** What a prepared run's simulation decides on its own: see simulateScoring. */
export interface SimulatedScoring {
  readonly sims: readonly TripSimulation[];
  /** @internal Each trip's on-time metrics and its option's rank. */
  readonly metrics: readonly TripMetrics[];
  readonly ranks: readonly OptionRank[];
  readonly counts: Omit<GroupSummary, 'topConnections'>;
}

type TripMetrics = Parameters<typeof rankOptions>[0][number] & { readonly hasDeadline: boolean };

/**
 * The seeded joint simulation of a prepared run, and what depends on it alone (independent of
 * the connection work): each trip's on-time metrics, the ranking of options, the group's counts.
 */
export function simulateScoring(prepared: PreparedScoring): SimulatedScoring {
  const { parsed, flights, simTrips, settings, draws } = prepared.state;
  const sims = simulateTrips(flights, simTrips, settings.simulations, draws, settings.seed);
  const metrics = parsed.trips.map((trip, k): TripMetrics => {
    const sim = sims[k];
    const first = trip.legs[0] as Leg;
    const last = trip.legs[trip.legs.length - 1] as Leg;
    const hasDeadline = sim?.pByDeadline !== null && sim?.pByDeadline !== undefined;
    return {
      traveler: trip.traveler,
      trip: trip.trip,
      option: trip.option,
      hasDeadline,
      pOnTime: hasDeadline ? (sim?.pByDeadline ?? NaN) : (sim?.pWithin15 ?? NaN),
      expectedArrivalDelayMinutes: sim?.meanArrivalDelay ?? NaN,
      travelMinutes: Math.round((last.arriveUtcMs - first.departUtcMs) / 60000),
    };
  });
  const ranks = rankOptions(metrics);
  const members = parsed.trips.map((trip, k) => ({ traveler: trip.traveler, id: trip.id, optionRank: ranks[k]!.optionRank }));
  return { sims, metrics, ranks, counts: groupCounts(members, sims, settings.simulations) };
}

/** The scored trips from a prepared run, its plan's answers (by job) and its simulation. */
export function assembleScoring(prepared: PreparedScoring, answers: readonly PairAnswer[], simulated: SimulatedScoring): ScoredTrips {
  const { sims, metrics, ranks, counts } = simulated;
  const { plan } = prepared;
  const { parsed, source, settings, problems, draws, isScored, pairsOfTrips, jobOf, legFlights, simTrips } = prepared.state;
  const scoredConnections: ScoredConnection[][] = [];
  const allMakeByDraw: Float64Array[] = [];
  // P(all connections) per trip and draw, in one block: a typed array per trip would get an
  // off-heap store of its own.
  const allMake = new Float64Array(parsed.trips.length * draws).fill(1);
  // Each route pair's P(make) by draw, its summary and minimum layover, by slack (from the answers).
  const summaries = new Map<RoutePair, Map<number, { byDraw: Float64Array; pMake: number; interval: [number, number]; minLayover: number | null }>>();
  // A pooled route's warning is the same for every connection on it: made once per route.
  const pooledWarnings = new Map<RoutePosterior, RiskWarning>();
  parsed.trips.forEach((trip, tripIndex) => {
    const conns: ScoredConnection[] = [];
    const allByDraw = allMake.subarray(tripIndex * draws, (tripIndex + 1) * draws);
    const pairsOfTrip = pairsOfTrips[tripIndex]!;
    trip.connections.forEach((c, k) => {
      const inbound = trip.legs[c.inboundLeg] as Leg;
      const outbound = trip.legs[c.inboundLeg + 1] as Leg;
      const info = pairsOfTrip[k]!;
      const { mct } = info;
      const flags: RiskFlag[] = [...c.flags];
      if (!isScored(trip, k)) {
        conns.push(connectionRecord(c, inbound, outbound, info, flags, null));
        return;
      }
      const slack = c.layoverMinutes - mct.mctMinutes;
      // Travellers on the same flights share a connection: its summary is worked out once.
      let bySlack = summaries.get(info);
      if (!bySlack) summaries.set(info, (bySlack = new Map()));
      let summary = bySlack.get(slack);
      if (!summary) {
        const job = jobOf.get(info)!;
        const answer = answers[job];
        if (!answer) throw new Error(`scoring lost the answer of connection ${inbound.flight}-${outbound.flight}`);
        const byDraw = answerAt(plan, job, answer, slack);
        summary = { byDraw, pMake: mean(byDraw), interval: centralInterval(byDraw, settings.intervalLevel), minLayover: answer.minLayover };
        bySlack.set(slack, summary);
      }
      const byDraw = summary.byDraw;
      for (let t = 0; t < draws; t++) allByDraw[t] = allByDraw[t]! * byDraw[t]!;
      const pMake = summary.pMake;
      const minLayover = summary.minLayover;
      if (c.layoverMinutes < mct.mctMinutes && !flags.includes('below-mct')) flags.push('below-mct');
      if (pMake < settings.target) flags.push('below-target');
      if (minLayover === null) flags.push('target-unreachable');
      const arrival = info.arrival!;
      const departure = info.departure!;
      if (arrival.pooling !== 'route' || departure.pooling !== 'route') flags.push('pooled-route');
      conns.push(
        connectionRecord(c, inbound, outbound, info, flags, {
          pMake,
          interval: summary.interval,
          minLayover,
          warnings: connectionWarnings(flags, c.layoverMinutes, mct.mctMinutes, mct.transferMinutes, arrival, departure, pooledWarnings),
        }),
      );
    });
    scoredConnections.push(conns);
    allMakeByDraw.push(allByDraw);
  });

  // Each scored trip is one literal with every field spelled out (see the connections above).
  const trips: ScoredTrip[] = parsed.trips.map((trip, k) => {
    const sim = sims[k];
    const allByDraw = allMakeByDraw[k] as Float64Array;
    const m = metrics[k]!;
    const rank = ranks[k]!;
    return {
      id: trip.id,
      traveler: trip.traveler,
      trip: trip.trip,
      option: trip.option,
      legs: trip.legs,
      connections: scoredConnections[k] ?? [],
      deadlineLocal: trip.deadlineLocal,
      deadlineUtc: trip.deadlineUtc,
      rebookGapMinutes: simTrips[k]?.rebookGapMinutes ?? settings.rebookGap,
      pAllConnections: mean(allByDraw),
      pAllConnectionsInterval: centralInterval(allByDraw, settings.intervalLevel),
      expectedArrivalDelayMinutes: m.expectedArrivalDelayMinutes,
      arrivalDelayQuantilesMinutes: { p50: sim?.arrivalDelayP50 ?? NaN, p90: sim?.arrivalDelayP90 ?? NaN },
      pArriveByDeadline: sim?.pByDeadline ?? null,
      pOnTime: m.pOnTime,
      onTimeBasis: m.hasDeadline ? ('deadline' as const) : ('within-15-minutes' as const),
      travelMinutes: m.travelMinutes,
      optionGroup: rank.optionGroup,
      optionRank: rank.optionRank,
      optionCount: rank.optionCount,
      paretoOptimal: rank.paretoOptimal,
    };
  });
  const best = trips.filter((t) => t.optionRank === 1);
  const bestFlights = legFlights.filter((_, k) => trips[k]!.optionRank === 1);
  const group: GroupSummary = { ...counts, topConnections: topConnections(best, bestFlights) };
  const overrides = prepared.state.overrides;
  return {
    format: parsed.format,
    trips,
    problems,
    target: settings.target,
    intervalLevel: settings.intervalLevel,
    seed: settings.seed,
    simulations: settings.simulations,
    bundle: { id: source.info.id, model: source.info.model, source: source.info.source },
    mct: { source: overrides ? 'defaults+overrides' : 'defaults', overrides },
    group,
    caution: RISK_CAUTION,
  };
}

function connectionWarnings(
  flags: readonly RiskFlag[],
  layover: number,
  mct: number,
  transfer: number,
  arrival: RoutePosterior,
  departure: RoutePosterior,
  pooled: Map<RoutePosterior, RiskWarning>,
): RiskWarning[] {
  const out: RiskWarning[] = [];
  if (flags.includes('separate-tickets')) {
    out.push({
      code: 'separate-tickets',
      message:
        'Separate tickets: if the first flight is late, the airline of the second need not rebook you, bags must be collected and checked in again, and extra time beyond the MCT is advised.',
    });
  }
  if (flags.includes('airport-change')) {
    out.push({ code: 'airport-change', message: `Airport change: the MCT includes a ground-transfer allowance of ${transfer} minutes; check the actual transfer time.` });
  }
  if (flags.includes('below-mct')) {
    out.push({ code: 'below-mct', message: `The layover of ${layover} minutes is below the minimum connection time of ${mct} minutes used here.` });
  }
  for (const p of [arrival, departure]) {
    if (p.pooling === 'route') continue;
    let warning = pooled.get(p);
    if (!warning) {
      warning = {
        code: 'pooled-route',
        message: `${p.origin}-${p.destination} ${p.kind}s were not in the fit data; the estimate is pooled from ${p.pooling === 'airports' ? 'its airports' : 'all routes'}, so its interval is wider.`,
      };
      pooled.set(p, warning);
    }
    out.push(warning);
  }
  return out;
}
