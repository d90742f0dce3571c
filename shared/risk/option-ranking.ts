// Ranks the alternative options of each traveller's trip and marks the Pareto-optimal ones.
//
// Criteria: P(on-time arrival) (higher is better), expected arrival delay and scheduled travel
// time (lower is better). An option is Pareto-optimal when no other option of the same trip is at
// least as good on all three and strictly better on one.
import type { ScoredTrip } from './types';

/** What ranking reads of a scored trip. */
type Unranked = Pick<ScoredTrip, 'traveler' | 'trip' | 'option' | 'pOnTime' | 'expectedArrivalDelayMinutes' | 'travelMinutes'>;

/** What ranking adds to a scored trip. */
export type OptionRank = Pick<ScoredTrip, 'optionGroup' | 'optionRank' | 'optionCount' | 'paretoOptimal'>;

/** The key shared by the options of one traveller's trip. */
export function optionGroupKey(traveler: string, trip: string): string {
  return JSON.stringify([traveler, trip]);
}

function dominates(b: Unranked, a: Unranked): boolean {
  const noWorse = b.pOnTime >= a.pOnTime && b.expectedArrivalDelayMinutes <= a.expectedArrivalDelayMinutes && b.travelMinutes <= a.travelMinutes;
  const better = b.pOnTime > a.pOnTime || b.expectedArrivalDelayMinutes < a.expectedArrivalDelayMinutes || b.travelMinutes < a.travelMinutes;
  return noWorse && better;
}

function compareOptions(a: Unranked, b: Unranked): number {
  if (a.pOnTime !== b.pOnTime) return b.pOnTime - a.pOnTime;
  if (a.expectedArrivalDelayMinutes !== b.expectedArrivalDelayMinutes) return a.expectedArrivalDelayMinutes - b.expectedArrivalDelayMinutes;
  if (a.travelMinutes !== b.travelMinutes) return a.travelMinutes - b.travelMinutes;
  return a.option < b.option ? -1 : a.option > b.option ? 1 : 0;
}

/**
 * optionGroup, optionRank (1 = best), optionCount and paretoOptimal of each trip, in the input
 * order (the caller builds each scored trip once, with these fields in it).
 */
export function rankOptions(trips: readonly Unranked[]): OptionRank[] {
  const groups = new Map<string, Unranked[]>();
  for (const trip of trips) {
    const key = optionGroupKey(trip.traveler, trip.trip);
    const list = groups.get(key);
    if (list) list.push(trip);
    else groups.set(key, [trip]);
  }
  const rank = new Map<Unranked, number>();
  for (const list of groups.values()) [...list].sort(compareOptions).forEach((t, i) => rank.set(t, i + 1));
  return trips.map((trip) => {
    const key = optionGroupKey(trip.traveler, trip.trip);
    const list = groups.get(key) ?? [trip];
    return {
      optionGroup: key,
      optionRank: rank.get(trip) ?? 1,
      optionCount: list.length,
      paretoOptimal: !list.some((other) => other !== trip && dominates(other, trip)),
    };
  });
}
