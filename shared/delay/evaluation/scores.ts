// Held-out scores for delay predictives: log predictive density, tail calibration, QQ table.
//
// Pure functions over weighted (group, value, count) data and a predictive per group given
// as posterior draws, so the same code scores the bundled fit and a user's own history.
import type { WeightedData } from '../../inference/model';
import type { DelayDistribution } from '../predictive';

/** Posterior draws for one group; a RoutePosterior is one. */
export interface DrawSet {
  readonly drawCount: number;
  draw(s: number): DelayDistribution;
}

export type PredictiveFor = (group: number) => DrawSet;

/** The thresholds the tail is scored at, in minutes. */
export const TAIL_THRESHOLDS_MINUTES = [15, 30, 60, 120, 180] as const;

/**
 * Whole-minute records: a recorded delay above t minutes is one of t+1, t+2, ..., which a
 * continuous model fitted to those integers puts above t + 0.5 (each integer k stands for
 * the interval [k - 0.5, k + 0.5)).
 */
export const CONTINUITY_OFFSET_MINUTES = 0.5;

function drawsOf(set: DrawSet): DelayDistribution[] {
  if (!(set.drawCount >= 1)) throw new RangeError('a predictive needs at least one draw');
  return Array.from({ length: set.drawCount }, (_, s) => set.draw(s));
}

export interface LogScore {
  /** Sum over flights of log p(y), p the posterior predictive density (mean over draws). */
  readonly totalNats: number;
  readonly flights: number;
  /** totalNats / flights: higher is better. -Infinity if any flight gets zero density. */
  readonly natsPerFlight: number;
}

/** log of the mean density over draws, in log space when the draws offer logPdf (no underflow far in a tail). */
let scratchLogs = new Float64Array(0);

function logMeanDensity(draws: readonly DelayDistribution[], y: number, logs: boolean): number {
  if (logs) {
    // Each draw's log density once (it is the costly call), then log-sum-exp.
    if (scratchLogs.length < draws.length) scratchLogs = new Float64Array(draws.length);
    let top = -Infinity;
    for (let s = 0; s < draws.length; s++) {
      const l = draws[s]!.logPdf!(y);
      scratchLogs[s] = l;
      if (l > top) top = l;
    }
    if (top === -Infinity) return -Infinity;
    let sum = 0;
    for (let s = 0; s < draws.length; s++) sum += Math.exp(scratchLogs[s]! - top);
    return top + Math.log(sum / draws.length);
  }
  let p = 0;
  for (const d of draws) p += d.pdf(y);
  return Math.log(p / draws.length);
}

/**
 * Held-out log predictive density: sum_i log( (1/S) sum_s p_s(y_i) ), per flight.
 * @example one flight at 0 under a single standard Gumbel draw gives natsPerFlight -1
 */
export function logPredictiveDensity(data: WeightedData, predictiveFor: PredictiveFor): LogScore {
  let total = 0;
  let flights = 0;
  let cachedGroup = -1;
  let draws: DelayDistribution[] = [];
  let logs = false;
  for (let i = 0; i < data.group.length; i++) {
    const g = data.group[i]!;
    if (g !== cachedGroup) {
      draws = drawsOf(predictiveFor(g));
      logs = draws.every((d) => d.logPdf);
      cachedGroup = g;
    }
    const y = data.value[i]!;
    const n = data.count[i]!;
    total += n * logMeanDensity(draws, y, logs);
    flights += n;
  }
  return { totalNats: total, flights, natsPerFlight: flights > 0 ? total / flights : NaN };
}

export interface TailRow {
  readonly minutes: number;
  /** Observed fraction of flights with a recorded delay above `minutes`. */
  readonly observed: number;
  /** Posterior predictive P(delay > minutes + 0.5), flight-weighted over the groups. */
  readonly predicted: number;
  /** 90% credible interval of that probability over parameter draws (5% and 95% quantiles). */
  readonly interval: readonly [number, number];
  /** (predicted - observed) / observed; null when nothing was observed above the threshold. */
  readonly relativeError: number | null;
  /** Whether the observed value lies inside the interval. */
  readonly covered: boolean;
}

/** Linear-interpolation quantile (type 7) of an ascending array; NaN for an empty one. */
export function quantileSorted(sorted: Float64Array, q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = q * (sorted.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (pos - lo) * (sorted[hi]! - sorted[lo]!);
}

interface GroupTally {
  readonly group: number;
  flights: number;
  readonly above: Float64Array;
}

function tallyGroups(data: WeightedData, thresholds: readonly number[]): Map<number, GroupTally> {
  const tallies = new Map<number, GroupTally>();
  for (let i = 0; i < data.group.length; i++) {
    const g = data.group[i]!;
    let t = tallies.get(g);
    if (!t) {
      t = { group: g, flights: 0, above: new Float64Array(thresholds.length) };
      tallies.set(g, t);
    }
    const n = data.count[i]!;
    t.flights += n;
    for (let k = 0; k < thresholds.length; k++) if (data.value[i]! > thresholds[k]!) t.above[k]! += n;
  }
  return tallies;
}

/**
 * Predicted P(delay > t) per draw, flight-weighted over a set of groups: row k, column s.
 * Draw s of every group is taken together, so quantities a draw shares across groups (a
 * future month's effect) move them together, as they would in that month.
 */
function pooledSurvivalByDraw(tallies: readonly GroupTally[], predictiveFor: PredictiveFor, thresholds: readonly number[]): { byDraw: Float64Array[]; flights: number } {
  let drawCount = -1;
  let flights = 0;
  let byDraw: Float64Array[] = [];
  for (const t of tallies) {
    const draws = drawsOf(predictiveFor(t.group));
    if (drawCount < 0) {
      drawCount = draws.length;
      byDraw = thresholds.map(() => new Float64Array(drawCount));
    } else if (draws.length !== drawCount) throw new RangeError('every group must have the same number of draws');
    flights += t.flights;
    for (let k = 0; k < thresholds.length; k++) {
      const x = thresholds[k]! + CONTINUITY_OFFSET_MINUTES;
      const row = byDraw[k]!;
      for (let s = 0; s < drawCount; s++) row[s]! += t.flights * draws[s]!.survival(x);
    }
  }
  for (const row of byDraw) for (let s = 0; s < row.length; s++) row[s]! /= flights;
  return { byDraw, flights };
}

function tailRows(tallies: readonly GroupTally[], predictiveFor: PredictiveFor, thresholds: readonly number[]): TailRow[] {
  const { byDraw, flights } = pooledSurvivalByDraw(tallies, predictiveFor, thresholds);
  return thresholds.map((minutes, k) => {
    let above = 0;
    for (const t of tallies) above += t.above[k]!;
    const observed = above / flights;
    const row = byDraw[k]!;
    let predicted = 0;
    for (let s = 0; s < row.length; s++) predicted += row[s]!;
    predicted /= row.length;
    const sorted = Float64Array.from(row).sort();
    const interval: [number, number] = [quantileSorted(sorted, 0.05), quantileSorted(sorted, 0.95)];
    return {
      minutes,
      observed,
      predicted,
      interval,
      relativeError: observed > 0 ? (predicted - observed) / observed : null,
      covered: observed >= interval[0] && observed <= interval[1],
    };
  });
}

export interface RouteTail {
  readonly group: number;
  readonly flights: number;
  readonly rows: readonly TailRow[];
}

export interface TailCalibration {
  readonly pooled: readonly TailRow[];
  /** The `busiest` groups with the most flights, busiest first. */
  readonly routes: readonly RouteTail[];
  /** Per threshold: the median over those routes of |relative error| (routes with nothing observed above it are left out). */
  readonly routeMedianAbsRelativeError: readonly { readonly minutes: number; readonly median: number | null; readonly routes: number }[];
}

/** Tail calibration, pooled over all groups and for each of the `busiest` largest groups. */
export function tailCalibration(
  data: WeightedData,
  predictiveFor: PredictiveFor,
  thresholds: readonly number[] = TAIL_THRESHOLDS_MINUTES,
  busiest = 50,
): TailCalibration {
  const tallies = [...tallyGroups(data, thresholds).values()];
  if (tallies.length === 0) throw new RangeError('tail calibration needs at least one flight');
  const pooled = tailRows(tallies, predictiveFor, thresholds);
  const top = [...tallies].sort((a, b) => b.flights - a.flights || a.group - b.group).slice(0, busiest);
  const routes = top.map((t) => ({ group: t.group, flights: t.flights, rows: tailRows([t], predictiveFor, thresholds) }));
  const routeMedianAbsRelativeError = thresholds.map((minutes, k) => {
    const errors = routes.map((r) => r.rows[k]!.relativeError).filter((e): e is number => e !== null).map(Math.abs);
    const sorted = Float64Array.from(errors).sort();
    return { minutes, median: sorted.length ? quantileSorted(sorted, 0.5) : null, routes: sorted.length };
  });
  return { pooled, routes, routeMedianAbsRelativeError };
}

export interface QqRow {
  readonly probability: number;
  /** The weighted empirical quantile of the recorded delays (lower quantile). */
  readonly observedMinutes: number;
  /** The quantile of the flight-weighted posterior predictive. */
  readonly predictedMinutes: number;
}

export const QQ_PROBABILITIES = [0.01, 0.05, 0.1, 0.25, 0.5, 0.75, 0.9, 0.95, 0.99, 0.995, 0.999] as const;

/**
 * A quantile-quantile table of the pooled predictive against the data. Predicted quantiles
 * solve F(x) = p by bisection on [lo, hi] minutes, F the flight-weighted mixture of the
 * groups' predictives (mean over draws).
 */
export function qqTable(
  data: WeightedData,
  predictiveFor: PredictiveFor,
  probabilities: readonly number[] = QQ_PROBABILITIES,
  bracket: readonly [number, number] = [-240, 2880],
): QqRow[] {
  const tallies = [...tallyGroups(data, []).values()];
  const flights = tallies.reduce((a, t) => a + t.flights, 0);
  if (flights === 0) throw new RangeError('a QQ table needs at least one flight');
  const weighted = tallies.map((t) => ({ w: t.flights / flights, draws: drawsOf(predictiveFor(t.group)) }));
  const cdf = (x: number): number => {
    let f = 0;
    for (const { w, draws } of weighted) {
      let c = 0;
      for (const d of draws) c += d.cdf(x);
      f += (w * c) / draws.length;
    }
    return f;
  };
  const order = Array.from(data.value.keys()).sort((a, b) => data.value[a]! - data.value[b]!);
  return probabilities.map((p) => {
    let acc = 0;
    let observedMinutes = NaN;
    for (const i of order) {
      acc += data.count[i]!;
      if (acc >= p * flights) {
        observedMinutes = data.value[i]!;
        break;
      }
    }
    let [lo, hi] = bracket;
    for (let it = 0; it < 50 && hi - lo > 1e-3; it++) {
      const mid = 0.5 * (lo + hi);
      if (cdf(mid) < p) lo = mid;
      else hi = mid;
    }
    return { probability: p, observedMinutes, predictedMinutes: 0.5 * (lo + hi) };
  });
}
