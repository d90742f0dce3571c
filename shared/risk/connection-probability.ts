// P(make) of one connection, its credible interval, the minimum layover for a target, and the
// curves the UI charts (P(make) against layover; the predictive distribution of the margin).
//
// A connection is made when A - D <= layover - MCT (A: inbound arrival delay, D: outbound
// departure delay, independent given the parameters). Per posterior draw,
//   P(A - D <= m) = integral f_D(d) F_A(m + d) dd,
// by the trapezoid rule on the whole-minute grid of delay-table.ts with exact cell masses of D.
// The posterior predictive is the mean over draws; the credible interval is the central quantile
// range across draws. The result is monotone in m by construction (non-negative weights times a
// CDF), which the bisection for the minimum layover relies on.
import { FAR_FRACTION, FAR_MASK, FAR_SHIFT, type DrawTable, type RouteTables } from './delay-table';
import { selectQuantile } from './order-statistics';

/** Longest layover the minimum-layover search considers (minutes): a longer gap is a stopover. */
export const MAX_LAYOVER_MINUTES = 1440;

/**
 * P(A - D <= m) under one draw, for a whole-minute m.
 *
 * Every term w_i F_A(m + d_i) is non-decreasing in m and the terms are always added in the same
 * order, so the floating-point sum is non-decreasing in m too (rounding is monotone): the exact
 * minimum-layover check relies on that.
 */
export function drawMakeProbability(arrival: DrawTable, departure: DrawTable, m: number): number {
  drawMakeProbabilityInto(arrival, departure, m, oneValue, 0);
  return oneValue[0]!;
}

/** drawMakeProbability written into out[t]: no value returned from a call, none boxed. */
export function drawMakeProbabilityInto(arrival: DrawTable, departure: DrawTable, m: number, out: Float64Array, t: number): void {
  const shift = m + departure.lo - arrival.lo;
  const h = departure.step;
  const inStart = Math.min(departure.coreLength, Math.max(0, Math.ceil(-shift / h)));
  partial[0] = departure.lowMass * arrival.cdfAt(m + departure.lo);
  finishSum(arrival, departure, m, inStart, 0, out, t);
}

// The running sums handed to finishSum (a double passed to a call left out of line is boxed).
const partial = new Float64Array(2);
const oneValue = new Float64Array(1);

/**
 * drawMakeProbability at two margins in one pass over D's weights where both read A's
 * whole-minute table (about 0.7 of the time of two passes: the two sums do not wait on each
 * other). Each margin's terms are added in the same order as drawMakeProbability adds them,
 * starting from the same first term and ending in the same finishSum, so each result is equal
 * to it exactly. Writes P(m0) into out0[t] and P(m1) into out1[t].
 */
export function drawMakeProbabilityPair(arrival: DrawTable, departure: DrawTable, m0: number, m1: number, out0: Float64Array, out1: Float64Array, t: number): void {
  const lo = departure.lo;
  const coreLength = departure.coreLength;
  const h = departure.step;
  const nA = arrival.cdf.length;
  const shift0 = m0 + lo - arrival.lo;
  const shift1 = m1 + lo - arrival.lo;
  const in0 = Math.min(coreLength, Math.max(0, Math.ceil(-shift0 / h)));
  const in1 = Math.min(coreLength, Math.max(0, Math.ceil(-shift1 / h)));
  const from = Math.max(in0, in1);
  const to = Math.min(Math.max(in0, Math.min(coreLength, Math.ceil((nA - shift0) / h))), Math.max(in1, Math.min(coreLength, Math.ceil((nA - shift1) / h))));
  let sum0 = departure.lowMass * arrival.cdfAt(m0 + lo);
  let sum1 = departure.lowMass * arrival.cdfAt(m1 + lo);
  if (to <= from) {
    partial[0] = sum0;
    partial[1] = sum1;
    finishSum(arrival, departure, m0, in0, 0, out0, t);
    finishSum(arrival, departure, m1, in1, 1, out1, t);
    return;
  }
  const w = departure.weight;
  const fa = arrival.cdf;
  // Each margin's core terms before the shared run, the shared run, then each margin's rest.
  for (let i = in0; i < from; i++) sum0 += w[i]! * fa[i * h + shift0]!;
  for (let i = in1; i < from; i++) sum1 += w[i]! * fa[i * h + shift1]!;
  for (let i = from; i < to; i++) {
    const wi = w[i]!;
    const x = i * h;
    sum0 += wi * fa[x + shift0]!;
    sum1 += wi * fa[x + shift1]!;
  }
  partial[0] = sum0;
  partial[1] = sum1;
  finishSum(arrival, departure, m0, to, 0, out0, t);
  finishSum(arrival, departure, m1, to, 1, out1, t);
}

// drawMakeProbability's sum carried on from core point `from` (at or past the first on A's
// grid), partial[slot] holding the terms before it: the rest of the core, the tail nodes and
// the mass beyond, the result written into out[t].
function finishSum(arrival: DrawTable, departure: DrawTable, m: number, from: number, slot: number, out: Float64Array, t: number): void {
  let sum = partial[slot]!;
  const lo = departure.lo;
  const shift = m + lo - arrival.lo;
  const fa = arrival.cdf;
  const nA = fa.length;
  const w = departure.weight;
  // The whole-minute core of D, then its sparse tail nodes.
  const coreLength = departure.coreLength;
  const h = departure.step;
  const inEnd = Math.max(from, Math.min(coreLength, Math.ceil((nA - shift) / h)));
  // Core points below A's grid meet F_A = 0 and add nothing; past A's whole-minute table come its
  // far points, then F(hi_A). Each case adds its own product. (farInterpolate's formula is
  // written out in the loops: a call V8 left out of line returned every value boxed.)
  for (let i = from; i < inEnd; i++) sum += w[i]! * fa[i * h + shift]!;
  const { far, top, hi: hiA, beyondHi } = arrival;
  const farEnd = Math.max(inEnd, Math.min(coreLength, Math.ceil((hiA - m - lo) / h)));
  for (let i = inEnd; i < farEnd; i++) {
    const offset = m + lo + i * h - top;
    const j = offset >> FAR_SHIFT;
    const f0 = far[j]!;
    sum += w[i]! * (f0 + (far[j + 1]! - f0) * ((offset & FAR_MASK) * FAR_FRACTION));
  }
  for (let i = farEnd; i < coreLength; i++) sum += w[i]! * beyondHi;
  // The tail nodes ascend, so they fall into runs: below A's grid (F_A = 0, nothing to add), on
  // its whole-minute table, among its far points, past hi_A. A loop per run rather than a branch
  // per node; the terms are added in the same order either way.
  const tail = departure.tailIndex;
  const tw = departure.tailWeight;
  const nTail = tail.length;
  let k = 0;
  while (k < nTail && tail[k]! + shift < 0) k++;
  for (; k < nTail && tail[k]! + shift < nA; k++) sum += tw[k]! * fa[tail[k]! + shift]!;
  for (; k < nTail && m + lo + tail[k]! < hiA; k++) {
    const offset = m + lo + tail[k]! - top;
    const b = offset >> FAR_SHIFT;
    const f0 = far[b]!;
    sum += tw[k]! * (f0 + (far[b + 1]! - f0) * ((offset & FAR_MASK) * FAR_FRACTION));
  }
  for (; k < nTail; k++) sum += tw[k]! * beyondHi;
  // D's mass beyond its grid meets F_A(m + hi_D) or more: a lower bound, short by under S_D(hi_D).
  sum += departure.highMass * arrival.cdfAt(m + departure.hi);
  // A kink of F_A (where A's density jumps by J, at x) puts one in the integrand at d = x - m,
  // its slope jumping by J f_D(d): the trapezoid with step h then errs by -h^2 J f_D(d) B2(theta) / 2,
  // theta = d's place between its two nodes, B2 the Bernoulli polynomial theta^2 - theta + 1/6
  // (Euler-Maclaurin for a piecewise smooth integrand; checked against direct integration in the
  // tests). Added back here, with f_D read off D's weights: even at a step of 1 minute a severe
  // component that starts with a high density was off by 1e-4 without it.
  const kinks = arrival.kinks;
  for (let k = 0; k < kinks.length; k += 2) {
    const u = (kinks[k]! - m - lo) / h;
    const j = Math.floor(u);
    if (j < 1 || j + 1 >= coreLength - 2) continue;
    const theta = u - j;
    const density = ((1 - theta) * w[j]! + theta * w[j + 1]!) / h;
    sum += (h * h * kinks[k + 1]! * density * (theta * theta - theta + 1 / 6)) / 2;
  }
  out[t] = Math.min(1, sum);
}

/**
 * The narrowest feature of the two draws a density table integrates must be this many times
 * its step (minutes). Measured against the logistic closed form for Gumbel pairs
 * (test/shared/risk/quadrature-step.test.ts): at 2.5 the error stays at that of 1-minute
 * tables (1e-5 to 2e-5, from the CDF table); at 1.5 it reached 1.2e-3. The trapezoid's error
 * falls exponentially in scale / step (Trefethen & Weideman 2014, section 3), but a Gumbel's
 * double-exponential lower tail makes the rate slower than its scale alone suggests.
 */
const STEP_SCALE_RATIO = 2.5;

/**
 * The departure table's step for a pair of draws whose narrowest feature is `scale` minutes wide
 * (NaN: 1), `jumps` when either density jumps somewhere. A jump is corrected for to second order
 * (delay-table.ts, finishSum); the third-order error left grows like step^3 times the jump, so
 * such pairs stay at 2 minutes at most: at 4 a severe component's start was off by 1e-4.
 */
export function quadratureStep(scale: number, jumps: boolean): number {
  const step = scale >= 4 * STEP_SCALE_RATIO ? 4 : scale >= 2 * STEP_SCALE_RATIO ? 2 : 1;
  return jumps ? Math.min(2, step) : step;
}

/** The inbound arrival posterior and the outbound departure posterior of one connection. */
export class ConnectionPair {
  readonly draws: number;
  private readonly memo = new Map<number, Float64Array>();
  /** Each draw's departure-table step (0 until asked for). */
  private readonly steps: Uint8Array;

  constructor(
    readonly arrival: RouteTables,
    readonly departure: RouteTables,
  ) {
    if (arrival.draws !== departure.draws) throw new RangeError(`both routes must use the same joint draws (${arrival.draws} vs ${departure.draws})`);
    if (arrival.posterior.kind !== 'arrival' || departure.posterior.kind !== 'departure') {
      throw new RangeError('a connection pairs the inbound arrival posterior with the outbound departure posterior');
    }
    this.draws = arrival.draws;
    this.steps = new Uint8Array(this.draws);
  }

  /**
   * Joint draw t's departure table, with the step the narrower of its two draws allows
   * (quadratureStep of their featureScale).
   */
  departureTable(t: number): DrawTable {
    let step = this.steps[t]!;
    if (step === 0) {
      step = quadratureStep(Math.min(this.arrival.featureScale(t), this.departure.featureScale(t)), this.arrival.jumps(t) || this.departure.jumps(t));
      this.steps[t] = step;
    }
    return this.departure.table(t, step);
  }

  /**
   * P_t(A - D <= m) for every joint draw t, m a whole number of minutes (not rounded: a
   * fractional m is a RangeError, NaN gives NaN). Memoised per m.
   */
  drawProbabilities(m: number): Float64Array {
    if (Number.isNaN(m)) return new Float64Array(this.draws).fill(NaN);
    if (!Number.isInteger(m)) throw new RangeError(`the margin must be whole minutes, got ${m}`);
    let out = this.memo.get(m);
    if (!out) {
      out = new Float64Array(this.draws);
      for (let t = 0; t < this.draws; t++) drawMakeProbabilityInto(this.arrival.table(t), this.departureTable(t), m, out, t);
      this.memo.set(m, out);
    }
    return out;
  }

  /**
   * Works out drawProbabilities at several whole-minute margins ahead, two at a time in one pass
   * where it can (drawMakeProbabilityPair): the same values as asking for each in turn. A
   * fractional margin is a RangeError, as there; NaN is skipped (it gives NaN, never memoised).
   */
  prepare(margins: readonly number[]): void {
    for (const m of margins) if (!Number.isNaN(m) && !Number.isInteger(m)) throw new RangeError(`the margin must be whole minutes, got ${m}`);
    const todo = [...new Set(margins)].filter((m) => Number.isInteger(m) && !this.memo.has(m)).sort((a, b) => a - b);
    let k = 0;
    for (; k + 1 < todo.length; k += 2) {
      const m0 = todo[k]!;
      const m1 = todo[k + 1]!;
      const out0 = new Float64Array(this.draws);
      const out1 = new Float64Array(this.draws);
      for (let t = 0; t < this.draws; t++) drawMakeProbabilityPair(this.arrival.table(t), this.departureTable(t), m0, m1, out0, out1, t);
      this.memo.set(m0, out0);
      this.memo.set(m1, out1);
    }
    if (k < todo.length) this.drawProbabilities(todo[k]!);
  }

  /** drawProbabilities at the worked-out margin nearest m, if any (ties: the lower). */
  nearestKnown(m: number): Float64Array | undefined {
    let best: Float64Array | undefined;
    let distance = Infinity;
    for (const [known, values] of this.memo) {
      const d = Math.abs(known - m);
      if (d < distance || (d === distance && known < m)) {
        distance = d;
        best = values;
      }
    }
    return best;
  }

  /** Whether drawProbabilities(m) is already worked out. */
  has(m: number): boolean {
    return this.memo.has(m);
  }

  /** Posterior predictive P(A - D <= m). */
  probability(m: number): number {
    return mean(this.drawProbabilities(m));
  }
}

/**
 * Posterior predictive P(make) at a layover. Layover and MCT in whole minutes; NaN gives NaN.
 * @example pMakeAtLayover(pair, 75, 45) // P(A - D <= 30)
 */
export function pMakeAtLayover(pair: ConnectionPair, layoverMinutes: number, mctMinutes: number): number {
  return pair.probability(layoverMinutes - mctMinutes);
}

/** Central credible interval of P(make) across draws at `level` (e.g. 0.9 gives 5%-95%). */
export function pMakeIntervalAtLayover(pair: ConnectionPair, layoverMinutes: number, mctMinutes: number, level: number): [number, number] {
  return centralInterval(pair.drawProbabilities(layoverMinutes - mctMinutes), level);
}

/**
 * The smallest whole-minute layover L in [0, MAX_LAYOVER_MINUTES] with P(make at L) >= target;
 * null when even the longest does not reach it. target must lie in (0, 1), else RangeError.
 *
 * The same search runs three times: on the middle draw alone, from a rough guess; on the mean
 * over every GUIDE_STRIDE-th draw (an eighth of the work per evaluation), from that answer; then
 * on all draws, from the second answer. Each brackets its start by doubling steps, then
 * narrows the bracket on whole minutes by linear interpolation between its ends (checking the
 * minute next to each interpolated one, where the answer usually is) or by halving it. So at the
 * answer P >= target and at one minute less P < target, exactly, for the same function; only
 * the number of evaluations depends on the guesses, never the answer.
 */
export function minimumLayover(pair: ConnectionPair, mctMinutes: number, target: number): number | null {
  if (!(target > 0 && target < 1)) throw new RangeError(`target must lie in (0, 1), got ${target}`);
  if (!Number.isInteger(mctMinutes)) throw new RangeError(`MCT must be whole minutes, got ${mctMinutes}`);
  let guess = roughLayoverGuess(pair, mctMinutes, target);
  let slope = NaN;
  if (pair.draws >= 2 * GUIDE_STRIDE) {
    // The middle draw alone first: one table pair per evaluation.
    const arrival = pair.arrival.table(pair.draws >> 1);
    const departure = pair.departureTable(pair.draws >> 1);
    const known = pair.nearestKnown(guess - mctMinutes);
    const single = searchMinimum((layover) => drawMakeProbability(arrival, departure, layover - mctMinutes), guess, aimed(target, known, pair.draws >> 1, pair.draws, pair.draws), 4, NaN);
    if (single.layover !== null) {
      guess = single.layover;
      slope = single.slope;
    }
    const some: [DrawTable, DrawTable][] = [];
    for (let t = GUIDE_STRIDE >> 1; t < pair.draws; t += GUIDE_STRIDE) some.push([pair.arrival.table(t), pair.departureTable(t)]);
    const subset = (layover: number) => {
      let sum = 0;
      for (const [a, d] of some) sum += drawMakeProbability(a, d, layover - mctMinutes);
      return sum / some.length;
    };
    // Aimed, where P(make) over all draws is already known at some margin, at the target less
    // the subset's shortfall from all draws there: the subset's sampling error, which moves its
    // answer off the full one, changes little from margin to margin.
    const guide = searchMinimum(subset, guess, aimed(target, pair.nearestKnown(guess - mctMinutes), GUIDE_STRIDE >> 1, GUIDE_STRIDE, pair.draws), 4, slope);
    guess = guide.layover ?? MAX_LAYOVER_MINUTES;
    slope = guide.slope;
  }
  // On all draws, each new minute with the one before it in the same pass: at the guide's
  // answer, the minute before is the other one the answer needs.
  const all = (layover: number) => {
    const m = layover - mctMinutes;
    if (!pair.has(m)) pair.prepare([m - 1, m]);
    return pair.probability(m);
  };
  return searchMinimum(all, guess, target, 1, slope).layover;
}

/**
 * The target a search over the draws first, first + stride, ... aims at: the target less their
 * mean's shortfall from all draws' mean at a margin where every draw is known (`known`, if
 * any). That shortfall, the subset's sampling error, changes little from margin to margin, so
 * the subset's answer lands nearer the full one. Only guesses depend on it.
 */
function aimed(target: number, known: Float64Array | undefined, first: number, stride: number, draws: number): number {
  if (!known) return target;
  let sum = 0;
  let count = 0;
  for (let t = first; t < draws; t += stride, count++) sum += known[t]!;
  const shifted = target - (mean(known) - sum / count);
  return shifted > 0 && shifted < 1 ? shifted : target;
}

/** Every GUIDE_STRIDE-th draw guides the minimum-layover search. */
const GUIDE_STRIDE = 8;

// The smallest whole layover in [0, MAX_LAYOVER_MINUTES] where the non-decreasing p reaches
// the target (null when none does), and p's rise over its last minute there. Searched from a
// guess, with a first step of `step` minutes or, given p's slope per minute near the answer, the
// step that slope says reaches the target.
function searchMinimum(p: (layover: number) => number, guess: number, target: number, step: number, slope: number): { layover: number | null; slope: number } {
  let bad = -1; // largest layover known to miss the target (-1: none known)
  let pBad = 0;
  let good = MAX_LAYOVER_MINUTES + 1; // smallest layover known to reach it (past the end: none known)
  let pGood = 1;
  const probe = (layover: number): boolean => {
    const value = p(layover);
    if (value >= target) {
      good = layover;
      pGood = value;
      return true;
    }
    bad = layover;
    pBad = value;
    return false;
  };
  let x = Math.min(MAX_LAYOVER_MINUTES, Math.max(0, Number.isFinite(guess) ? guess : 0));
  let px = probe(x) ? pGood : pBad;
  // Bracket: steps that double, or the secant through the last two probes where it points
  // further (at most 8 steps), away from the side already known.
  for (; good - bad > 1 && (bad < 0 || good > MAX_LAYOVER_MINUTES); step *= 2) {
    if (bad >= MAX_LAYOVER_MINUTES) return { layover: null, slope: NaN };
    const up = bad >= 0;
    const from = up ? bad : good;
    let next = up ? from + step : from - step;
    if (x === from && slope > 0) {
      const jump = Math.min(64, Math.ceil(Math.abs(target - px) / slope));
      next = up ? from + Math.max(1, jump) : from - Math.max(1, jump);
    } else if (x !== from) {
      const secant = from + ((target - (up ? pBad : pGood)) * (from - x)) / ((up ? pBad : pGood) - px);
      if (Number.isFinite(secant)) next = up ? Math.min(from + 8 * step, Math.max(next, Math.ceil(secant))) : Math.max(from - 8 * step, Math.min(next, Math.floor(secant)));
    }
    next = Math.min(MAX_LAYOVER_MINUTES, Math.max(0, next));
    x = from;
    px = up ? pBad : pGood;
    probe(next);
  }
  // Interpolate while that at least halves the bracket; after one that does not, halve it once.
  let interpolate = true;
  while (good - bad > 1) {
    const width = good - bad;
    if (interpolate && pGood > pBad) {
      // The first minute where the chord between the bracket's ends reaches the target...
      const next = Math.min(good - 1, Math.max(bad + 1, Math.ceil(bad + ((target - pBad) / (pGood - pBad)) * width)));
      const reached = probe(next);
      // ...and its neighbour on the other side, which settles it when the chord was right.
      if (good - bad > 1) probe(reached ? next - 1 : next + 1);
      interpolate = good - bad <= width / 2;
    } else {
      probe(Math.floor((good + bad) / 2));
      interpolate = true;
    }
  }
  return { layover: good > MAX_LAYOVER_MINUTES ? null : good, slope: pGood - pBad };
}

// A starting point for the bracket, from the middle draw: the medians' difference plus the two
// spreads to the target's quantiles added in quadrature, as for a difference of independent
// normals. Only the search's speed depends on it, never its answer.
function roughLayoverGuess(pair: ConnectionPair, mctMinutes: number, target: number): number {
  const t = Math.floor(pair.draws / 2);
  const arrival = pair.arrival.table(t);
  const departure = pair.departureTable(t);
  const a = arrival.inverse(0.5);
  const d = departure.inverse(0.5);
  const spreadA = arrival.inverse(target) - a;
  const spreadD = d - departure.inverse(1 - target);
  const guess = Math.round(a - d + Math.sign(spreadA + spreadD) * Math.hypot(spreadA, spreadD) + mctMinutes);
  return Number.isFinite(guess) ? guess : mctMinutes;
}

export interface MakeCurveOptions {
  readonly mctMinutes: number;
  readonly intervalLevel: number;
  readonly fromMinutes: number;
  readonly toMinutes: number;
  readonly stepMinutes?: number;
}

/** P(make) and its credible band at whole-minute layovers fromMinutes..toMinutes. */
export function makeCurvePoints(pair: ConnectionPair, options: MakeCurveOptions): { layoverMinutes: number; pMake: number; lo: number; hi: number }[] {
  const step = options.stepMinutes ?? 1;
  if (!Number.isInteger(step) || step < 1) throw new RangeError(`step must be a whole number of minutes >= 1, got ${step}`);
  if (!Number.isInteger(options.fromMinutes) || !Number.isInteger(options.toMinutes) || options.toMinutes < options.fromMinutes) {
    throw new RangeError(`curve range must be whole minutes with from <= to, got ${options.fromMinutes}..${options.toMinutes}`);
  }
  const points = [];
  for (let layover = options.fromMinutes; layover <= options.toMinutes; layover += step) {
    const draws = pair.drawProbabilities(layover - options.mctMinutes);
    const [lo, hi] = centralInterval(draws, options.intervalLevel);
    points.push({ layoverMinutes: layover, pMake: mean(draws), lo, hi });
  }
  return points;
}

/**
 * The whole-minute m where the predictive P(A - D <= m) first reaches p (p in (0, 1)), searched
 * within +-2 days; used to choose a chart's range.
 */
export function differenceQuantile(pair: ConnectionPair, p: number): number {
  let a = -2880;
  let b = 2880;
  if (pair.probability(a) >= p) return a;
  if (pair.probability(b) < p) return b;
  while (b - a > 1) {
    const mid = Math.floor((a + b) / 2);
    if (pair.probability(mid) >= p) b = mid;
    else a = mid;
  }
  return b;
}

export function mean(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i] ?? NaN;
  return values.length ? s / values.length : NaN;
}

/**
 * The central interval holding `level` of the values: quantiles (1 - level)/2 and (1 + level)/2,
 * linear between order statistics (Hyndman & Fan 1996, definition 7). level outside (0, 1) is a
 * RangeError; any NaN value gives [NaN, NaN].
 * @example centralInterval([1, 2, 3, 4, 5], 0.5) // returns [2, 4]
 */
export function centralInterval(values: ArrayLike<number>, level: number): [number, number] {
  if (!(level > 0 && level < 1)) throw new RangeError(`interval level must lie in (0, 1), got ${level}`);
  if (intervalScratch.length < values.length) intervalScratch = new Float64Array(values.length);
  // Selection rather than a sort: this runs for every connection's draws and every trip's.
  const n = values.length;
  const work = intervalScratch;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (Number.isNaN(v)) return [NaN, NaN];
    work[i] = v;
  }
  if (n === 0) return [NaN, NaN];
  const lo = selectQuantile(work, n, (1 - level) / 2);
  return [lo, selectQuantile(work, n, (1 + level) / 2)];
}

// Selected in place here: scoring takes an interval of every connection and trip.
let intervalScratch = new Float64Array(64);
