// The seeded joint Monte Carlo behind trip delays, deadlines and the group count.
//
// One delay per unique flight (flight number, date, route) and kind per simulation, shared by
// every traveller and option on that flight; one posterior draw per route per simulation (joint
// draw t = i mod J on every route, so draws stay paired across routes). Each flight and kind has
// its own seeded stream, so a flight's delays do not depend on what else is in the input: that
// gives common random numbers when comparing options.
import { createRng, type Rng } from '../inference/rng';
import type { DelayDistribution } from '../delay/predictive';
import type { Leg } from '../itinerary/types';
import type { RouteTables } from './delay-table';
import { selectInRange } from './order-statistics';

/** A unique flight: flight number, local departure date and route (a through flight's legs differ). */
export function flightKey(leg: Leg): string {
  return `${leg.flight} ${leg.departLocal.slice(0, 10)} ${leg.from}-${leg.to}`;
}

export interface SimFlight {
  /** Stable key: flight number, local departure date and route. */
  readonly key: string;
  /** Present when some trip needs this flight's arrival delay. */
  readonly arrival?: RouteTables;
  /** Present when some trip needs this flight's departure delay. */
  readonly departure?: RouteTables;
}

export interface SimConnection {
  /** Index into the flights of the inbound leg (its arrival delay is used). */
  readonly inbound: number;
  /** Index into the flights of the outbound leg (its departure delay is used). */
  readonly outbound: number;
  /** layover - MCT in minutes: the connection is made when A - D <= this. */
  readonly slackMinutes: number;
}

export interface SimTrip {
  readonly connections: readonly SimConnection[];
  /** Index of the flight whose arrival ends the trip. */
  readonly lastFlight: number;
  readonly rebookGapMinutes: number;
  /** Minutes after the scheduled final arrival that still meet the deadline; null without one. */
  readonly deadlineSlackMinutes: number | null;
}

export interface TripSimulation {
  readonly simulations: number;
  /** 1 where at least one connection was missed, per simulation. */
  readonly missed: Uint8Array;
  /** Mean final arrival delay (minutes, rebookings included). */
  readonly meanArrivalDelay: number;
  /** Median and 90% quantile of the final arrival delay (Hyndman & Fan definition 7). */
  readonly arrivalDelayP50: number;
  readonly arrivalDelayP90: number;
  /** P(arrival delay < 15 minutes). */
  readonly pWithin15: number;
  /** P(on or before the deadline), or null. */
  readonly pByDeadline: number | null;
}

/**
 * Longest delay a simulation uses (minutes). A heavy-tailed posterior (e.g. a Lomax component)
 * can draw delays of weeks, and its mean may not even exist; a flight two days late is in
 * practice cancelled and its travellers rebooked, so longer draws count as two days.
 */
export const MAX_SIMULATED_DELAY_MINUTES = 2880;

/** On time in the US BTS sense: arriving less than 15 minutes after schedule. */
export const ON_TIME_TOLERANCE_MINUTES = 15;

/** A 32-bit FNV-1a hash, to seed a flight's stream from its key. */
export function hashKey(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 0x01000193) >>> 0;
  return h;
}

export function flightStream(seed: number, key: string, kind: 'arrival' | 'departure'): Rng {
  return createRng((hashKey(`${kind}|${key}`) ^ Math.imul(seed >>> 0, 0x9e3779b1)) >>> 0);
}

/**
 * Simulates every trip `simulations` times.
 *
 * A missed connection rebooks the traveller onto a departure rebookGap minutes later, or the
 * one after that, and so on: the first one they reach, i.e. ceil(shortfall / gap) gaps. The later
 * departure is assumed to run with the delay drawn for the booked flight, and the rest of the
 * trip shifts by the same amount, so later connections keep their layovers.
 */
export function simulateTrips(flights: readonly SimFlight[], trips: readonly SimTrip[], simulations: number, draws: number, seed: number): TripSimulation[] {
  if (!Number.isInteger(simulations) || simulations < 1) throw new RangeError(`simulations must be a whole number >= 1, got ${simulations}`);
  const n = simulations;
  // Each flight's delays in every simulation, drawn in one sweep of its own stream: simulation i
  // uses joint draw t = i mod draws, and its delay is sampled from that draw's distribution
  // itself (exact, tails and all; the tables are for the quadrature only). The sweep goes draw
  // by draw, so each loop calls one distribution's sampler.
  const sweep = (tables: RouteTables, stream: Rng): Float64Array => {
    const row = new Float64Array(n);
    for (let t = 0; t < Math.min(draws, n); t++) sampleInto(tables.distribution(t), stream, row, t, draws, MAX_SIMULATED_DELAY_MINUTES);
    return row;
  };
  const none = new Float64Array(0);
  const arrivals = flights.map((f) => (f.arrival ? sweep(f.arrival, flightStream(seed, f.key, 'arrival')) : none));
  const departures = flights.map((f) => (f.departure ? sweep(f.departure, flightStream(seed, f.key, 'departure')) : none));
  // A connection's rebooking in every simulation depends only on its two flights, its slack and
  // the rebook gap, and travellers share connections: each is worked out once, as the number of
  // gaps waited (0 where the connection is made). Counts rather than minutes: a quarter of the
  // memory, and a trip's rebooking delay is its counts' sum times its one gap.
  const rebookings = new Map<string, Uint16Array>();
  const rebookingOf = (c: SimConnection, g: number): Uint16Array => {
    const key = `${c.inbound} ${c.outbound} ${c.slackMinutes} ${g}`;
    let row = rebookings.get(key);
    if (!row) {
      row = rebookingCounts(arrivals[c.inbound]!, departures[c.outbound]!, c.slackMinutes, g, n);
      rebookings.set(key, row);
    }
    return row;
  };
  // Then each trip in turn: its delays in one scratch row, summarised before the next trip.
  // Trips with the same connections, final flight, rebook gap and deadline (travellers booked
  // together) have the same outcomes in every simulation: they share one result.
  const delay = new Float64Array(n);
  const zero = new Uint16Array(n);
  const extra = new Uint16Array(n);
  const missedAll = new Uint8Array(trips.length * n);
  const results = new Map<string, TripSimulation>();
  return trips.map((trip) => {
    const key = tripKey(trip);
    const known = results.get(key);
    if (known) return known;
    const missed = missedAll.subarray(results.size * n, (results.size + 1) * n);
    const g = trip.rebookGapMinutes;
    // The gaps waited at its connections, summed: at least one exactly where some connection was
    // missed. Up to three rows are read in the loop below; a longer trip's later rows are summed
    // into one first (capped, as each count is; see rebookingCounts).
    const connections = trip.connections;
    const r0 = connections.length > 0 ? rebookingOf(connections[0]!, g) : zero;
    const r1 = connections.length > 1 ? rebookingOf(connections[1]!, g) : zero;
    let r2 = connections.length > 2 ? rebookingOf(connections[2]!, g) : zero;
    if (connections.length > 3) {
      extra.set(r2);
      for (let c = 3; c < connections.length; c++) {
        const row = rebookingOf(connections[c]!, g);
        for (let i = 0; i < n; i++) extra[i] = Math.min(MAX_GAP_COUNT, extra[i]! + row[i]!);
      }
      r2 = extra;
    }
    const totals = tripTotals(r0, r1, r2, g, arrivals[trip.lastFlight]!, trip.deadlineSlackMinutes ?? Infinity, missed, delay);
    const quantiles = selectQuantiles(delay, TRIP_QUANTILES, totals[3]!, totals[4]!);
    const result: TripSimulation = {
      simulations: n,
      missed,
      meanArrivalDelay: totals[0]! / n,
      arrivalDelayP50: quantiles[0]!,
      arrivalDelayP90: quantiles[1]!,
      pWithin15: totals[1]! / n,
      pByDeadline: trip.deadlineSlackMinutes === null ? null : totals[2]! / n,
    };
    results.set(key, result);
    return result;
  });
}

const TRIP_QUANTILES = [0.5, 0.9] as const;

// Samples of dist, capped at cap, into out[start], out[start + stride], ...: in place when the
// distribution can (DelayDistribution.sampleInto).
function sampleInto(dist: DelayDistribution, stream: Rng, out: Float64Array, start: number, stride: number, cap: number): void {
  if (dist.sampleInto) dist.sampleInto(stream, out, start, stride, cap);
  else for (let i = start; i < out.length; i += stride) out[i] = Math.min(cap, dist.sample(stream));
}

/**
 * Most gaps one connection's row (or a long trip's summed rows) counts: 45 days of one-minute
 * gaps. Arrival delays are capped at MAX_SIMULATED_DELAY_MINUTES, but departure delays are not
 * capped below, so an absurd early departure far in a heavy left tail could ask for more; it is
 * counted as this many rather than wrapping around.
 */
const MAX_GAP_COUNT = 0xffff;

// The gaps a connection's traveller waits in each simulation: ceil(shortfall / gap), 0 when made.
function rebookingCounts(a: Float64Array, d: Float64Array, slack: number, g: number, n: number): Uint16Array {
  const row = new Uint16Array(n);
  for (let i = 0; i < row.length; i++) {
    const shortfall = a[i]! - d[i]! - slack;
    if (shortfall > 0) row[i] = Math.min(MAX_GAP_COUNT, Math.ceil(shortfall / g));
  }
  return row;
}

/**
 * One trip's final delays ((r0 + r1 + r2) gaps of g minutes plus the last flight's arrival delay) into
 * delay, its misses into missed, and [sum, count under 15 minutes, count by the deadline slack,
 * min, max] into a reused array. A function of its own, like the other loops over simulations:
 * called per trip, it is optimised early rather than by on-stack replacement.
 */
function tripTotals(r0: Uint16Array, r1: Uint16Array, r2: Uint16Array, g: number, last: Float64Array, slack: number, missed: Uint8Array, delay: Float64Array): Float64Array {
  let sum = 0;
  let within = 0;
  let byDeadline = 0;
  let min = Infinity;
  let max = -Infinity;
  // The gap read back from a Float64Array is a double to V8: a whole-number g multiplied the
  // integer counts as 32-bit integers, with overflow and minus-zero checks, at twice the
  // loop's cost.
  const out = totalsScratch;
  out[5] = g;
  const gap = out[5]!;
  // The counts as +(condition): V8 turns that into a flag, where `condition ? 1 : 0` became a
  // branch that a miss in one simulation of three kept mispredicting.
  for (let i = 0; i < delay.length; i++) {
    const gaps = r0[i]! + r1[i]! + r2[i]!;
    missed[i] = +(gaps > 0);
    const x = gaps * gap + last[i]!;
    delay[i] = x;
    sum += x;
    within += +(x < ON_TIME_TOLERANCE_MINUTES);
    byDeadline += +(x <= slack);
    if (x < min) min = x;
    if (x > max) max = x;
  }
  out[0] = sum;
  out[1] = within;
  out[2] = byDeadline;
  out[3] = min;
  out[4] = max;
  return out;
}

const totalsScratch = new Float64Array(6);

function tripKey(trip: SimTrip): string {
  let key = `${trip.lastFlight} ${trip.rebookGapMinutes} ${trip.deadlineSlackMinutes}`;
  for (const c of trip.connections) key += ` ${c.inbound}>${c.outbound}:${c.slackMinutes}`;
  return key;
}

/**
 * Quantiles (Hyndman & Fan definition 7) of values at each p, without sorting them all: the
 * values are counted into equal-width buckets between their minimum and maximum, the values of
 * the buckets that hold the order statistics needed are gathered in one more pass, and each is
 * selected among the values of its bucket only. A caller that already has
 * the minimum and maximum passes them (the trip loop finds them in its own pass). NaN-free input
 * assumed; empty input gives NaN; values are not modified. Plain functions and module state
 * rather than closures: a closure made per call is a new call target each time, and the
 * optimised caller was thrown away for it (a deoptimisation per trip).
 * @example selectQuantiles(Float64Array.of(3, 1, 2), [0.5]) // returns [2]
 */
export function selectQuantiles(values: Float64Array, ps: readonly number[], min = minimumOf(values), max = maximumOf(values)): number[] {
  const n = values.length;
  const out = new Array<number>(ps.length);
  if (n === 0) return out.fill(NaN);
  const scale = QUANTILE_BUCKETS / (max - min);
  if (!(max > min) || !Number.isFinite(scale) || !Number.isFinite(min) || !Number.isFinite(max)) {
    // All equal, or infinite values: select in a plain copy.
    if (bucketWork.length < n) growBuckets(n);
    const work = bucketWork.subarray(0, n);
    work.set(values);
    for (let k = 0; k < ps.length; k++) {
      const h = (n - 1) * ps[k]!;
      const i = Math.floor(h);
      const lo = selectInRange(work, 0, i, n);
      out[k] = i + 1 >= n || h === i ? lo : lo + (h - i) * (selectInRange(work, 0, i + 1, n) - lo);
    }
    return out;
  }
  // bucket(x) = floor((x - min) * scale), capped: non-decreasing in x, so the buckets are ordered.
  const counts = bucketCounts;
  counts.fill(0);
  if (bucketWork.length < n) growBuckets(n);
  const of = bucketOf;
  for (let i = 0; i < n; i++) {
    const b = Math.min(QUANTILE_BUCKETS - 1, Math.floor((values[i]! - min) * scale));
    of[i] = b;
    counts[b]!++;
  }
  // The buckets that hold the order statistics asked for, each given a region of bucketWork,
  // then filled in one pass over the values.
  const ranks = rankScratch(2 * ps.length);
  let regions = 0;
  for (let k = 0; k < ps.length; k++) {
    const h = (n - 1) * ps[k]!;
    const i = Math.floor(h);
    ranks[2 * k] = i;
    ranks[2 * k + 1] = Math.min(n - 1, i + 1);
  }
  for (let r = 0; r < 2 * ps.length; r++) {
    let b = 0;
    let start = 0;
    while (start + counts[b]! <= ranks[r]!) start += counts[b++]!;
    if (bucketRegion[b] === 0) {
      const at = regions === 0 ? 0 : regionStart[regions - 1]! + counts[regionBucket[regions - 1]!]!;
      regionBucket[regions] = b;
      regionStart[regions] = at;
      regionFill[regions] = at;
      bucketRegion[b] = ++regions;
    }
  }
  const work = bucketWork;
  for (let i = 0; i < n; i++) {
    const region = bucketRegion[of[i]!]!;
    if (region !== 0) work[regionFill[region - 1]!++] = values[i]!;
  }
  for (let k = 0; k < ps.length; k++) {
    const h = (n - 1) * ps[k]!;
    const i = Math.floor(h);
    const lo = orderStatistic(values, i);
    out[k] = i + 1 >= n || h === i ? lo : lo + (h - i) * (orderStatistic(values, i + 1) - lo);
  }
  for (let r = 0; r < regions; r++) bucketRegion[regionBucket[r]!] = 0;
  return out;
}

// The r-th smallest of values (0-based), selected in the region of bucketWork that holds its
// bucket's values (see selectQuantiles). Selection reorders only that region.
function orderStatistic(values: Float64Array, r: number): number {
  const counts = bucketCounts;
  let b = 0;
  let start = 0;
  while (start + counts[b]! <= r) start += counts[b++]!;
  const region = bucketRegion[b]! - 1;
  const at = regionStart[region]!;
  return selectInRange(bucketWork, at, r - start + at, at + counts[b]!);
}

function rankScratch(length: number): Int32Array {
  if (rankWork.length < length) {
    rankWork = new Int32Array(length);
    regionBucket = new Int32Array(length);
    regionStart = new Int32Array(length);
    regionFill = new Int32Array(length);
  }
  return rankWork;
}

function minimumOf(values: Float64Array): number {
  let min = Infinity;
  for (let i = 0; i < values.length; i++) if (values[i]! < min) min = values[i]!;
  return min;
}

function maximumOf(values: Float64Array): number {
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) if (values[i]! > max) max = values[i]!;
  return max;
}

function growBuckets(n: number): void {
  bucketWork = new Float64Array(n);
  bucketOf = new Uint16Array(n);
}

const QUANTILE_BUCKETS = 1024;
const bucketCounts = new Int32Array(QUANTILE_BUCKETS);
let bucketWork = new Float64Array(0);
let bucketOf = new Uint16Array(0);
// Per bucket, 1 + the index of its region in bucketWork (0: not gathered); per region, its
// bucket, where it starts in bucketWork and how far it is filled. Reset after each call.
const bucketRegion = new Int32Array(QUANTILE_BUCKETS);
let rankWork = new Int32Array(8);
let regionBucket = new Int32Array(8);
let regionStart = new Int32Array(8);
let regionFill = new Int32Array(8);
