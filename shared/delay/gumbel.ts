// The Gumbel (type I extreme-value, maximum) distribution with location mu and scale beta.
//
//   pdf(x) = (1/beta) exp(-(z + e^-z)),  z = (x - mu) / beta
//   cdf(x) = exp(-e^-z)
//   mean = mu + gamma * beta (gamma = Euler-Mascheroni), variance = pi^2 beta^2 / 6
// (NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.6.6.16, "Extreme Value Type I").
//
// Edge-case contract, the same for every function here: any NaN argument gives NaN;
// an invalid parameter (beta <= 0 or not finite, mu not finite) gives NaN; x = ±Infinity
// gives the limit (cdf 0 or 1, density 0, log density -Infinity).
import type { Rng } from '../inference/rng';
import { exponentialRow, strideCount } from './draw-buffers';
import type { DelayDistribution, GridEvaluation } from './predictive';

export const EULER_GAMMA = 0.5772156649015329;

function invalid(mu: number, beta: number): boolean {
  return !Number.isFinite(mu) || !(beta > 0) || !Number.isFinite(beta);
}

/** @example gumbelLogPdf(0, 0, 1) // returns -1 */
export function gumbelLogPdf(x: number, mu: number, beta: number): number {
  if (Number.isNaN(x) || invalid(mu, beta)) return NaN;
  if (!Number.isFinite(x)) return -Infinity;
  const z = (x - mu) / beta;
  return -Math.log(beta) - z - Math.exp(-z);
}

/** @example gumbelPdf(0, 0, 1) // returns ~0.3679 */
export function gumbelPdf(x: number, mu: number, beta: number): number {
  return Math.exp(gumbelLogPdf(x, mu, beta));
}

/** @example gumbelCdf(0, 0, 1) // returns ~0.3679 (e^-1) */
export function gumbelCdf(x: number, mu: number, beta: number): number {
  if (Number.isNaN(x) || invalid(mu, beta)) return NaN;
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  return Math.exp(-Math.exp(-(x - mu) / beta));
}

/**
 * P(X > x), computed without cancellation in the right tail: 1 - exp(-t) = -expm1(-t).
 * @example gumbelSurvival(10, 0, 1) // returns ~4.540e-5
 */
export function gumbelSurvival(x: number, mu: number, beta: number): number {
  if (invalid(mu, beta)) return NaN;
  return oneMinusExpNeg(Math.exp(-(x - mu) / beta));
}

/**
 * 1 - e^{-t} for t >= 0 (NaN gives NaN, Infinity 1): below 1/32 by its Taylor series to t^9,
 * whose remainder is under t^9 / 9! < 1e-19 relative, so the result is Math.expm1's to
 * rounding; above, -expm1(-t). The right tail, where the risk tables ask most, costs no exp.
 */
export function oneMinusExpNeg(t: number): number {
  if (!(t < 1 / 32)) return -Math.expm1(-t);
  // Far in a right tail (the risk tables' last nodes): t^2 / 6 < 2e-17 relative is all that is left.
  if (t < 1e-8) return t * (1 - 0.5 * t);
  // Estrin's scheme with the coefficients 1 / k! written out: a Horner chain of divisions cost
  // more than the rest of a risk table's tail node. Everything after the 1 is under 1/64, so
  // its roundings move the result by well under an ulp.
  const t2 = t * t;
  const t4 = t2 * t2;
  const rest = -0.5 * t + t2 * (1 / 6 - t * (1 / 24)) + t4 * (1 / 120 - t * (1 / 720) + t2 * (1 / 5040 - t * (1 / 40320)) + t4 * (1 / 362880));
  return t * (1 + rest);
}

/**
 * The p-quantile. p outside [0, 1] or NaN gives NaN; p = 0 gives -Infinity, p = 1 Infinity.
 * @example gumbelQuantile(0.5, 0, 1) // returns ~0.3665
 */
export function gumbelQuantile(p: number, mu: number, beta: number): number {
  if (Number.isNaN(p) || invalid(mu, beta) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  return mu - beta * Math.log(-Math.log(p));
}

/** One draw by inversion, from the injected generator. Invalid parameters give NaN. */
export function gumbelSample(rng: Rng, mu: number, beta: number): number {
  if (invalid(mu, beta)) return NaN;
  return mu - beta * Math.log(-Math.log(rng.uniform()));
}

/**
 * One draw as mu - beta log E, E standard exponential from the generator's ziggurat: the same
 * distribution as gumbelSample's inversion (E stands for -log U) with a uniform and a log fewer.
 * The delay distributions sample so; gumbelSample keeps the simulated data sets of the fits'
 * tests as they were. Parameters assumed valid.
 */
export function gumbelExponentialSample(rng: Rng, mu: number, beta: number): number {
  return mu - beta * Math.log(rng.exponential());
}

export function gumbelMean(mu: number, beta: number): number {
  return invalid(mu, beta) ? NaN : mu + EULER_GAMMA * beta;
}

export function gumbelVariance(mu: number, beta: number): number {
  return invalid(mu, beta) ? NaN : (Math.PI * Math.PI * beta * beta) / 6;
}

/** How often addGumbelSurvivals recomputes e^{-z} instead of stepping it (nodes). */
const SURVIVAL_RESYNC_NODES = 8;

/**
 * weight * S(xs[k]) added into out[k] for k < count, S = 1 - exp(-e^{-z}) as gumbelSurvival
 * computes it, except that e^{-z} is stepped from node to node by e^{-h/beta} (one exp per
 * distinct gap h; the risk tables' tail nodes have a handful) and recomputed every
 * SURVIVAL_RESYNC_NODES nodes. It differs from gumbelSurvival by rounding in z = (x - mu) / beta,
 * a relative difference of order z 2^-53 (1e-14 at z = 76, where S is 1e-33); both are that
 * close to exact, as rounding z alone moves e^{-z} by as much. Parameters assumed valid.
 */
export function addGumbelSurvivals(xs: Int32Array, count: number, out: Float64Array, mu: number, beta: number, weight: number): void {
  let t = 0;
  let gap = NaN;
  let ratio = 1;
  for (let k = 0; k < count; k++) {
    const x = xs[k]!;
    // Recomputed now and then, and wherever e^{-z} overflowed far below the location.
    if (k % SURVIVAL_RESYNC_NODES === 0 || !(t < Infinity)) t = Math.exp(-(x - mu) / beta);
    else {
      const h = x - xs[k - 1]!;
      if (h !== gap) {
        gap = h;
        ratio = Math.exp(-h / beta);
      }
      t *= ratio;
    }
    out[k] = out[k]! + weight * oneMinusExpNeg(t);
  }
}

/** How often addGumbelGrid recomputes e^{-z} instead of stepping it (points). */
const RESYNC_POINTS = 32;

/**
 * Adds weight * F (or weight * f) at lo, lo + step, ... into out: e^{-z} is stepped by the
 * constant ratio e^{-step/beta} and recomputed every RESYNC_POINTS points, so one exp per point
 * remains (from a table, expNegative), and none where e^{-z} is negligible or nearly 1. Equal
 * to gumbelCdf and gumbelPdf within 3e-14 relative or 2.4e-16 * weight absolute; parameters
 * assumed valid.
 */
export function addGumbelGrid(out: Float64Array, lo: number, step: number, mu: number, beta: number, weight: number, density: boolean): void {
  const n = out.length;
  const ratio = Math.exp(-step / beta);
  const scale = weight / beta;
  let t = 0;
  for (let i = 0; i < n; i++) {
    // Recompute e^{-z} directly now and then: no drift, and no Infinity carried forward from
    // far below the location, where e^{-z} overflows.
    if (i % RESYNC_POINTS === 0 || !Number.isFinite(t)) t = Math.exp(-(lo + i * step - mu) / beta);
    else t *= ratio;
    // Far below the location e^{-t} < 2.4e-16 adds nothing that matters; far above it
    // e^{-t} = 1 - t + t^2 / 2 to within t^3 / 6 < 2e-16. Only the band between needs an exp.
    if (t > NEGLIGIBLE_T) continue;
    const f = t < SERIES_T ? 1 - t * (1 - t / 2) : expNegative(t);
    // Multiplying t by f first keeps 0 * Infinity out.
    out[i]! += density ? scale * (t * f) : weight * f;
  }
}

const NEGLIGIBLE_T = 36;
/** The largest t expNegative takes. */
export const EXP_NEGATIVE_MAX = NEGLIGIBLE_T;
const SERIES_T = 1e-5;

// e^{-t} for 0 <= t <= NEGLIGIBLE_T as e^{-k/64} from a table times the degree-5 Taylor
// polynomial of e^{-r}, r = t - k/64 < 1/64: relative error under 3e-14 (r^6 / 720 < 2e-14, plus
// rounding), for about a third of Math.exp's time. The grids spend most of their time here.
// (The 64s are written out below: a module constant is a context load V8 may not fold.)
const EXP_STEPS = 64;
const EXP_TABLE = Float64Array.from({ length: NEGLIGIBLE_T * EXP_STEPS + 2 }, (_, k) => Math.exp(-k / EXP_STEPS));

/** e^{-t} within 3e-14 relative, for 0 <= t <= EXP_NEGATIVE_MAX only (not checked). */
export function expNegative(t: number): number {
  const y = t * 64;
  const k = y | 0;
  const r = (y - k) * (1 / 64);
  // Estrin's scheme: shorter chains of dependent operations than Horner's.
  const r2 = r * r;
  return EXP_TABLE[k]! * (1 - r + r2 * (0.5 - r * (1 / 6) + r2 * (1 / 24 - r * (1 / 120))));
}

/**
 * A Gumbel as a DelayDistribution object, for the risk engine and the models' predictives,
 * with the risk tables' grid evaluation. Invalid parameters throw here (once), rather than
 * giving NaN on every later call.
 */
export function gumbelDistribution(mu: number, beta: number): DelayDistribution & GridEvaluation {
  if (invalid(mu, beta)) throw new RangeError(`Gumbel needs a finite location and a finite scale > 0, got (${mu}, ${beta})`);
  return new GumbelDistribution(mu, beta);
}

// A class rather than an object of closures: a scoring run makes thousands (two per posterior
// draw of a mixture), and each closure-built object cost a dozen function objects, about half a
// kilobyte that lived as long as the run's tables and was copied by every scavenge meanwhile.
class GumbelDistribution implements DelayDistribution, GridEvaluation {
  constructor(
    readonly location: number,
    readonly scale: number,
  ) {}

  featureScale(): number {
    return this.scale;
  }

  /** The parameters themselves (DelayDistribution.gumbel). */
  get gumbel(): { readonly location: number; readonly scale: number } {
    return this;
  }

  cdf(x: number): number {
    return gumbelCdf(x, this.location, this.scale);
  }

  // Parameters checked by gumbelDistribution; NaN and the infinities come out right without special cases.
  survival(x: number): number {
    return oneMinusExpNeg(Math.exp(-(x - this.location) / this.scale));
  }

  pdf(x: number): number {
    return gumbelPdf(x, this.location, this.scale);
  }

  sample(rng: Rng): number {
    return gumbelExponentialSample(rng, this.location, this.scale);
  }

  // gumbelExponentialSample's formula on the exponentials drawn in bulk (the same stream as
  // one call each): a draw returned from a call that V8 does not inline is boxed.
  sampleInto(rng: Rng, out: Float64Array, start: number, stride: number, cap: number): void {
    const mu = this.location;
    const beta = this.scale;
    const count = strideCount(out.length, start, stride);
    const es = exponentialRow(count);
    rng.exponentials(es, count);
    for (let k = 0, i = start; k < count; k++, i += stride) out[i] = Math.min(cap, mu - beta * Math.log(es[k]!));
  }

  cdfGrid(lo: number, out: Float64Array, step = 1): void {
    out.fill(0);
    addGumbelGrid(out, lo, step, this.location, this.scale, 1, false);
  }

  pdfGrid(lo: number, out: Float64Array, step = 1): void {
    out.fill(0);
    addGumbelGrid(out, lo, step, this.location, this.scale, 1, true);
  }

  addGrid(lo: number, out: Float64Array, step: number, weight: number, density: boolean): void {
    addGumbelGrid(out, lo, step, this.location, this.scale, weight, density);
  }

  survivalAt(xs: Int32Array, count: number, out: Float64Array): void {
    out.fill(0, 0, count);
    addGumbelSurvivals(xs, count, out, this.location, this.scale, 1);
  }

  addSurvivalAt(xs: Int32Array, count: number, out: Float64Array, weight: number): void {
    addGumbelSurvivals(xs, count, out, this.location, this.scale, weight);
  }
}
