// Turns the parser's trips and the risk engine's scores into the views the screens show.
//
// Kept apart from the handlers so the mapping is one pure function of its inputs.
import type { Connection, Leg, ParsedTrips, Trip } from '../itinerary/types';
import type { RouteEvidence, ScoredConnection, ScoredTrip, ScoredTrips } from '../risk/types';
import type { ConnectionView, GroupView, LegView, RouteData, TripView } from './analysis-schema';

const abbreviationFormats = new Map<string, Intl.DateTimeFormat>();
/** Abbreviations by zone and UTC half hour: zones change offset on the hour or the half hour. */
const abbreviationByHour = new Map<string, string>();

/** The zone's short name at an instant ('EST', 'CDT'; 'GMT+1' where the locale has none). */
export function zoneAbbreviation(zone: string, utcMs: number): string {
  // Keyed by half hour, since a few zones (e.g. Lord Howe) switch on the half hour.
  const key = `${zone}|${Math.floor(utcMs / 1_800_000)}`;
  const known = abbreviationByHour.get(key);
  if (known !== undefined) return known;
  const name = formatAbbreviation(zone, utcMs);
  if (abbreviationByHour.size > 50_000) abbreviationByHour.clear();
  abbreviationByHour.set(key, name);
  return name;
}

function formatAbbreviation(zone: string, utcMs: number): string {
  let format = abbreviationFormats.get(zone);
  if (!format) {
    try {
      format = new Intl.DateTimeFormat('en-US', { timeZone: zone, timeZoneName: 'short', hour: 'numeric' });
    } catch {
      return zone;
    }
    abbreviationFormats.set(zone, format);
  }
  return format.formatToParts(new Date(utcMs)).find((p) => p.type === 'timeZoneName')?.value ?? zone;
}

/** Whole calendar days from one local `YYYY-MM-DD…` date to another. */
export function calendarDaysBetween(fromLocal: string, toLocal: string): number {
  const day = (s: string) => Date.UTC(Number(s.slice(0, 4)), Number(s.slice(5, 7)) - 1, Number(s.slice(8, 10)));
  return Math.round((day(toLocal) - day(fromLocal)) / 86_400_000);
}

export function toLegView(leg: Leg): LegView {
  return {
    flight: leg.flight,
    from: leg.from,
    to: leg.to,
    departLocal: leg.departLocal,
    arriveLocal: leg.arriveLocal,
    departUtc: leg.departUtc,
    arriveUtc: leg.arriveUtc,
    departZoneAbbr: zoneAbbreviation(leg.fromZone, leg.departUtcMs),
    arriveZoneAbbr: zoneAbbreviation(leg.toZone, leg.arriveUtcMs),
    arriveDayOffset: calendarDaysBetween(leg.departLocal, leg.arriveLocal),
    durationMinutes: Math.round((leg.arriveUtcMs - leg.departUtcMs) / 60_000),
    line: leg.line,
    booking: leg.booking,
  };
}

function travelMinutesOf(trip: Trip): number {
  const first = trip.legs[0];
  const last = trip.legs[trip.legs.length - 1];
  return first && last ? Math.round((last.arriveUtcMs - first.departUtcMs) / 60_000) : 0;
}

function routeData(e: RouteEvidence | null): RouteData[] {
  return e ? [{ origin: e.origin, destination: e.destination, kind: e.kind, pooling: e.pooling, flights: e.flights }] : [];
}

function unscoredReason(c: ScoredConnection): string | null {
  if (c.pMake !== null) return null;
  if (c.flags.includes('stopover')) return 'A stopover of more than 24 hours is not scored as a connection.';
  if (c.flags.includes('negative-layover')) return 'The next flight leaves before this one lands; correct the times to score it.';
  return 'Not scored.';
}

/** The fields a connection has whether or not it was scored. */
function connectionBase(c: Connection | ScoredConnection, index: number) {
  return { index, airport: c.airport, departAirport: c.departAirport, inboundLeg: c.inboundLeg, layoverMinutes: c.layoverMinutes, flags: [...c.flags] };
}

function scoredConnectionView(c: ScoredConnection, index: number): ConnectionView {
  return {
    ...connectionBase(c, index),
    mctMinutes: c.mctMinutes,
    pMake: c.pMake,
    pMakeLo: c.pMakeInterval?.[0] ?? null,
    pMakeHi: c.pMakeInterval?.[1] ?? null,
    minLayoverMinutes: c.minLayoverMinutes,
    marginMinutes: c.marginMinutes,
    data: [...routeData(c.inbound), ...routeData(c.outbound)],
    unscoredReason: unscoredReason(c),
    connectionType: c.connectionType,
    mctSource: c.mctSource,
    warnings: c.warnings.map((w) => ({ code: w.code, message: w.message })),
  };
}

function unscoredConnectionView(c: Connection, index: number, reason: string): ConnectionView {
  return {
    ...connectionBase(c, index),
    mctMinutes: null,
    pMake: null,
    pMakeLo: null,
    pMakeHi: null,
    minLayoverMinutes: null,
    marginMinutes: null,
    data: [],
    unscoredReason: reason,
    connectionType: null,
    mctSource: null,
    warnings: [],
  };
}

/** The fields a trip has whether or not it was scored. */
function tripBase(t: Trip | ScoredTrip) {
  return { id: t.id, traveler: t.traveler, trip: t.trip, option: t.option, legs: t.legs.map(toLegView), deadlineLocal: t.deadlineLocal };
}

/** The view of a trip the engine scored. */
export function scoredTripView(t: ScoredTrip): TripView {
  return {
    ...tripBase(t),
    connections: t.connections.map(scoredConnectionView),
    totalTravelMinutes: t.travelMinutes,
    pAllConnections: t.pAllConnections,
    pAllLo: t.pAllConnectionsInterval[0],
    pAllHi: t.pAllConnectionsInterval[1],
    expectedArrivalDelayMinutes: t.expectedArrivalDelayMinutes,
    pArriveByDeadline: t.pArriveByDeadline,
    pOnTime: t.pOnTime,
    onTimeBasis: t.onTimeBasis,
    arrivalDelayP90Minutes: t.arrivalDelayQuantilesMinutes.p90,
    paretoOptimal: t.paretoOptimal,
    optionGroup: t.optionGroup,
    optionRank: t.optionRank,
    optionCount: t.optionCount,
  };
}

/** The view of a trip that was read but not scored (no bundle available): numbers are null. */
export function unscoredTripView(t: Trip, optionCount: number, reason: string): TripView {
  return {
    ...tripBase(t),
    connections: t.connections.map((c, index) => unscoredConnectionView(c, index, reason)),
    totalTravelMinutes: travelMinutesOf(t),
    pAllConnections: null,
    pAllLo: null,
    pAllHi: null,
    expectedArrivalDelayMinutes: null,
    pArriveByDeadline: null,
    pOnTime: null,
    onTimeBasis: null,
    arrivalDelayP90Minutes: null,
    paretoOptimal: false,
    optionGroup: `${t.traveler}\u0000${t.trip}`,
    optionRank: 1,
    optionCount,
  };
}

export function unscoredTripViews(parsed: ParsedTrips, reason: string): TripView[] {
  const counts = new Map<string, number>();
  for (const t of parsed.trips) counts.set(`${t.traveler}\u0000${t.trip}`, (counts.get(`${t.traveler}\u0000${t.trip}`) ?? 0) + 1);
  return parsed.trips.map((t) => unscoredTripView(t, counts.get(`${t.traveler}\u0000${t.trip}`) ?? 1, reason));
}

/** Travelers whose counted (best-ranked) option misses at least one connection with P above `minMiss`. */
function atRiskTravelers(trips: readonly ScoredTrip[], minMiss: number): GroupView['atRisk'] {
  return trips
    .filter((t) => t.optionRank === 1 && t.connections.some((c) => c.pMake !== null))
    .map((t) => ({ traveler: t.traveler, tripId: t.id, pMiss: Math.min(1, Math.max(0, 1 - t.pAllConnections)) }))
    .filter((r) => r.pMiss > minMiss)
    .sort((a, b) => b.pMiss - a.pMiss || a.traveler.localeCompare(b.traveler));
}

export function groupView(scored: ScoredTrips): GroupView {
  const g = scored.group;
  return {
    travelers: g.travelers,
    expectedMisconnecting: g.expectedMisconnecting,
    expectedMisconnectingStdError: g.expectedMisconnectingStdError,
    simulations: g.simulations,
    countDistribution: [...g.countDistribution],
    pAtLeast: (['1', '2', '3', '4', '5'] as const).map((k) => ({ k: Number(k), p: g.pAtLeast[k] })),
    topConnections: g.topConnections.map((c) => ({
      airport: c.airport,
      inboundFlight: c.inboundFlight,
      inboundDate: c.inboundDate,
      outboundFlight: c.outboundFlight,
      travelers: c.travelers,
      pMiss: c.pMiss,
      expectedMisses: c.expectedMisses,
    })),
    atRisk: atRiskTravelers(scored.trips, 1 - scored.target),
  };
}
