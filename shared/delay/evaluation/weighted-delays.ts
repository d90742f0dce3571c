// Route indexing, held-out splits and compression of flights into weighted triples.
//
// Integer-minute delays repeat, so millions of flights collapse into (route, period, minute,
// count) rows; the weighted likelihood over them equals the full-data likelihood exactly.
import type { WeightedData } from '../../inference/model';
import type { FlightColumns } from './flight-columns';

export interface RouteEntry {
  readonly origin: string;
  readonly destination: string;
  /** Flights of this route among the rows the index was built from. */
  readonly flights: number;
}

export interface RouteIndex {
  /** Sorted by origin, then destination, so route ids do not depend on row order. */
  readonly routes: readonly RouteEntry[];
  /** Route id of each flight, -1 for a flight not in the mask. */
  readonly routeOf: Int32Array;
}

/** Routes among the kept flights (keep[i] = 1), with a stable id per route. */
export function indexRoutes(flights: FlightColumns, keep: Uint8Array): RouteIndex {
  const n = flights.airports.length;
  const order = flights.airports.map((_, i) => i).sort((a, b) => (flights.airports[a]! < flights.airports[b]! ? -1 : 1));
  const rank = new Int32Array(n);
  order.forEach((airport, r) => (rank[airport] = r));
  const pairCount = new Float64Array(n * n);
  for (let i = 0; i < flights.length; i++) if (keep[i]) pairCount[rank[flights.origin[i]!]! * n + rank[flights.destination[i]!]!]! += 1;
  const pairId = new Int32Array(n * n).fill(-1);
  const routes: RouteEntry[] = [];
  for (let k = 0; k < n * n; k++) {
    if (pairCount[k]! === 0) continue;
    pairId[k] = routes.length;
    routes.push({ origin: flights.airports[order[Math.floor(k / n)]!]!, destination: flights.airports[order[k % n]!]!, flights: pairCount[k]! });
  }
  const routeOf = new Int32Array(flights.length).fill(-1);
  for (let i = 0; i < flights.length; i++) if (keep[i]) routeOf[i] = pairId[rank[flights.origin[i]!]! * n + rank[flights.destination[i]!]!]!;
  return { routes, routeOf };
}

/** The flights' days, split: every fifth calendar day from firstDay (the 5th, 10th, ...) is held out. */
export function isHeldOutDay(day: number, firstDay: number): boolean {
  return (day - firstDay) % 5 === 4;
}

/** A mask of the rows of `keep` that satisfy `select(day)`. */
export function selectByDay(flights: FlightColumns, keep: Uint8Array, select: (day: number) => boolean): Uint8Array {
  const out = new Uint8Array(flights.length);
  const memo = new Map<number, boolean>();
  for (let i = 0; i < flights.length; i++) {
    if (!keep[i]) continue;
    const day = flights.day[i]!;
    let chosen = memo.get(day);
    if (chosen === undefined) {
      chosen = select(day);
      memo.set(day, chosen);
    }
    if (chosen) out[i] = 1;
  }
  return out;
}

/**
 * Weighted triples with a period index (e.g. calendar month) per triple, so models with
 * period random effects can use them; the extra fields are ignored by models that do not.
 */
export interface PeriodWeightedData extends WeightedData {
  readonly periodCount: number;
  /** Period index of each triple, 0 <= period < periodCount. */
  readonly period: Int32Array;
  /** The label of each period, e.g. '2001-03'. */
  readonly periodLabels: readonly string[];
  /** Total flights (sum of count). */
  readonly flights: number;
}

/** Month label (YYYY-MM) of a day number. */
export function monthLabel(day: number): string {
  return new Date(day * 86_400_000).toISOString().slice(0, 7);
}

/**
 * Compresses the masked flights into (route, month, delay minute, count) triples, sorted by
 * route, then month, then delay. Delays must be whole minutes within [minDelay, maxDelay]
 * (the cleaning rule guarantees it); any other value throws, since silently rounding would
 * change the likelihood.
 */
export function compressDelays(
  flights: FlightColumns,
  index: RouteIndex,
  mask: Uint8Array,
  options: { minDelay: number; maxDelay: number; periodLabels?: readonly string[] },
): PeriodWeightedData {
  const labels = options.periodLabels ? [...options.periodLabels] : collectMonthLabels(flights, mask);
  const labelIndex = new Map(labels.map((l, i) => [l, i]));
  const span = options.maxDelay - options.minDelay + 1;
  const periodCount = labels.length;
  const groupCount = index.routes.length;
  if (groupCount * periodCount * span >= 2 ** 31) throw new RangeError('too many routes x periods x delay values to compress');
  const monthMemo = new Map<number, number>();
  let rows = 0;
  for (let i = 0; i < flights.length; i++) if (mask[i]) rows++;
  const keys = new Int32Array(rows);
  let r = 0;
  for (let i = 0; i < flights.length; i++) {
    if (!mask[i]) continue;
    const route = index.routeOf[i]!;
    if (route < 0) throw new RangeError(`flight ${i} is not in the route index`);
    const d = flights.delayMinutes[i]!;
    if (!Number.isInteger(d) || d < options.minDelay || d > options.maxDelay) throw new RangeError(`flight ${i}: delay ${d} is not a whole minute in [${options.minDelay}, ${options.maxDelay}]`);
    const day = flights.day[i]!;
    let p = monthMemo.get(day);
    if (p === undefined) {
      p = labelIndex.get(monthLabel(day));
      if (p === undefined) throw new RangeError(`flight ${i}: month ${monthLabel(day)} is not among the periods`);
      monthMemo.set(day, p);
    }
    keys[r++] = (route * periodCount + p) * span + (d - options.minDelay);
  }
  keys.sort();
  let distinct = 0;
  for (let i = 0; i < rows; i++) if (i === 0 || keys[i] !== keys[i - 1]) distinct++;
  const group = new Int32Array(distinct);
  const period = new Int32Array(distinct);
  const value = new Float64Array(distinct);
  const count = new Float64Array(distinct);
  let t = -1;
  for (let i = 0; i < rows; i++) {
    const k = keys[i]!;
    if (i === 0 || k !== keys[i - 1]) {
      t++;
      const gp = Math.floor(k / span);
      group[t] = Math.floor(gp / periodCount);
      period[t] = gp % periodCount;
      value[t] = (k % span) + options.minDelay;
    }
    count[t]! += 1;
  }
  return { groupCount, group, value, count, periodCount, period, periodLabels: labels, flights: rows };
}

function collectMonthLabels(flights: FlightColumns, mask: Uint8Array): string[] {
  const seen = new Set<string>();
  const days = new Set<number>();
  for (let i = 0; i < flights.length; i++) if (mask[i]) days.add(flights.day[i]!);
  for (const d of days) seen.add(monthLabel(d));
  return [...seen].sort();
}

