// A route's posterior draws tabulated on a whole-minute grid: the CDF at every minute where the
// delay has mass, or the density weights, and the inverse CDF the minimum-layover search starts from.
//
// Tabulating once per (route, kind, draw) is what makes the quadrature in connection-probability.ts
// cheap: it only ever looks up F at whole minutes. (The trip simulation samples the draws'
// distributions themselves, trip-simulation.ts.)
import type { DelayDistribution, GridEvaluation, RoutePosterior } from '../delay/predictive';
import { LASTING_TABLES, type TableStore } from './table-store';

export type { GridEvaluation } from '../delay/predictive';

/** Mass left out below the grid: F(lo) is at most this. */
const LOW_TAIL = 1e-10;
/** Mass left out above the grid for a light tail: S(hi) is at most this. */
const HIGH_TAIL = 1e-7;
/** Whole-minute resolution ends where S falls to this; the thin tail beyond uses wider steps. */
const CORE_TAIL = 1e-2;
/** Exact evaluations in the thin tail; the steps between them widen to fit. */
const TAIL_NODES = 40;
/** Widest grid in minutes (two days); a heavier tail is cut there (see DrawTable). */
const MAX_SPAN_MINUTES = 2880;
/** Search bounds for the grid ends (minutes): two days early to five days late. */
const SEARCH_LO = -2880;
const SEARCH_HI = 7200;
/**
 * The thin tail is tabulated minute by minute for at least this long past the core (to the next
 * tail node). Farther out, where S is below about 1e-4, F is kept every FAR_STEP minutes.
 */
const NEAR_TAIL_MINUTES = 240;
/** Spacing of the far tail's points (minutes); a power of two, so positions in a cell are exact. */
const FAR_STEP = 8;
/**
 * How far the end-corrected trapezoid's mass over the core may stray from the exact
 * F(core) - F(lo) before the core's weights are replaced by exact cell masses (see the density
 * branch below). Smooth densities a few minutes wide stray by far less; a jump of density f0
 * between two minutes strays by up to f0 / 2, which for a bundle's severe component is 1e-4 or more.
 */
const CORE_MASS_TOLERANCE = 1e-5;
/** log2 of FAR_STEP, FAR_STEP - 1 and 1 / FAR_STEP (exact): farInterpolate's constants, also used where it is written out. */
export const FAR_SHIFT = 3;
export const FAR_MASK = FAR_STEP - 1;
export const FAR_FRACTION = 1 / FAR_STEP;

/**
 * What a table is for: 'cdf' (the inbound arrival delay, whose CDF the quadrature looks up) or
 * 'density' (the outbound departure delay, whose density weights the quadrature).
 */
export type TableRole = 'cdf' | 'density';

/**
 * One posterior draw's delay distribution on the whole-minute grid lo, lo + 1, ..., hi.
 *
 * Up to the point where S = 1e-2 (the core) every minute is evaluated exactly. Beyond it, in the
 * thin tail, about TAIL_NODES exact evaluations with steps growing from 2 minutes carry the rest:
 * log S is linear between them (exact for an exponential tail, as a Gumbel's is) and each cell's
 * exact mass is split between its ends. The first NEAR_TAIL_MINUTES or so of the thin tail are
 * tabulated at every minute; beyond that (S below about 1e-4 for a Gumbel-like tail) F is stored
 * every FAR_STEP minutes and is linear between them, which moves F by under 1e-6. Against a fine
 * direct integration of Gumbel mixtures with wide disrupted components, and of a Lomax tail, the
 * error stays near 1e-5 (test/shared/risk/connection-probability.test.ts), and P(make) stays
 * monotone.
 *
 * A tail too heavy to fall to S = 1e-7 within two days (a Lomax component, say) is cut at
 * lo + MAX_SPAN_MINUTES; F beyond hi is taken as F(hi), a lower bound short by at most S(hi).
 */
export class DrawTable {
  /** First grid minute. */
  readonly lo: number;
  /** Last grid minute. */
  readonly hi: number;
  /**
   * cdf[i] ~ F(lo + i) for the minutes tabulated one by one (the core and the near tail):
   * exact on the whole-minute core, interpolated in the tail. Monotone. Shorter than the grid.
   * A density table with a step over 1 holds F at its core's points only: cdf[i] ~ F(lo + i step).
   */
  readonly cdf: Float64Array;
  /**
   * Only for role 'density': quadrature weights of the core's minutes for integrating g against
   * the density, E[g(X)] ~ sum_i weight[i] g(lo + i) + sum_k tailWeight[k] g(lo + tailIndex[k])
   * + lowMass g(lo) + highMass g(hi). On the core they are the density at each minute: the
   * trapezoid rule with unit step on a smooth integrand that vanishes at the ends is accurate far
   * beyond h^2 (Euler-Maclaurin; Trefethen & Weideman, "The exponentially convergent trapezoidal
   * rule", SIAM Review 56, 2014).
   */
  readonly weight: Float64Array;
  /** Grid points 0..coreLength-1 are the whole-minute core. */
  readonly coreLength: number;
  /** Role 'density': the tail nodes past the core, as offsets from lo, ascending. */
  readonly tailIndex: Int32Array;
  /** Role 'density': the quadrature weight of each tail node. */
  readonly tailWeight: Float64Array;
  /** P(X <= lo). */
  readonly lowMass: number;
  /** Role 'density': whether the core's weights are exact cell masses (the trapezoid's mass was off). */
  readonly cellMasses: boolean;
  /** S(hi) = P(X > hi), computed from the survival function. */
  readonly highMass: number;
  /** F at and beyond hi: 1 - S(hi), never below the table's last value. */
  readonly beyondHi: number;
  /** True when the grid was cut at MAX_SPAN_MINUTES with more than HIGH_TAIL mass beyond it. */
  readonly heavyTail: boolean;
  /** The last minute in cdf; the far tail's points start here. */
  readonly top: number;
  /** F at top, top + FAR_STEP, ..., hi (empty when cdf reaches hi); see farInterpolate. */
  readonly far: Float64Array;
  /** The tail nodes from top to hi: minutes, S and F there (for the inverse beyond top). */
  private readonly farNodes: Float64Array;

  /**
   * Where the grid's three searches ended (the first minute with F > LOW_TAIL, with S <= HIGH_TAIL
   * and with S <= CORE_TAIL): a nearby draw's table starts its searches there.
   */
  readonly searched: readonly [number, number, number];

  /**
   * Role 'cdf': the Lomax-like starts of the density, as [x0, J0, x1, J1, ...] (J the density's
   * jump there, a kink in F): the quadrature corrects for each (finishSum in connection-probability.ts).
   */
  readonly kinks: Float64Array;

  /**
   * `hint`: the searches' results of a similar draw, to start from (the answers do not depend on
   * it). `step`: role 'density' only, the core's spacing in minutes (1, 2 or 4): the weights sit
   * at lo, lo + step, ..., up to the first point past the searched core; the tail nodes are the
   * same whatever the step. Which step a pair of draws can take is quadratureStep's choice
   * (connection-probability.ts).
   */
  constructor(
    readonly dist: DelayDistribution,
    readonly role: TableRole,
    hint?: readonly [number, number, number],
    readonly step = 1,
    store: TableStore = LASTING_TABLES,
  ) {
    if (!(step === 1 || ((step === 2 || step === 4) && role === 'density'))) throw new RangeError(`a ${role} table's step must be 1${role === 'density' ? ', 2 or 4' : ''}, got ${step}`);
    // The work is split into small functions below: each is optimised on its own and quickly,
    // and a rarely taken branch that deoptimises one of them does not send the whole table
    // build back to unoptimised code, which boxes every double it computes.
    const bounds = gridBounds(dist, hint);
    const first = bounds[0]!;
    const light = bounds[1]!;
    const lo = bounds[2]!;
    let hi = bounds[3]!;
    const searchedCore = bounds[4]!;
    this.searched = [first, light, searchedCore];
    // The core ends on the step's grid (past the searched end, within hi).
    const h = step;
    let coreIndex = Math.ceil((searchedCore - lo) / h);
    if (lo + coreIndex * h > hi) coreIndex = Math.floor((hi - lo) / h);
    const core = lo + coreIndex * h;
    // The tail nodes live in scratchTail (reused from table to table, grown as needed).
    let nodes = tailNodes(core, hi);
    // The near tail ends at a node; past it the grid's end is moved onto the far tail's points.
    // A table with a coarser step keeps F on its core's points only (no minute-by-minute tail:
    // only a CDF table's F is looked up at whole minutes).
    let near = 0;
    if (h === 1) while (near < nodes && scratchTail[near]! < core + NEAR_TAIL_MINUTES) near++;
    const top = near < nodes ? scratchTail[near]! : hi;
    if (h === 1 && hi > top) hi = top + Math.ceil((hi - top) / FAR_STEP) * FAR_STEP;
    if (scratchTail.length <= nodes) growTail(nodes + 1);
    scratchTail[nodes++] = hi;
    if (scratchSurvival.length < nodes) {
      scratchSurvival = new Float64Array(2 * nodes);
      scratchNodeF = new Float64Array(2 * nodes);
      scratchDecay = new Float64Array(2 * nodes);
    }
    const tailSurvival = scratchSurvival;
    tailSurvivals(dist, scratchTail, nodes, tailSurvival);
    tailDecays(tailSurvival, nodes, scratchDecay);
    const n = h === 1 ? top - lo + 1 : coreIndex + 1;
    this.lo = lo;
    this.hi = hi;
    this.top = top;
    // One buffer per table: the whole-minute CDF, the far tail's points and (role 'density') the weights.
    const farCount = h === 1 && hi > top ? (hi - top) / FAR_STEP + 1 : 0;
    const weights = role === 'density' ? coreIndex + nodes : 0;
    const farNodes = hi > top ? nodes - near : 0;
    const buffer = store.floats(n + farCount + weights + 3 * farNodes);
    const cdf = buffer.subarray(0, n);
    const far = buffer.subarray(n, n + farCount);
    this.farNodes = buffer.subarray(n + farCount + weights);
    this.cdf = cdf;
    this.coreLength = coreIndex + 1;
    this.highMass = tailSurvival[nodes - 1]!;
    if (role === 'cdf') {
      cdfCore(dist, lo, cdf.subarray(0, coreIndex + 1));
      this.lowMass = cdf[0]!;
      this.weight = EMPTY;
      this.tailIndex = EMPTY_INDEX;
      this.tailWeight = EMPTY;
      this.kinks = kinksOf(dist, store);
      this.cellMasses = false;
    } else {
      this.kinks = EMPTY;
      const lowMass = checked(dist.cdf(lo), lo, 'CDF');
      this.lowMass = lowMass;
      const weight = buffer.subarray(n + farCount, n + farCount + coreIndex + 1);
      const tailWeight = buffer.subarray(n + farCount + coreIndex + 1);
      const tailIndex = store.ints(nodes - 1);
      for (let k = 1; k < nodes; k++) tailIndex[k - 1] = scratchTail[k]! - lo;
      let endCorrection = trapezoidWeights(dist, lo, core, hi, weight, h);
      correctJumps(dist, lo, coreIndex, weight, h);
      if (h > 1) {
        // From the unit-step rule in u = (x - lo) / step to masses in x.
        for (let i = 0; i <= coreIndex; i++) weight[i] = weight[i]! * h;
        endCorrection *= h;
      }
      // The trapezoid is exact only for a smooth density. A density with a jump (a component
      // that starts at some minute) or a spike narrower than a minute integrates to the wrong
      // mass; then the core's weights become exact cell masses, F(x + 1/2) - F(x - 1/2), a
      // midpoint rule that is right to order h^2 whatever the density does.
      let coreMass = -endCorrection;
      for (let i = 0; i <= coreIndex; i++) coreMass += weight[i]!;
      const exactCoreMass = 1 - tailSurvival[0]! - lowMass;
      this.cellMasses = Math.abs(coreMass - exactCoreMass) > CORE_MASS_TOLERANCE;
      if (this.cellMasses) {
        endCorrection = 0;
        exactCellWeights(dist, lo, coreIndex, weight, cdf, lowMass, 1 - tailSurvival[0]!, h);
      } else {
        cumulativeTrapezoid(weight, cdf, lowMass, coreIndex);
      }
      tailCellWeights(tailSurvival, scratchDecay, nodes, weight, coreIndex, tailWeight, endCorrection);
      monotoneCore(cdf, coreIndex);
      this.weight = weight;
      this.tailIndex = tailIndex;
      this.tailWeight = tailWeight;
    }
    // The core is monotone by now (see cdfCore and monotoneCore); F at the tail nodes is exact,
    // never below what comes before.
    const nodeF = scratchNodeF;
    nodeF[0] = Math.max(cdf[coreIndex]!, 1 - tailSurvival[0]!);
    for (let k = 1; k < nodes; k++) nodeF[k] = Math.max(nodeF[k - 1]!, 1 - tailSurvival[k]!);
    if (h === 1) fillThinTail(scratchTail, nodes, tailSurvival, scratchDecay, nodeF, cdf, far, lo, top);
    // (With no thin tail at all, the last grid point keeps its own value, as F beyond it is exact.)
    if (nodes > 1) cdf[n - 1] = nodeF[near < nodes ? near : nodes - 1]!;
    if (farCount > 0) far[farCount - 1] = nodeF[nodes - 1]!;
    this.far = far;
    for (let k = 0; k < farNodes; k++) {
      this.farNodes[3 * k] = scratchTail[near + k]!;
      this.farNodes[3 * k + 1] = tailSurvival[near + k]!;
      this.farNodes[3 * k + 2] = nodeF[near + k]!;
    }
    this.beyondHi = nodeF[nodes - 1]!;
    this.heavyTail = this.highMass > HIGH_TAIL;
  }

  /**
   * F(x) at a whole minute x: the table inside the grid (linear between the far tail's points),
   * 0 below it and F(hi) above it. Non-decreasing in x.
   */
  cdfAt(x: number): number {
    const i = x - this.lo;
    if (i < 0) return 0;
    const cdf = this.cdf;
    if (i < cdf.length) return cdf[i]!;
    return farCdf(this.far, this.top, this.hi, this.beyondHi, x);
  }

  /**
   * The delay with F(delay) = u, linear between grid points; outside the grid it inverts the
   * distribution itself by bisection. u must lie in (0, 1).
   */
  inverse(u: number): number {
    const cdf = this.cdf;
    const n = cdf.length;
    if (u <= cdf[0]!) return invertByBisection(this.dist, u, SEARCH_LO, this.lo);
    if (u <= cdf[n - 1]!) {
      // Most draws fall in the core.
      const a = largestBelow(cdf, u, u <= cdf[this.coreLength - 1]! ? this.coreLength - 1 : n - 1);
      const fa = cdf[a]!;
      const fb = cdf[a + 1]!;
      const t = fb > fa ? (u - fa) / (fb - fa) : 0;
      return this.step === 1 ? this.lo + a + t : this.lo + (a + t) * this.step;
    }
    // Beyond top: between the tail nodes, where log S is linear, solved exactly.
    const nodes = this.farNodes;
    const count = nodes.length / 3;
    if (count === 0 || u > nodes[3 * count - 1]!) return invertByBisection(this.dist, u, this.hi, SEARCH_HI);
    let a = 0;
    let b = count - 1;
    while (b - a > 1) {
      const mid = (a + b) >>> 1;
      if (nodes[3 * mid + 2]! < u) a = mid;
      else b = mid;
    }
    const x0 = nodes[3 * a]!;
    const x1 = nodes[3 * b]!;
    const s0 = nodes[3 * a + 1]!;
    const s1 = nodes[3 * b + 1]!;
    if (s0 > 0 && s1 > 0 && s1 < s0) return Math.min(x1, Math.max(x0, x0 + (Math.log((1 - u) / s0) * (x1 - x0)) / Math.log(s1 / s0)));
    const f0 = nodes[3 * a + 2]!;
    const f1 = nodes[3 * b + 2]!;
    return f1 > f0 ? x0 + ((x1 - x0) * (u - f0)) / (f1 - f0) : x0;
  }
}

/**
 * F at a whole minute x past a table's whole-minute part (x > top): linear between the far
 * points, F(hi) from hi on.
 */
function farCdf(far: Float64Array, top: number, hi: number, beyondHi: number, x: number): number {
  return x >= hi ? beyondHi : farInterpolate(far, top, x);
}

/**
 * F at a whole minute top < x < hi, linear between the far points. FAR_STEP is a power of two,
 * so the position in the cell is exact, and F >= 0.99 here, so far[j + 1] - far[j] is exact
 * (Sterbenz): F rises from far[j] to at most far[j + 1]. The quadrature loops
 * (drawMakeProbability) write this formula out for the minutes between top and hi and add F(hi)
 * apart: a value chosen between a number field and the arrays' numbers, or returned from a call
 * left out of line, would be boxed on the heap, a million times per scoring run.
 */
export function farInterpolate(far: Float64Array, top: number, x: number): number {
  const offset = x - top;
  const j = offset >> FAR_SHIFT;
  const f0 = far[j]!;
  return f0 + (far[j + 1]! - f0) * ((offset & FAR_MASK) * FAR_FRACTION);
}

const EMPTY = new Float64Array(0);

// The density's jumps as [x0, J0, x1, J1, ...] (DrawTable.kinks), those with J > 0.
function kinksOf(dist: DelayDistribution, store: TableStore): Float64Array {
  const jumps = (dist as DelayDistribution & GridEvaluation).densityJumps?.() ?? NO_JUMPS;
  let count = 0;
  for (const [, jump] of jumps) if (jump > 0) count++;
  if (count === 0) return EMPTY;
  const out = store.floats(2 * count);
  let k = 0;
  for (const [at, jump] of jumps) {
    if (!(jump > 0)) continue;
    out[k++] = at;
    out[k++] = jump;
  }
  return out;
}

const NO_JUMPS: readonly (readonly [number, number, number])[] = [];

const EMPTY_INDEX = new Int32Array(0);
// Per-node working values, reused from table to table (tables are built one at a time).
let scratchSurvival = new Float64Array(128);
let scratchNodeF = new Float64Array(128);
let scratchDecay = new Float64Array(128);
let scratchHalf = new Float64Array(1024);
let scratchTail = new Int32Array(128);
const scratchBounds = new Int32Array(5);

function checked(value: number, x: number, what: string): number {
  if (!(value >= 0 && value <= 1)) throw new RangeError(`delay distribution gives an invalid ${what} (${value}) at ${x} minutes`);
  return value;
}

function checkedDensity(value: number, x: number): number {
  if (!(value >= 0) || !Number.isFinite(value)) throw new RangeError(`delay distribution gives an invalid density (${value}) at ${x} minutes`);
  return value;
}

// The grid's searches, as [first, light, lo, hi, core] (see DrawTable): first, the first minute
// with F > LOW_TAIL; light, the first with S <= HIGH_TAIL (or SEARCH_HI); core, the first with
// S <= CORE_TAIL within [lo, hi]. Written into one reused array.
function gridBounds(dist: DelayDistribution, hint: readonly [number, number, number] | undefined): Int32Array {
  const first = findFirst(dist, CDF_ABOVE, LOW_TAIL, SEARCH_LO, SEARCH_HI, hint?.[0]);
  let lo = first - 1;
  // One or two evaluations settle the usual cases without searching the whole range: a tail
  // light enough to end on the grid is searched for on the grid only; a heavy tail whose median
  // lies within a quarter span of lo is cut at lo + MAX_SPAN_MINUTES with lo kept, which is
  // what the full searches below would find.
  const quarter = Math.floor(MAX_SPAN_MINUTES / 4);
  let light: number;
  if (dist.survival(lo + MAX_SPAN_MINUTES) <= HIGH_TAIL) {
    light = findFirst(dist, SURVIVAL_AT_MOST, HIGH_TAIL, lo, lo + MAX_SPAN_MINUTES, hint?.[1]);
  } else if (dist.cdf(lo + quarter) >= 0.5) {
    light = SEARCH_HI;
  } else {
    light = findFirst(dist, SURVIVAL_AT_MOST, HIGH_TAIL, lo, SEARCH_HI, hint?.[1]);
    // Wider than the grid at both ends (a population draw for airports absent from the data
    // can spread over days): keep at most a quarter of the span below the median, so the
    // window holds the bulk of the mass and the far masses are lumped at its two ends, where
    // F_A(m + d) is already near 0 or near 1, instead of starting days early and cutting
    // the bulk off. A heavy upper tail alone keeps its natural start.
    const median = findFirst(dist, CDF_AT_LEAST, 0.5, lo, SEARCH_HI, undefined);
    lo = Math.max(lo, median - quarter);
  }
  const hiCap = lo + MAX_SPAN_MINUTES;
  const hi = Math.min(hiCap, light);
  const core = Math.min(hi, findFirst(dist, SURVIVAL_AT_MOST, CORE_TAIL, lo, hi, hint?.[2]));
  const out = scratchBounds;
  out[0] = first;
  out[1] = light;
  out[2] = lo;
  out[3] = hi;
  out[4] = core;
  return out;
}

// The thin tail's nodes from core towards hi (hi itself not included) into scratchTail; returns
// how many. Steps grow geometrically from 2 minutes at the core's end up to (hi - core) / TAIL_NODES.
function tailNodes(core: number, hi: number): number {
  const step = Math.max(1, Math.ceil((hi - core) / TAIL_NODES));
  let count = 0;
  for (let x = core, h = 2; x < hi; x += h, h = Math.min(step, Math.ceil(h * 1.5))) {
    if (count >= scratchTail.length) growTail(2 * count + 16);
    scratchTail[count++] = x;
  }
  return count;
}

function growTail(length: number): void {
  const grown = new Int32Array(length);
  grown.set(scratchTail.subarray(0, Math.min(length, scratchTail.length)));
  scratchTail = grown;
}

// S at the tail nodes, all at once when the distribution can (GridEvaluation.survivalAt), checked.
function tailSurvivals(dist: DelayDistribution, tail: Int32Array, nodes: number, out: Float64Array): void {
  const batch = (dist as DelayDistribution & GridEvaluation).survivalAt;
  if (batch) batch.call(dist, tail, nodes, out);
  else for (let k = 0; k < nodes; k++) out[k] = dist.survival(tail[k]!);
  for (let k = 0; k < nodes; k++) if (!(out[k]! >= 0 && out[k]! <= 1)) checked(out[k]!, tail[k]!, 'survival');
}

// F at lo, lo + 1, ... into cdf (role 'cdf'), by the distribution's grid when it has one,
// checked and made monotone in the same pass (rounding in a distribution's CDF could break it).
function cdfCore(dist: DelayDistribution, lo: number, cdf: Float64Array): void {
  const grid = (dist as DelayDistribution & GridEvaluation).cdfGrid;
  if (grid) grid.call(dist, lo, cdf);
  else for (let i = 0; i < cdf.length; i++) cdf[i] = dist.cdf(lo + i);
  let previous = 0;
  for (let i = 0; i < cdf.length; i++) {
    const f = cdf[i]!;
    if (!(f >= 0 && f <= 1)) checked(f, lo + i, 'CDF');
    if (f < previous) cdf[i] = previous;
    else previous = f;
  }
}

// cdf[0..coreIndex] made monotone (role 'density': the core's F from cell masses or the trapezoid).
function monotoneCore(cdf: Float64Array, coreIndex: number): void {
  for (let i = 1; i <= coreIndex; i++) if (cdf[i]! < cdf[i - 1]!) cdf[i] = cdf[i - 1]!;
}

// The core's trapezoid weights (the density at each minute, halved at the core's end) into
// weight, with the Euler-Maclaurin end correction; returns the correction's share carried by
// the first tail node (subtracted there by tailCellWeights).
// With a step h, all of it in u = (x - lo) / h (unit step; the caller scales the weights by h).
function trapezoidWeights(dist: DelayDistribution, lo: number, core: number, hi: number, weight: Float64Array, h: number): number {
  const coreIndex = (core - lo) / h;
  const grid = (dist as DelayDistribution & GridEvaluation).pdfGrid;
  if (grid) {
    if (h === 1) grid.call(dist, lo, weight);
    else grid.call(dist, lo, weight, h);
    for (let i = 0; i <= coreIndex; i++) checkedDensity(weight[i]!, lo + i * h);
  } else for (let i = 0; i <= coreIndex; i++) weight[i] = checkedDensity(dist.pdf(lo + i * h), lo + i * h);
  weight[coreIndex] = weight[coreIndex]! / 2;
  // Euler-Maclaurin end correction of the core's trapezoid at its last point c:
  // -(1/12) (f g)'(c), with f'(c) by a central difference and g'(c) ~ (g(c+2) - g(c-2)) / 4,
  // carried by the weights at c - 2 and at c + 2 (the first tail node). Both stay positive.
  // With a step h the terms are h^2 / 12 times f'(c) g(c) and f(c) g'(c) in x, g'(c) from c - 2h
  // and the first tail node, c + 2 (2 / 48 = (1 / 12) / (2 + 2) at h = 1).
  if (core - 2 * h > lo && core + 2 < hi) {
    const fc = 2 * weight[coreIndex]!;
    const slope = (dist.pdf(core + h) - weight[coreIndex - 1]!) / 2;
    const carried = h === 1 ? fc / 48 : (h * fc) / (12 * (2 + 2 * h));
    weight[coreIndex] = weight[coreIndex]! - slope / 12;
    weight[coreIndex - 2] = weight[coreIndex - 2]! + carried;
    return carried;
  }
  return 0;
}

// A density that jumps by J at s (and its slope by K), between minutes k < s <= k + 1:
// by the Euler-Maclaurin formula for a sum that starts a fraction 1 - r past s
// (r = s - k; Bernoulli polynomials B1(1 - r) = 1/2 - r, B2(1 - r) = r^2 - r + 1/6), the
// trapezoid's sum exceeds the integral by -B1 J g(s) - (B2 / 2) (J g'(s) + K g(s)). With g
// linear between k and k + 1 that moves J ((1 - r)^2 / 2 - 1/12) + K B2 (1 - r) / 2 onto
// the weight at k and J (1/12 - r^2 / 2) + K B2 r / 2 onto the one at k + 1. A weight
// that this would make negative is left alone, and the mass check then decides.
// With a step h the same in u = (x - lo) / h, where the slope jump is K h.
function correctJumps(dist: DelayDistribution, lo: number, coreIndex: number, weight: Float64Array, h: number): void {
  const jumps = (dist as DelayDistribution & GridEvaluation).densityJumps?.() ?? NO_JUMPS;
  for (const [at, jump, unitSlopeJump] of jumps) {
    const u = h === 1 ? at : (at - lo) / h;
    const k = Math.ceil(u) - 1;
    const r = u - k;
    const i = h === 1 ? k - lo : k;
    const slopeJump = unitSlopeJump * h;
    if (i < 0 || i + 1 >= coreIndex - 2 || !(jump > 0)) continue;
    const b2 = r * r - r + 1 / 6;
    const atK = weight[i]! + jump * ((1 - r) * (1 - r) / 2 - 1 / 12) + (slopeJump * b2 * (1 - r)) / 2;
    const atNext = weight[i + 1]! + jump * (1 / 12 - (r * r) / 2) + (slopeJump * b2 * r) / 2;
    if (atK >= 0 && atNext >= 0) {
      weight[i] = atK;
      weight[i + 1] = atNext;
    }
  }
}

// The core's weights as exact cell masses from F at every half minute, and F on the core.
// (With a step h, cells h wide about the core's points.)
function exactCellWeights(dist: DelayDistribution, lo: number, coreIndex: number, weight: Float64Array, cdf: Float64Array, lowMass: number, coreF: number, h: number): void {
  weight.fill(0);
  // F at every half step of the core: half[j] = F(lo + j h / 2).
  if (scratchHalf.length < 2 * coreIndex) scratchHalf = new Float64Array(4 * coreIndex);
  const half = scratchHalf.subarray(0, 2 * coreIndex);
  const halfGrid = (dist as DelayDistribution & GridEvaluation).cdfGrid;
  if (halfGrid) halfGrid.call(dist, lo, half, h / 2);
  else for (let j = 0; j < half.length; j++) half[j] = dist.cdf(lo + (j * h) / 2);
  let previous = lowMass;
  cdf[0] = previous;
  for (let i = 0; i < coreIndex; i++) {
    const x = lo + i * h;
    const upper = Math.max(previous, checked(half[2 * i + 1]!, x + h / 2, 'CDF'));
    const mass = upper - previous;
    if (i === 0) weight[0]! += mass;
    else {
      const mid = Math.min(upper, Math.max(previous, checked(half[2 * i]!, x, 'CDF')));
      cdf[i] = mid;
      // The cell's centre of mass from Simpson's rule on F over the cell, and its mass
      // split between the two nearest minutes so that a g linear across them is exact
      // (a spike at x + 0.4 is not counted at x).
      const offset = mass > 0 ? 0.5 - (4 * (mid - previous) + mass) / (6 * mass) : 0;
      const side = offset >= 0 ? 1 : -1;
      const share = Math.min(0.5, Math.abs(offset));
      weight[i]! += mass * (1 - share);
      weight[i + side]! += mass * share;
    }
    previous = upper;
  }
  weight[coreIndex]! += Math.max(0, coreF - previous);
  cdf[coreIndex] = coreF;
}

// The CDF on the core by the cumulative trapezoid rule over the weights (for the inverse).
function cumulativeTrapezoid(weight: Float64Array, cdf: Float64Array, lowMass: number, coreIndex: number): void {
  let f = lowMass;
  cdf[0] = f;
  for (let i = 1; i <= coreIndex; i++) {
    // weight[coreIndex] holds half the density there (the trapezoid's end).
    f += (weight[i - 1]! + weight[i]! * (i === coreIndex ? 2 : 1)) / 2;
    cdf[i] = Math.min(1, f);
  }
}

// log(S(x_k) / S(x_k+1)) of each tail cell into decay (NaN where a survival is 0), for both
// uses below. A NaN read from an array rather than chosen as a literal: the literal made V8 keep
// the value boxed, one heap number per tail node.
function tailDecays(tailSurvival: Float64Array, nodes: number, decay: Float64Array): void {
  decay.fill(NaN);
  for (let k = 0; k + 1 < nodes; k++) {
    const s0 = tailSurvival[k]!;
    const s1 = tailSurvival[k + 1]!;
    if (s0 > 0 && s1 > 0) decay[k] = Math.log(s0 / s1);
  }
}

// Each tail cell's exact mass goes to its two ends in the ratio that puts its centre of mass
// right for an exponential density across the cell (rate from the two survivals), so the rule
// is exact for a g linear across the cell.
function tailCellWeights(tailSurvival: Float64Array, decays: Float64Array, nodes: number, weight: Float64Array, coreIndex: number, tailWeight: Float64Array, endCorrection: number): void {
  for (let k = 0; k + 1 < nodes; k++) {
    const mass = Math.max(0, tailSurvival[k]! - tailSurvival[k + 1]!);
    const decay = decays[k]!;
    // (NaN, a survival of 0, fails the test: half and half.)
    const theta = decay > 1e-6 ? 1 / decay - 1 / Math.expm1(decay) : 0.5;
    if (k === 0) weight[coreIndex] = weight[coreIndex]! + mass * (1 - theta);
    else tailWeight[k - 1] = tailWeight[k - 1]! + mass * (1 - theta);
    tailWeight[k] = tailWeight[k]! + Math.max(0, mass * theta - (k === 0 ? endCorrection : 0));
  }
}

// The thin tail between nodes: log S linear, clamped to the nodes' F, so F keeps increasing.
// On the near tail S steps by a constant factor per minute; on the far tail per FAR_STEP.
// Where a survival is 0 (decay NaN), F is linear across the cell instead.
function fillThinTail(tail: Int32Array, nodes: number, tailSurvival: Float64Array, decays: Float64Array, nodeF: Float64Array, cdf: Float64Array, far: Float64Array, lo: number, top: number): void {
  for (let k = 0; k + 1 < nodes; k++) {
    const x0 = tail[k]!;
    const x1 = tail[k + 1]!;
    const s0 = tailSurvival[k]!;
    const s1 = tailSurvival[k + 1]!;
    const f0 = nodeF[k]!;
    const f1 = nodeF[k + 1]!;
    const decay = decays[k]!;
    const logRate = -decay / (x1 - x0);
    if (x0 < top) {
      if (Number.isNaN(decay)) {
        for (let x = x0; x < x1; x++) cdf[x - lo] = Math.min(f1, Math.max(f0, f0 + ((s0 - s1) * (x - x0)) / (x1 - x0)));
      } else {
        const ratio = Math.exp(logRate);
        let s = s0;
        // Comparisons rather than Math.min and Math.max, whose NaN and -0 rules cost more than
        // the step itself (1 - s is never NaN here).
        for (let x = x0; x < x1; x++, s *= ratio) {
          const f = 1 - s;
          cdf[x - lo] = f < f0 ? f0 : f > f1 ? f1 : f;
        }
      }
    } else {
      // Far points x0 <= top + j * FAR_STEP < x1, S stepped by a constant factor between them.
      const j0 = Math.ceil((x0 - top) / FAR_STEP);
      if (Number.isNaN(decay)) {
        for (let j = j0; top + j * FAR_STEP < x1; j++) far[j] = Math.min(f1, Math.max(f0, f0 + ((s0 - s1) * (top + j * FAR_STEP - x0)) / (x1 - x0)));
      } else {
        const ratio = Math.exp(logRate * FAR_STEP);
        let s = s0 * Math.exp(logRate * (top + j0 * FAR_STEP - x0));
        for (let j = j0; top + j * FAR_STEP < x1; j++, s *= ratio) {
          const f = 1 - s;
          far[j] = f < f0 ? f0 : f > f1 ? f1 : f;
        }
      }
    }
  }
}

/** findFirst's predicates: F(x) > level, S(x) <= level, F(x) >= level (each monotone in x). */
const CDF_ABOVE = 0;
const SURVIVAL_AT_MOST = 1;
const CDF_AT_LEAST = 2;

// S(x) for SURVIVAL_AT_MOST, else F(x): the value the predicate tests.
function tested(dist: DelayDistribution, test: number, x: number): number {
  return test === SURVIVAL_AT_MOST ? dist.survival(x) : dist.cdf(x);
}

function passes(test: number, level: number, value: number): boolean {
  return test === SURVIVAL_AT_MOST ? value <= level : test === CDF_ABOVE ? value > level : value >= level;
}

function holds(dist: DelayDistribution, test: number, level: number, x: number): boolean {
  return passes(test, level, tested(dist, test, x));
}

// The tested value on a scale where a Gumbel-like tail is linear in x and falls as x grows:
// log S in the right tail, log(-log F) in the left (-log F = e^{-z} for a Gumbel). Used only to
// aim the next probe, never to decide the predicate.
function aimScale(test: number, value: number): number {
  return test === SURVIVAL_AT_MOST ? Math.log(value) : Math.log(-Math.log(value));
}

/** Value-guided probes findFirst makes from a guess before it falls back to halving. */
const AIMED_PROBES = 8;

/**
 * The first whole minute in [a0, b0] where the monotone predicate (test, level) holds, b0
 * counting as holding. With a guess (a nearby draw's answer), each probe is aimed by the secant
 * through the last two values on aimScale, or is the neighbour of the bracket's end when the
 * secant points past it, so that the usual answer is bracketed in about four evaluations; after
 * AIMED_PROBES, or without a guess, the bracket is halved. The predicate alone decides, and it
 * is monotone, so the answer does not depend on the guess. (A predicate code rather than a
 * closure: a closure made per table is a new call target each time.)
 */
function findFirst(dist: DelayDistribution, test: number, level: number, a0: number, b0: number, guess: number | undefined): number {
  let a = a0 - 1; // the predicate fails here (a0 - 1 stands for "below the range")
  let b = b0; // and holds here
  if (guess === undefined || !(guess > a0 && guess < b0)) {
    if (holds(dist, test, level, a0)) return a0;
    a = a0;
  } else {
    const target = aimScale(test, level);
    let x = guess;
    let previousX = NaN;
    let previousV = NaN;
    let step = 1;
    for (let probes = 0; probes < AIMED_PROBES && b - a > 1; probes++) {
      const value = tested(dist, test, x);
      const ok = passes(test, level, value);
      if (ok) b = x;
      else a = x;
      if (b - a <= 1) break;
      const v = aimScale(test, value);
      let next: number;
      if (Number.isFinite(v) && Number.isFinite(previousV) && v !== previousV) {
        // The secant's first holding minute, or the bracket end's neighbour when it lies outside.
        const estimate = Math.ceil(x + ((target - v) * (x - previousX)) / (v - previousV));
        next = estimate >= b ? b - 1 : estimate <= a ? a + 1 : estimate;
      } else {
        // Nothing to aim with yet (or a value of 0 or 1): steps that double away from the guess.
        next = ok ? Math.max(a + 1, b - step) : Math.min(b - 1, a + step);
        step *= 2;
      }
      previousX = x;
      previousV = v;
      x = next;
    }
  }
  while (b - a > 1) {
    const mid = Math.floor((a + b) / 2);
    if (holds(dist, test, level, mid)) b = mid;
    else a = mid;
  }
  return b;
}

/**
 * The largest a < b with cdf[a] < u, for cdf[0] < u <= cdf[b] (so cdf[a + 1] >= u). Returns a
 * small integer, which, unlike a double, a call returns without boxing.
 */
function largestBelow(cdf: Float64Array, u: number, b: number): number {
  let a = 0;
  while (b - a > 1) {
    const mid = (a + b) >>> 1;
    if (cdf[mid]! < u) a = mid;
    else b = mid;
  }
  return a;
}

function invertByBisection(dist: DelayDistribution, u: number, a0: number, b0: number): number {
  let a = a0;
  let b = b0;
  // Widen until the bracket holds the quantile (at most to the search bounds: a quantile beyond
  // five days late is returned as five days), then halve it to well under a second.
  while (dist.cdf(a) > u && a > SEARCH_LO) a = Math.max(SEARCH_LO, a - 2880);
  while (dist.cdf(b) < u && b < SEARCH_HI) b = Math.min(SEARCH_HI, b + 2880);
  for (let i = 0; i < 60 && b - a > 1e-3; i++) {
    const mid = (a + b) / 2;
    if (dist.cdf(mid) < u) a = mid;
    else b = mid;
  }
  return (a + b) / 2;
}

/**
 * The draws of one route and kind that the engine uses, tabulated lazily.
 *
 * With `draws` = J joint draws, joint draw t uses the route's draw floor((t + 0.5) * drawCount / J):
 * an even thinning, and the same index on every route when routes have equal draw counts, which
 * keeps any correlation the bundle's joint draws carry between routes.
 */
export class RouteTables {
  /** Tables by step: 1, 2, 4 minutes (only departures' density tables come in the coarser ones). */
  private readonly tables: (DrawTable | undefined)[][];
  private built = 0;
  /** Per draw, worked out once for every pair that uses the route: featureScale and whether the density jumps. */
  private scales?: Float64Array;
  private jumpy?: Uint8Array;

  /** `store`: where the tables' arrays come from (table-store.ts; a recycling one invalidates them on reset). */
  constructor(
    readonly posterior: RoutePosterior,
    readonly draws: number,
    private readonly store: TableStore = LASTING_TABLES,
  ) {
    if (!Number.isInteger(draws) || draws < 1 || draws > posterior.drawCount) {
      throw new RangeError(`joint draws must be a whole number in [1, ${posterior.drawCount}], got ${draws}`);
    }
    this.tables = [new Array<DrawTable | undefined>(draws)];
  }

  /** The route's own draw index behind joint draw t. */
  drawIndex(t: number): number {
    return Math.floor(((t + 0.5) * this.posterior.drawCount) / this.draws);
  }

  /** The distribution of joint draw t, without tabulating it (the simulation samples from it). */
  distribution(t: number): DelayDistribution {
    return this.posterior.draw(this.drawIndex(t));
  }

  /**
   * The table of joint draw t: a CDF table for arrivals, a density table for departures (with
   * the given step, 1, 2 or 4 minutes; arrivals' tables have step 1). Arrivals' tables are
   * built in draw order (all before t too: every draw is used), each starting its grid searches
   * where the one before ended. A departure table is built alone, starting from the searches of
   * the nearest draw built at any step (the searches do not depend on the step): a pair's draws
   * take different steps, and a route's pairs different ones again, so building every draw
   * before t at each step asked for built most departure draws twice. The hint only speeds the
   * searches, so a table never depends on the order of the asking.
   */
  table(t: number, step = 1): DrawTable {
    const level = step === 1 ? 0 : step === 2 ? 1 : step === 4 ? 2 : -1;
    if (level < 0 || (level > 0 && this.posterior.kind === 'arrival')) throw new RangeError(`no ${this.posterior.kind} table with a step of ${step} minutes`);
    const tables = (this.tables[level] ??= new Array<DrawTable | undefined>(this.draws));
    let table = tables[t];
    if (!table) {
      if (this.posterior.kind === 'arrival') {
        for (; this.built <= t; this.built++) {
          const s = this.built;
          table = new DrawTable(this.posterior.draw(this.drawIndex(s)), 'cdf', tables[s - 1]?.searched, 1, this.store);
          tables[s] = table;
        }
      } else {
        const dist = this.posterior.draw(this.drawIndex(t));
        const role = 'density';
        const hint = this.nearestSearched(t);
        table = new DrawTable(dist, role, hint, step, this.store);
        // Exact cell masses are right to second order only: at a coarse step, a density that
        // needs them gets a finer table instead.
        for (let finer = step / 2; table.cellMasses && finer >= 1; finer /= 2) table = new DrawTable(dist, role, hint, finer, this.store);
        tables[t] = table;
      }
    }
    return table!;
  }

  /** The searches of the built table nearest to draw t (the draw before first), at any step. */
  private nearestSearched(t: number): readonly [number, number, number] | undefined {
    for (let d = 1; d < this.draws; d++) {
      for (const s of [t - d, t + d]) {
        if (s < 0 || s >= this.draws) continue;
        for (const byDraw of this.tables) {
          const table = byDraw?.[s];
          if (table) return table.searched;
        }
      }
    }
    return undefined;
  }

  /** The featureScale of joint draw t's distribution (NaN when it has none). */
  featureScale(t: number): number {
    this.describe(t);
    return this.scales![t]!;
  }

  /** Whether joint draw t's density jumps anywhere (densityJumps). */
  jumps(t: number): boolean {
    this.describe(t);
    return this.jumpy![t] === 1;
  }

  // jumpy[t]: 0 not yet looked at, 1 jumps, 2 does not.
  private describe(t: number): void {
    const jumpy = (this.jumpy ??= new Uint8Array(this.draws));
    const scales = (this.scales ??= new Float64Array(this.draws));
    if (jumpy[t] !== 0) return;
    const dist = this.distribution(t) as DelayDistribution & GridEvaluation;
    scales[t] = dist.featureScale ? dist.featureScale() : NaN;
    jumpy[t] = (dist.densityJumps?.().length ?? 0) > 0 ? 1 : 2;
  }
}
