// The normal distribution with mean mu and standard deviation sigma.
//
//   pdf(x) = exp(-z^2 / 2) / (sigma sqrt(2 pi)),  z = (x - mu) / sigma
// CDF: Marsaglia's Taylor series for |z| < 3 (G. Marsaglia, "Evaluating the Normal
// Distribution", J. Stat. Software 11(4), 2004) and, in the tails, the continued fraction for
// the Mills ratio (Abramowitz & Stegun 26.2.14) evaluated by the modified Lentz method, so
// that tail probabilities keep their relative precision. Quantile: P. J. Acklam's rational
// approximation refined by one Halley step against this CDF.
//
// Edge-case contract, the same for every function here: any NaN argument gives NaN; an
// invalid parameter (sigma <= 0 or not finite, mu not finite) gives NaN; x = ±Infinity gives
// the limit (cdf 0 or 1, density 0, log density -Infinity).
import type { Rng } from '../inference/rng';
import type { DelayDistribution } from './predictive';

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);
const SQRT_2PI = Math.sqrt(2 * Math.PI);

function invalid(mu: number, sigma: number): boolean {
  return !Number.isFinite(mu) || !(sigma > 0) || !Number.isFinite(sigma);
}

/** @example normalLogPdf(0, 0, 1) // returns ~-0.9189 */
export function normalLogPdf(x: number, mu: number, sigma: number): number {
  if (Number.isNaN(x) || invalid(mu, sigma)) return NaN;
  if (!Number.isFinite(x)) return -Infinity;
  const z = (x - mu) / sigma;
  return -0.5 * z * z - Math.log(sigma) - LOG_SQRT_2PI;
}

/** @example normalPdf(0, 0, 1) // returns ~0.3989 */
export function normalPdf(x: number, mu: number, sigma: number): number {
  return Math.exp(normalLogPdf(x, mu, sigma));
}

/** Upper tail Q(z) = P(Z > z) of the standard normal for z >= 3, by the Mills-ratio continued fraction. */
function upperTailLarge(z: number): number {
  // Q(z) = phi(z) / (z + 1/(z + 2/(z + 3/(z + ...)))), modified Lentz.
  const tiny = 1e-300;
  let f = z;
  let c = z;
  let d = 0;
  for (let k = 1; k < 500; k++) {
    d = z + k * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = z + k / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-0.5 * z * z) / SQRT_2PI / f;
}

/** Standard normal CDF. */
function standardCdf(z: number): number {
  if (z <= -3) return upperTailLarge(-z);
  if (z >= 3) return 1 - upperTailLarge(z);
  // Marsaglia (2004): Phi(z) = 1/2 + phi(z) (z + z^3/3 + z^5/(3*5) + ...).
  let term = z;
  let sum = z;
  const z2 = z * z;
  for (let k = 3; k < 200; k += 2) {
    term *= z2 / k;
    const next = sum + term;
    if (next === sum) break;
    sum = next;
  }
  return 0.5 + sum * Math.exp(-0.5 * z2 - LOG_SQRT_2PI);
}

/** @example normalCdf(1.96, 0, 1) // returns ~0.9750 */
export function normalCdf(x: number, mu: number, sigma: number): number {
  if (Number.isNaN(x) || invalid(mu, sigma)) return NaN;
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  return standardCdf((x - mu) / sigma);
}

/**
 * P(X > x), with full relative precision in the right tail.
 * @example normalSurvival(10, 0, 1) // returns ~7.620e-24
 */
export function normalSurvival(x: number, mu: number, sigma: number): number {
  if (Number.isNaN(x) || invalid(mu, sigma)) return NaN;
  if (x === Infinity) return 0;
  if (x === -Infinity) return 1;
  return standardCdf(-(x - mu) / sigma);
}

// Acklam's coefficients (central region |p - 0.5| <= 0.47575, then the two tails).
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];

function standardQuantile(p: number): number {
  let x: number;
  if (p < 0.02425) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((C[0]! * q + C[1]!) * q + C[2]!) * q + C[3]!) * q + C[4]!) * q + C[5]!) / ((((D[0]! * q + D[1]!) * q + D[2]!) * q + D[3]!) * q + 1);
  } else if (p > 1 - 0.02425) {
    const q = Math.sqrt(-2 * Math.log1p(-p));
    x = -(((((C[0]! * q + C[1]!) * q + C[2]!) * q + C[3]!) * q + C[4]!) * q + C[5]!) / ((((D[0]! * q + D[1]!) * q + D[2]!) * q + D[3]!) * q + 1);
  } else {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((A[0]! * r + A[1]!) * r + A[2]!) * r + A[3]!) * r + A[4]!) * r + A[5]!) * q) / (((((B[0]! * r + B[1]!) * r + B[2]!) * r + B[3]!) * r + B[4]!) * r + 1);
  }
  // One Halley step on Phi(x) = p; in the upper tail on the survival function, to keep precision.
  const e = p > 0.5 ? -(standardCdf(-x) - (1 - p)) : standardCdf(x) - p;
  const u = e * SQRT_2PI * Math.exp(0.5 * x * x);
  return x - u / (1 + 0.5 * x * u);
}

/**
 * The p-quantile. p outside [0, 1] or NaN gives NaN; p = 0 gives -Infinity, p = 1 Infinity.
 * @example normalQuantile(0.975, 0, 1) // returns ~1.95996
 */
export function normalQuantile(p: number, mu: number, sigma: number): number {
  if (Number.isNaN(p) || invalid(mu, sigma) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  return mu + sigma * standardQuantile(p);
}

/** One draw from the injected generator. Invalid parameters give NaN. */
export function normalSample(rng: Rng, mu: number, sigma: number): number {
  if (invalid(mu, sigma)) return NaN;
  return mu + sigma * rng.normal();
}

export function normalMean(mu: number, sigma: number): number {
  return invalid(mu, sigma) ? NaN : mu;
}

export function normalVariance(mu: number, sigma: number): number {
  return invalid(mu, sigma) ? NaN : sigma * sigma;
}

/** A normal as a DelayDistribution object. Invalid parameters throw a RangeError. */
export function normalDistribution(mu: number, sigma: number): DelayDistribution {
  if (invalid(mu, sigma)) throw new RangeError(`Normal needs a finite mean and a finite sd > 0, got (${mu}, ${sigma})`);
  return {
    cdf: (x) => normalCdf(x, mu, sigma),
    survival: (x) => normalSurvival(x, mu, sigma),
    pdf: (x) => normalPdf(x, mu, sigma),
    sample: (rng) => normalSample(rng, mu, sigma),
  };
}
