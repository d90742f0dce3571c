// Sorting, filtering and risk bands for the trips table, as pure functions.
//
// A risk band is a word as well as a colour, so the screen never relies on colour alone.
import type { ConnectionView, TripView } from '../../shared/api/analysis-schema';

export type RiskBand = 'meets' | 'near' | 'below' | 'unscored';

/** Within this many percentage points under the target a connection counts as "near". */
export const NEAR_TARGET_POINTS = 0.1;

export function riskBand(p: number | null, target: number): RiskBand {
  if (p === null) return 'unscored';
  if (p >= target) return 'meets';
  if (p >= target - NEAR_TARGET_POINTS) return 'near';
  return 'below';
}

export const RISK_BAND_WORDS: Record<RiskBand, string> = {
  meets: 'Meets target',
  near: 'Just short',
  below: 'Well short',
  unscored: 'Not scored',
};

export type SortKey = 'risk' | 'traveler' | 'departure' | 'margin';

export const SORT_LABELS: Record<SortKey, string> = {
  risk: 'Riskiest first',
  margin: 'Smallest margin first',
  traveler: 'Traveler, A to Z',
  departure: 'Earliest departure first',
};

export interface TripFilter {
  /** Case-insensitive substring of the traveler's name. */
  readonly traveler: string;
  /** IATA code of any airport the trip touches; '' for all. */
  readonly airport: string;
  /** Show only trips with a connection short of the target. */
  readonly shortOnly: boolean;
}

export const NO_FILTER: TripFilter = { traveler: '', airport: '', shortOnly: false };

/** The trip's weakest scored connection probability, or its trip probability; null when unscored. */
export function tripRisk(trip: TripView): number | null {
  return trip.pAllConnections;
}

function smallestMargin(trip: TripView): number | null {
  let best: number | null = null;
  for (const c of trip.connections) if (c.marginMinutes !== null && (best === null || c.marginMinutes < best)) best = c.marginMinutes;
  return best;
}

function firstDeparture(trip: TripView): string {
  return trip.legs[0]?.departUtc ?? '';
}

export function filterTrips(trips: readonly TripView[], filter: TripFilter, target: number): TripView[] {
  const who = filter.traveler.trim().toLowerCase();
  const where = filter.airport.trim().toUpperCase();
  return trips.filter((t) => {
    if (who && !t.traveler.toLowerCase().includes(who)) return false;
    if (where && !t.legs.some((l) => l.from === where || l.to === where)) return false;
    if (filter.shortOnly && !t.connections.some((c) => c.pMake !== null && c.pMake < target)) return false;
    return true;
  });
}

/** Nulls (unscored) sort after every scored value; ties fall back to traveler then trip id. */
function compareNullable(a: number | null, b: number | null): number {
  if (a === null && b === null) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  return a - b;
}

export function sortTrips(trips: readonly TripView[], key: SortKey): TripView[] {
  const tie = (a: TripView, b: TripView) => a.traveler.localeCompare(b.traveler) || a.trip.localeCompare(b.trip) || a.option.localeCompare(b.option) || a.id.localeCompare(b.id);
  const by: Record<SortKey, (a: TripView, b: TripView) => number> = {
    risk: (a, b) => compareNullable(tripRisk(a), tripRisk(b)) || tie(a, b),
    margin: (a, b) => compareNullable(smallestMargin(a), smallestMargin(b)) || tie(a, b),
    traveler: tie,
    departure: (a, b) => firstDeparture(a).localeCompare(firstDeparture(b)) || tie(a, b),
  };
  return [...trips].sort(by[key]);
}

/** Every airport the trips touch, sorted, for the airport filter's choices. */
export function airportsOf(trips: readonly TripView[]): string[] {
  const set = new Set<string>();
  for (const t of trips) for (const l of t.legs) set.add(l.from).add(l.to);
  return [...set].sort();
}

/** Readable words for the parser's and engine's connection flags. */
export const FLAG_WORDS: Record<string, string> = {
  'below-mct': 'shorter than the minimum connecting time',
  'airport-change': 'change of airport',
  'separate-tickets': 'separate tickets: a missed connection is not protected',
  overnight: 'overnight connection',
  'negative-layover': 'next flight leaves before this one lands',
  'dst-change-during-trip': 'clocks change during the trip',
  stopover: 'stopover of more than 24 hours',
  'below-target': 'short of the target',
  'target-unreachable': 'no layover within reach meets the target',
  'pooled-route': 'estimate pooled from similar routes',
};

export function flagWords(flag: string): string {
  return FLAG_WORDS[flag] ?? flag.replace(/-/g, ' ');
}

export function connectionLabel(trip: TripView, c: ConnectionView): string {
  const inbound = trip.legs[c.inboundLeg];
  const outbound = trip.legs[c.inboundLeg + 1];
  return `${inbound?.flight ?? '?'} → ${outbound?.flight ?? '?'} at ${c.airport}`;
}
