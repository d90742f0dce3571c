// Facts about scored trips that both reports need: which option of each trip is counted,
// how a trip's route and a connection's flights read, and the place names of airports.
import { findAirport } from '../time/airports';
import type { ScoredConnection, ScoredTrip, ScoredTrips } from '../risk/types';

/**
 * The option of each trip the reports count: the best-ranked one, as the group summary does
 * (GroupSummary.optionPolicy 'best-ranked'); ties keep input order.
 */
export function countedTrips(scored: ScoredTrips): ScoredTrip[] {
  const best = new Map<string, ScoredTrip>();
  for (const trip of scored.trips) {
    const seen = best.get(trip.optionGroup);
    if (!seen || trip.optionRank < seen.optionRank) best.set(trip.optionGroup, trip);
  }
  return scored.trips.filter((t) => best.get(t.optionGroup) === t);
}

/** The trips grouped by optionGroup, in input order; each group's options ordered by rank. */
export function optionGroups(scored: ScoredTrips): ScoredTrip[][] {
  const groups = new Map<string, ScoredTrip[]>();
  for (const trip of scored.trips) {
    const list = groups.get(trip.optionGroup) ?? [];
    list.push(trip);
    groups.set(trip.optionGroup, list);
  }
  return [...groups.values()].map((g) => [...g].sort((a, b) => a.optionRank - b.optionRank));
}

/** "LHR → ORD → DEN", with both airports of an airport change ("LGA / JFK"). */
export function routeText(trip: ScoredTrip): string {
  const stops: string[] = [];
  trip.legs.forEach((leg, i) => {
    if (i === 0) stops.push(leg.from);
    else if (stops[stops.length - 1] !== leg.from) stops[stops.length - 1] = `${stops[stops.length - 1]} / ${leg.from}`;
    stops.push(leg.to);
  });
  return stops.join(' → ');
}

/** "UA 1432 → UA 587" */
export function connectionFlights(c: ScoredConnection): string {
  return `${c.inboundFlight} → ${c.outboundFlight}`;
}

/** "Chicago (ORD)", or the bare code when the airport table has no city for it. */
export function placeName(iata: string): string {
  const airport = findAirport(iata);
  return airport?.city ? `${airport.city} (${iata})` : iata;
}

/** The trip's connections that carry numbers (stopovers are not scored). */
export function scoredConnections(trip: ScoredTrip): (ScoredConnection & { readonly pMake: number })[] {
  return trip.connections.filter((c): c is ScoredConnection & { readonly pMake: number } => c.scored && c.pMake !== null);
}

/** "Mara Lindqvist · Lisbon workshop" plus " · option B" when the trip has options. */
export function tripLabel(trip: ScoredTrip): string {
  const parts = [trip.traveler, trip.trip].filter((s) => s !== '');
  if (trip.optionCount > 1) parts.push(`option ${trip.option}`);
  return parts.join(' · ');
}
