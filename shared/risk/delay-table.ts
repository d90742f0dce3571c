// A route's posterior draws tabulated on a whole-minute grid: the CDF at every minute where the
// delay has mass, and the inverse CDF for simulation.
//
// Tabulating once per (route, kind, draw) is what makes the quadrature in connection-probability.ts
// and the trip simulation cheap: both only ever look up F at whole minutes.
import type { DelayDistribution, RoutePosterior } from '../delay/predictive';

/** Mass left out below the grid: F(lo) is at most this. */
const LOW_TAIL = 1e-10;
/** Mass left out above the grid for a light tail: S(hi) is at most this. */
const HIGH_TAIL = 1e-7;
/** Whole-minute resolution ends where S falls to this; the thin tail beyond uses wider steps. */
const CORE_TAIL = 1e-2;
/** Exact evaluations in the thin tail; the steps between them widen to fit. */
const TAIL_NODES = 40;
/** Widest grid in minutes (two days); a heavier tail is handled by calling the distribution directly. */
const MAX_SPAN_MINUTES = 2880;
/** Search bounds for the grid ends (minutes): two days early to five days late. */
const SEARCH_LO = -2880;
const SEARCH_HI = 7200;

/**
 * What a table is for: 'cdf' (the inbound arrival delay, whose CDF the quadrature looks up) or
 * 'density' (the outbound departure delay, whose density weights the quadrature).
 */
export type TableRole = 'cdf' | 'density';

/**
 * One posterior draw's delay distribution on the whole-minute grid lo, lo + 1, ..., hi.
 *
 * Up to the point where S = 1e-2 every minute is evaluated exactly. Beyond it, in the thin tail,
 * about TAIL_NODES exact evaluations with steps growing from 2 minutes carry the rest: log S is
 * linear between them and each cell's exact mass is split between its ends. Against a fine direct
 * integration of Gumbel mixtures with wide disrupted components the error stays near 1e-5
 * (test/shared/risk/connection-probability.test.ts), and P(make) stays monotone.
 */
export class DrawTable {
  /** First grid minute. */
  readonly lo: number;
  /** Last grid minute. */
  readonly hi: number;
  /** cdf[i] ~ F(lo + i): exact on the whole-minute core, interpolated in the tail. Monotone. */
  readonly cdf: Float64Array;
  /**
   * Only for role 'density': quadrature weights for integrating g against the density,
   * E[g(X)] ~ sum_i weight[i] g(lo + i) + lowMass g(lo) + highMass g(hi). On the core they are
   * the density at each minute: the trapezoid rule with unit step on a smooth integrand that
   * vanishes at the ends is accurate far beyond h^2 (Euler-Maclaurin; Trefethen & Weideman,
   * "The exponentially convergent trapezoidal rule", SIAM Review 56, 2014).
   */
  readonly weight: Float64Array;
  /** The part of the end correction taken from the first tail point (see the constructor). */
  private endCorrection = 0;
  /** Grid points 0..coreLength-1 are the whole-minute core; beyond it only tailIndex carry weight. */
  readonly coreLength: number;
  /** Indices past the core with non-zero weight, ascending (role 'density'). */
  readonly tailIndex: Int32Array;
  /** P(X <= lo). */
  readonly lowMass: number;
  /** S(hi) = P(X > hi), computed from the survival function. */
  readonly highMass: number;
  /** F beyond the grid for a light tail: 1 - S(hi), never below the table's last value. */
  readonly beyondHi: number;
  /** True when the grid was cut at MAX_SPAN_MINUTES with more than HIGH_TAIL mass beyond it. */
  readonly heavyTail: boolean;

  constructor(
    readonly dist: DelayDistribution,
    readonly role: TableRole,
  ) {
    const lo = findFirst((x) => dist.cdf(x) > LOW_TAIL, SEARCH_LO, SEARCH_HI) - 1;
    const hiCap = lo + MAX_SPAN_MINUTES;
    const hi = Math.min(hiCap, findFirst((x) => dist.survival(x) <= HIGH_TAIL, lo, SEARCH_HI));
    const core = Math.min(hi, findFirst((x) => dist.survival(x) <= CORE_TAIL, lo, SEARCH_HI));
    const n = hi - lo + 1;
    this.lo = lo;
    this.hi = hi;
    this.cdf = new Float64Array(n);
    this.weight = new Float64Array(role === 'density' ? n : 0);
    this.coreLength = core - lo + 1;
    const step = Math.max(1, Math.ceil((hi - core) / TAIL_NODES));
    const tail: number[] = [];
    // Steps grow geometrically from 2 minutes at the core's end up to `step`.
    for (let x = core, h = 2; x < hi; x += h, h = Math.min(step, Math.ceil(h * 1.5))) tail.push(x);
    tail.push(hi);
    const tailSurvival = tail.map((x) => checked(dist.survival(x), x, 'survival'));
    this.highMass = tailSurvival[tailSurvival.length - 1] ?? 0;
    if (role === 'cdf') {
      for (let x = lo; x <= core; x++) this.cdf[x - lo] = checked(dist.cdf(x), x, 'CDF');
      this.lowMass = this.cdf[0] ?? 0;
    } else {
      this.lowMass = checked(dist.cdf(lo), lo, 'CDF');
      for (let x = lo; x <= core; x++) this.weight[x - lo] = checkedDensity(dist.pdf(x), x);
      this.weight[core - lo] = (this.weight[core - lo] ?? 0) / 2;
      // Euler-Maclaurin end correction of the core's trapezoid at its last point c:
      // -(1/12) (f g)'(c), with f'(c) by a central difference and g'(c) ~ (g(c+2) - g(c-2)) / 4,
      // carried by the weights at c - 2 and at c + 2 (the first tail point). Both stay positive.
      if (core - 2 > lo && core + 2 < hi) {
        const fc = 2 * this.weight[core - lo]!;
        const slope = (dist.pdf(core + 1) - this.weight[core - lo - 1]!) / 2;
        this.weight[core - lo] = this.weight[core - lo]! - slope / 12;
        this.weight[core - lo - 2] = this.weight[core - lo - 2]! + fc / 48;
        this.endCorrection = fc / 48;
      }
      // The CDF on the core by the cumulative trapezoid rule, for simulation only.
      let f = this.lowMass;
      this.cdf[0] = f;
      const coreIndex = core - lo;
      for (let i = 1; i <= coreIndex; i++) {
        // weight[coreIndex] holds half the density there (the trapezoid's end).
        f += ((this.weight[i - 1] ?? 0) + (this.weight[i] ?? 0) * (i === coreIndex ? 2 : 1)) / 2;
        this.cdf[i] = Math.min(1, f);
      }
      // Each tail cell's exact mass goes to its two ends in the ratio that puts its centre of
      // mass right for an exponential density across the cell (rate from the two survivals), so
      // the rule is exact for a g linear across the cell.
      for (let k = 0; k + 1 < tail.length; k++) {
        const s0 = tailSurvival[k]!;
        const s1 = tailSurvival[k + 1]!;
        const mass = Math.max(0, s0 - s1);
        const width = tail[k + 1]! - tail[k]!;
        const decay = s0 > 0 && s1 > 0 ? Math.log(s0 / s1) : 0;
        const theta = decay > 1e-6 ? 1 / decay - 1 / Math.expm1(decay) : 0.5;
        this.weight[tail[k]! - lo] = this.weight[tail[k]! - lo]! + mass * (1 - theta);
        this.weight[tail[k + 1]! - lo] = this.weight[tail[k + 1]! - lo]! + Math.max(0, mass * theta - (k === 0 ? this.endCorrection : 0));
        void width;
      }
    }
    // The thin tail of the CDF: exact at the nodes; between them log S is linear, which is exact
    // for an exponential tail (as a Gumbel's is) and keeps the CDF increasing.
    for (let k = 0; k + 1 < tail.length; k++) {
      const x0 = tail[k]!;
      const x1 = tail[k + 1]!;
      const s0 = tailSurvival[k]!;
      const s1 = tailSurvival[k + 1]!;
      const f0 = Math.max(this.cdf[x0 - lo]!, 1 - s0);
      if (!(s0 > 0 && s1 > 0)) {
        for (let x = x0; x <= x1; x++) this.cdf[x - lo] = Math.max(f0, f0 + ((s0 - s1) * (x - x0)) / (x1 - x0 || 1));
        continue;
      }
      const rate = Math.log(s1 / s0) / (x1 - x0 || 1);
      for (let x = x0; x <= x1; x++) this.cdf[x - lo] = Math.max(f0, 1 - s0 * Math.exp(rate * (x - x0)));
    }
    for (let i = 1; i < n; i++) if ((this.cdf[i] ?? 0) < (this.cdf[i - 1] ?? 0)) this.cdf[i] = this.cdf[i - 1] ?? 0;
    this.heavyTail = this.highMass > HIGH_TAIL;
    this.tailIndex = Int32Array.from(role === 'density' ? tail.slice(1).map((x) => x - lo) : []);
    this.beyondHi = Math.max(this.cdf[n - 1] ?? 1, 1 - this.highMass);
  }

  /** F(x) at a whole minute x: the table inside the grid, the distribution (or its limit) outside. */
  cdfAt(x: number): number {
    if (x < this.lo) return 0;
    if (x > this.hi) return this.heavyTail ? Math.max(this.beyondHi, this.dist.cdf(x)) : this.beyondHi;
    return this.cdf[x - this.lo] ?? NaN;
  }

  /**
   * The delay with F(delay) = u, linear between grid minutes; outside the grid it inverts the
   * distribution itself by bisection. u must lie in (0, 1).
   */
  inverse(u: number): number {
    const cdf = this.cdf;
    const n = cdf.length;
    if (u <= cdf[0]!) return invertByBisection(this.dist, u, SEARCH_LO, this.lo);
    if (u > cdf[n - 1]!) return invertByBisection(this.dist, u, this.hi, SEARCH_HI);
    // A guide table (Chen & Asau 1974) narrows the search to the indices of u's bucket.
    const guide = (this.guide ??= buildGuide(cdf));
    const bucket = Math.min(GUIDE_BUCKETS - 1, Math.floor(u * GUIDE_BUCKETS));
    let a = Math.max(0, guide[bucket]! - 1);
    let b = guide[bucket + 1]!;
    while (b - a > 1) {
      const mid = (a + b) >>> 1;
      if (cdf[mid]! < u) a = mid;
      else b = mid;
    }
    const fa = cdf[a]!;
    const fb = cdf[b]!;
    const t = fb > fa ? (u - fa) / (fb - fa) : 0;
    return this.lo + a + t;
  }

  private guide: Int32Array | undefined;
}

const GUIDE_BUCKETS = 256;

// guide[b] = the first index i with cdf[i] >= b / GUIDE_BUCKETS (n - 1 when none), b = 0..GUIDE_BUCKETS.
function buildGuide(cdf: Float64Array): Int32Array {
  const n = cdf.length;
  const guide = new Int32Array(GUIDE_BUCKETS + 1);
  let i = 0;
  for (let b = 0; b <= GUIDE_BUCKETS; b++) {
    while (i < n - 1 && cdf[i]! < b / GUIDE_BUCKETS) i++;
    guide[b] = i;
  }
  return guide;
}

function checked(value: number, x: number, what: string): number {
  if (!(value >= 0 && value <= 1)) throw new RangeError(`delay distribution gives an invalid ${what} (${value}) at ${x} minutes`);
  return value;
}

function checkedDensity(value: number, x: number): number {
  if (!(value >= 0) || !Number.isFinite(value)) throw new RangeError(`delay distribution gives an invalid density (${value}) at ${x} minutes`);
  return value;
}

/** The first whole minute in (a, b] where a monotone predicate holds (b when none does). */
function findFirst(holds: (x: number) => boolean, a0: number, b0: number): number {
  let a = a0;
  let b = b0;
  if (holds(a)) return a;
  while (b - a > 1) {
    const mid = Math.floor((a + b) / 2);
    if (holds(mid)) b = mid;
    else a = mid;
  }
  return b;
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
  private readonly tables: (DrawTable | undefined)[];

  constructor(
    readonly posterior: RoutePosterior,
    readonly draws: number,
  ) {
    if (!Number.isInteger(draws) || draws < 1 || draws > posterior.drawCount) {
      throw new RangeError(`joint draws must be a whole number in [1, ${posterior.drawCount}], got ${draws}`);
    }
    this.tables = new Array<DrawTable | undefined>(draws);
  }

  /** The route's own draw index behind joint draw t. */
  drawIndex(t: number): number {
    return Math.floor(((t + 0.5) * this.posterior.drawCount) / this.draws);
  }

  /** The table of joint draw t: a CDF table for arrivals, a density table for departures. */
  table(t: number): DrawTable {
    let table = this.tables[t];
    if (!table) {
      table = new DrawTable(this.posterior.draw(this.drawIndex(t)), this.posterior.kind === 'arrival' ? 'cdf' : 'density');
      this.tables[t] = table;
    }
    return table;
  }
}
