// The plain sentences under the numbers, in natural frequencies.
import type { ConnectionView, RouteData } from '../../shared/api/analysis-schema';
import { naturalFrequency } from '../../shared/report/natural-frequency';

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** "About 1 in 8 travelers on this connection would miss it." */
export function missSentence(pMake: number): string {
  const miss = Math.min(1, Math.max(0, 1 - pMake));
  return `${capitalise(naturalFrequency(miss).text)} travelers on this connection would miss it.`;
}

function thousands(n: number): string {
  return n.toLocaleString('en-US');
}

/** What stands behind one route's posterior, in words. */
export function routeDataSentence(d: RouteData): string {
  const what = `${d.kind === 'arrival' ? 'Arrivals' : 'Departures'} ${d.origin}→${d.destination}`;
  if (d.pooling === 'route') return `${what}: ${thousands(d.flights)} flights seen in the data.`;
  if (d.pooling === 'airports') return `${what}: route not in the data, pooled from similar routes at the same airports.`;
  return `${what}: an airport not in the data, pooled from all routes (least certain).`;
}

export function targetSentence(c: ConnectionView, target: number): string {
  const t = `${Math.round(target * 100)}%`;
  if (c.pMake === null) return c.unscoredReason ?? 'Not scored.';
  if (c.minLayoverMinutes === null) return `No layover within reach gets this connection to the ${t} target.`;
  if (c.marginMinutes !== null && c.marginMinutes >= 0) return `Meets the ${t} target with ${c.marginMinutes} minutes to spare; ${c.minLayoverMinutes} minutes would be enough.`;
  return `Reaching the ${t} target needs a layover of at least ${c.minLayoverMinutes} minutes, ${c.marginMinutes === null ? '' : `${-c.marginMinutes} more than booked`}.`;
}
