// The group view: how many travellers miss at least one connection, with its whole distribution,
// and the connections that contribute most.
//
// Each traveller counts once, on the best-ranked option of each of their trips. Travellers on
// the same flight share its simulated delay, so the count's spread includes their misses together.
import { flightKey, type TripSimulation } from './trip-simulation';
import type { GroupSummary, ScoredTrip, TopConnection } from './types';

const TOP_CONNECTIONS = 10;

/** What the counts need of a trip: who travels, and whether this is their best-ranked option. */
export type GroupMember = Pick<ScoredTrip, 'traveler' | 'id' | 'optionRank'>;

function travelerKey(trip: GroupMember): string {
  // Without a traveller name, each trip stands for its own traveller.
  return trip.traveler !== '' ? `t:${trip.traveler}` : `id:${trip.id}`;
}

export function summariseGroup(trips: readonly ScoredTrip[], sims: readonly TripSimulation[], simulations: number): GroupSummary {
  return { ...groupCounts(trips, sims, simulations), topConnections: topConnections(trips.filter((t) => t.optionRank === 1)) };
}

/**
 * The group summary but its top connections: what the simulation alone decides, so that scoring
 * can work it out while the connection work is still running on another thread.
 */
export function groupCounts(trips: readonly GroupMember[], sims: readonly TripSimulation[], simulations: number): Omit<GroupSummary, 'topConnections'> {
  const travelerIndex = new Map<string, number>();
  for (const trip of trips) if (!travelerIndex.has(travelerKey(trip))) travelerIndex.set(travelerKey(trip), travelerIndex.size);
  const travelers = travelerIndex.size;
  const chosen = trips.map((t, k) => ({ trip: t, sim: sims[k] })).filter((x) => x.trip.optionRank === 1);

  // Per traveller, whether any of their chosen trips missed a connection, simulation by
  // simulation (OR over the trips), added into the count of each simulation.
  const tripsOf = new Map<number, Uint8Array[]>();
  for (const x of chosen) {
    const w = travelerIndex.get(travelerKey(x.trip)) ?? 0;
    const list = tripsOf.get(w) ?? [];
    list.push(x.sim?.missed ?? new Uint8Array(simulations));
    tripsOf.set(w, list);
  }
  // Travellers whose trips share one simulation (booked together) share its row of misses:
  // each distinct row is added once, times the travellers it stands for.
  const counts = new Uint32Array(simulations);
  const travellersOf = new Map<Uint8Array, number>();
  for (const list of tripsOf.values()) {
    let row = list[0]!;
    if (list.length > 1) {
      row = Uint8Array.from(row);
      for (let t = 1; t < list.length; t++) {
        const other = list[t]!;
        for (let i = 0; i < simulations; i++) row[i] = row[i]! | other[i]!;
      }
    }
    travellersOf.set(row, (travellersOf.get(row) ?? 0) + 1);
  }
  for (const [row, w] of travellersOf) addRow(counts, row, w);
  const distribution = new Array<number>(travelers + 1).fill(0);
  let sum = 0;
  let sumSq = 0;
  for (let i = 0; i < simulations; i++) {
    const c = counts[i] ?? 0;
    distribution[c] = (distribution[c] ?? 0) + 1;
    sum += c;
    sumSq += c * c;
  }
  const expected = sum / simulations;
  const variance = Math.max(0, sumSq / simulations - expected * expected);
  const countDistribution = distribution.map((n) => n / simulations);
  const atLeast = (k: number) => countDistribution.slice(k).reduce((a, b) => a + b, 0);
  return {
    travelers,
    simulations,
    optionPolicy: 'best-ranked',
    expectedMisconnecting: expected,
    expectedMisconnectingStdError: Math.sqrt(variance / simulations),
    pAtLeast: { '1': atLeast(1), '2': atLeast(2), '3': atLeast(3), '4': atLeast(4), '5': atLeast(5) },
    countDistribution,
  };
}

// counts += w * row, in a function of its own: the loop is optimised after a few calls instead
// of waiting for on-stack replacement in a function called once per scoring run.
function addRow(counts: Uint32Array, row: Uint8Array, w: number): void {
  for (let i = 0; i < counts.length; i++) counts[i] = counts[i]! + w * row[i]!;
}

type TopEntry = { sample: Omit<TopConnection, 'travelers' | 'expectedMisses'>; who: Set<string> };

/**
 * The connections that contribute most expected misses, among the best-ranked options (pass
 * those). A connection is its pair of flights (flightKey). `legFlights[k][j]`, when given, is a
 * number for the flight of leg j of trips[k], equal for equal flightKeys (scoreTrips has them):
 * otherwise they are worked out here.
 */
export function topConnections(trips: readonly ScoredTrip[], legFlights?: readonly ArrayLike<number>[]): TopConnection[] {
  const flightsOf = legFlights ?? flightNumbers(trips);
  // By inbound flight, then outbound flight.
  const byPair = new Map<number, Map<number, TopEntry>>();
  const entries: TopEntry[] = [];
  trips.forEach((trip, k) => {
    const traveler = travelerKey(trip);
    const flights = flightsOf[k]!;
    for (const c of trip.connections) {
      if (!c.scored || c.pMake === null) continue;
      const inbound = trip.legs[c.inboundLeg];
      const outbound = trip.legs[c.inboundLeg + 1];
      if (!inbound || !outbound) continue;
      const inId = flights[c.inboundLeg]!;
      let byOutbound = byPair.get(inId);
      if (!byOutbound) byPair.set(inId, (byOutbound = new Map()));
      const outId = flights[c.inboundLeg + 1]!;
      let entry = byOutbound.get(outId);
      if (!entry) {
        entry = {
          sample: {
            airport: c.airport,
            inboundFlight: inbound.flight,
            inboundDate: inbound.departLocal.slice(0, 10),
            outboundFlight: outbound.flight,
            outboundDate: outbound.departLocal.slice(0, 10),
            pMiss: 1 - c.pMake,
          },
          who: new Set(),
        };
        byOutbound.set(outId, entry);
        entries.push(entry);
      }
      entry.who.add(traveler);
    }
  });
  return entries
    .map(({ sample, who }) => ({ ...sample, travelers: who.size, expectedMisses: who.size * sample.pMiss }))
    .sort(
      (a, b) =>
        b.expectedMisses - a.expectedMisses ||
        cmp(a.airport, b.airport) ||
        cmp(a.inboundDate, b.inboundDate) ||
        cmp(a.inboundFlight, b.inboundFlight) ||
        cmp(a.outboundFlight, b.outboundFlight),
    )
    .slice(0, TOP_CONNECTIONS);
}

// Each leg's flight as a number, equal for equal flightKeys.
function flightNumbers(trips: readonly ScoredTrip[]): Int32Array[] {
  const ids = new Map<string, number>();
  return trips.map((trip) =>
    Int32Array.from(trip.legs, (leg) => {
      const key = flightKey(leg);
      let id = ids.get(key);
      if (id === undefined) ids.set(key, (id = ids.size));
      return id;
    }),
  );
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
