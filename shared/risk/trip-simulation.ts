// The seeded joint Monte Carlo behind trip delays, deadlines and the group count.
//
// One delay per unique flight (flight number, date, route) and kind per simulation, shared by
// every traveller and option on that flight; one posterior draw per route per simulation (joint
// draw t = i mod J on every route, so draws stay paired across routes). Each flight and kind has
// its own seeded stream, so a flight's delays do not depend on what else is in the input: that
// gives common random numbers when comparing options.
import { createRng, type Rng } from '../inference/rng';
import type { Leg } from '../itinerary/types';
import type { RouteTables } from './delay-table';

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
  /** Final arrival delay (minutes, rebookings included) per simulation. */
  readonly arrivalDelay: Float64Array;
  /** 1 where at least one connection was missed. */
  readonly missed: Uint8Array;
  readonly meanArrivalDelay: number;
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

/** Simulations per block (see simulateTrips). */
const SIMULATION_BLOCK = 256;

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
  const arrivalStreams = flights.map((f) => (f.arrival ? flightStream(seed, f.key, 'arrival') : null));
  const departureStreams = flights.map((f) => (f.departure ? flightStream(seed, f.key, 'departure') : null));
  // The trips flattened into typed arrays: the inner loop runs trips x connections x simulations times.
  const connStart = new Int32Array(trips.length + 1);
  trips.forEach((t, k) => (connStart[k + 1] = connStart[k]! + t.connections.length));
  const cIn = new Int32Array(connStart[trips.length]!);
  const cOut = new Int32Array(cIn.length);
  const cSlack = new Float64Array(cIn.length);
  const last = new Int32Array(trips.length);
  const gap = new Float64Array(trips.length);
  trips.forEach((t, k) => {
    t.connections.forEach((c, j) => {
      cIn[connStart[k]! + j] = c.inbound;
      cOut[connStart[k]! + j] = c.outbound;
      cSlack[connStart[k]! + j] = c.slackMinutes;
    });
    last[k] = t.lastFlight;
    gap[k] = t.rebookGapMinutes;
  });
  // Simulations run in blocks: each flight's delays for a block are drawn in one sweep, then
  // each trip reads its flights' rows, so every array is walked in order.
  const block = Math.min(n, SIMULATION_BLOCK);
  const a = new Float64Array(flights.length * block);
  const d = new Float64Array(flights.length * block);
  const delays = new Float64Array(trips.length * n);
  const missed = new Uint8Array(trips.length * n);
  for (let i0 = 0; i0 < n; i0 += block) {
    const size = Math.min(block, n - i0);
    for (let f = 0; f < flights.length; f++) {
      const flight = flights[f]!;
      const row = f * block;
      if (flight.arrival) {
        const rng = arrivalStreams[f]!;
        for (let j = 0; j < size; j++) a[row + j] = Math.min(MAX_SIMULATED_DELAY_MINUTES, flight.arrival.table((i0 + j) % draws).inverse(rng.uniform()));
      }
      if (flight.departure) {
        const rng = departureStreams[f]!;
        for (let j = 0; j < size; j++) d[row + j] = Math.min(MAX_SIMULATED_DELAY_MINUTES, flight.departure.table((i0 + j) % draws).inverse(rng.uniform()));
      }
    }
    for (let k = 0; k < trips.length; k++) {
      const g = gap[k]!;
      const out = k * n + i0;
      const lastRow = last[k]! * block;
      for (let j = 0; j < size; j++) delays[out + j] = 0;
      for (let c = connStart[k]!, end = connStart[k + 1]!; c < end; c++) {
        const inRow = cIn[c]! * block;
        const outRow = cOut[c]! * block;
        const slack = cSlack[c]!;
        for (let j = 0; j < size; j++) {
          const shortfall = a[inRow + j]! - d[outRow + j]! - slack;
          if (shortfall > 0) {
            missed[out + j] = 1;
            delays[out + j] = delays[out + j]! + Math.ceil(shortfall / g) * g;
          }
        }
      }
      for (let j = 0; j < size; j++) delays[out + j] = delays[out + j]! + a[lastRow + j]!;
    }
  }
  return trips.map((trip, k) => {
    const delay = delays.subarray(k * n, (k + 1) * n);
    let sum = 0;
    let within = 0;
    let byDeadline = 0;
    const slack = trip.deadlineSlackMinutes;
    for (let i = 0; i < n; i++) {
      const x = delay[i]!;
      sum += x;
      if (x < ON_TIME_TOLERANCE_MINUTES) within++;
      if (slack !== null && x <= slack) byDeadline++;
    }
    return {
      simulations: n,
      arrivalDelay: delay,
      missed: missed.subarray(k * n, (k + 1) * n),
      meanArrivalDelay: sum / n,
      pWithin15: within / n,
      pByDeadline: slack === null ? null : byDeadline / n,
    };
  });
}

/**
 * Quantiles (Hyndman & Fan definition 7) of values at each p, without sorting them all:
 * selections in one copy. NaN-free input assumed; empty input gives NaN.
 * @example selectQuantiles(Float64Array.of(3, 1, 2), [0.5]) // returns [2]
 */
export function selectQuantiles(values: Float64Array, ps: readonly number[]): number[] {
  const n = values.length;
  if (n === 0) return ps.map(() => NaN);
  const work = Float64Array.from(values);
  return ps.map((p) => {
    const h = (n - 1) * p;
    const i = Math.floor(h);
    const lo = select(work, i);
    if (i + 1 >= n || h === i) return lo;
    // After selecting i, everything right of i is >= work[i]; the next order statistic is their minimum.
    let next = Infinity;
    for (let j = i + 1; j < n; j++) if (work[j]! < next) next = work[j]!;
    return lo + (h - i) * (next - lo);
  });
}

// Hoare's quickselect with a middle pivot: leaves the k-th smallest at index k, smaller ones left of it.
function select(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (left < right) {
    const pivot = a[(left + right) >>> 1]!;
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const tmp = a[i]!;
        a[i] = a[j]!;
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k]!;
}
