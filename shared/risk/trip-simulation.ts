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
  const arrivalStreams = flights.map((f) => (f.arrival ? flightStream(seed, f.key, 'arrival') : null));
  const departureStreams = flights.map((f) => (f.departure ? flightStream(seed, f.key, 'departure') : null));
  const a = new Float64Array(flights.length);
  const d = new Float64Array(flights.length);
  const delays = trips.map(() => new Float64Array(simulations));
  const missed = trips.map(() => new Uint8Array(simulations));
  for (let i = 0; i < simulations; i++) {
    const t = i % draws;
    for (let f = 0; f < flights.length; f++) {
      const flight = flights[f];
      const ra = arrivalStreams[f];
      const rd = departureStreams[f];
      if (flight?.arrival && ra) a[f] = flight.arrival.table(t).inverse(ra.uniform());
      if (flight?.departure && rd) d[f] = flight.departure.table(t).inverse(rd.uniform());
    }
    for (let k = 0; k < trips.length; k++) {
      const trip = trips[k];
      if (!trip) continue;
      let shift = 0;
      let miss = 0;
      for (const c of trip.connections) {
        const shortfall = (a[c.inbound] ?? 0) - (d[c.outbound] ?? 0) - c.slackMinutes;
        if (shortfall > 0) {
          miss = 1;
          shift += Math.ceil(shortfall / trip.rebookGapMinutes) * trip.rebookGapMinutes;
        }
      }
      (delays[k] as Float64Array)[i] = (a[trip.lastFlight] ?? 0) + shift;
      (missed[k] as Uint8Array)[i] = miss;
    }
  }
  return trips.map((trip, k) => {
    const delay = delays[k] as Float64Array;
    let sum = 0;
    let within = 0;
    let byDeadline = 0;
    for (let i = 0; i < simulations; i++) {
      const x = delay[i] ?? 0;
      sum += x;
      if (x < ON_TIME_TOLERANCE_MINUTES) within++;
      if (trip.deadlineSlackMinutes !== null && x <= trip.deadlineSlackMinutes) byDeadline++;
    }
    return {
      simulations,
      arrivalDelay: delay,
      missed: missed[k] as Uint8Array,
      meanArrivalDelay: sum / simulations,
      pWithin15: within / simulations,
      pByDeadline: trip.deadlineSlackMinutes === null ? null : byDeadline / simulations,
    };
  });
}

/**
 * The p-quantile (Hyndman & Fan definition 7) of values, without sorting all of them: two
 * selections in a copy. NaN-free input assumed; empty input gives NaN.
 */
export function selectQuantile(values: Float64Array, p: number): number {
  const n = values.length;
  if (n === 0) return NaN;
  const work = Float64Array.from(values);
  const h = (n - 1) * p;
  const i = Math.floor(h);
  const lo = select(work, i);
  if (i + 1 >= n || h === i) return lo;
  // After selecting i, everything right of i is >= work[i]; the next order statistic is their minimum.
  let next = Infinity;
  for (let j = i + 1; j < n; j++) next = Math.min(next, work[j] ?? Infinity);
  return lo + (h - i) * (next - lo);
}

// Hoare's quickselect with a middle pivot: leaves the k-th smallest at index k.
function select(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (left < right) {
    const pivot = a[(left + right) >>> 1] ?? 0;
    let i = left;
    let j = right;
    while (i <= j) {
      while ((a[i] ?? 0) < pivot) i++;
      while ((a[j] ?? 0) > pivot) j--;
      if (i <= j) {
        const tmp = a[i] ?? 0;
        a[i] = a[j] ?? 0;
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k] ?? NaN;
}
