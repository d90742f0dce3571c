// The location-scale Student-t distribution and the special functions it needs.
//
// It is the heavy-tailed "disrupted" component of the tail mixture: its survival decays as
// a power of the delay, as the on-time sample's tail does, where a Gumbel's decays
// exponentially.
//
// Edge-case contract, the same for every distribution function here: a NaN argument gives
// NaN; invalid parameters (scale <= 0, df <= 0, or not finite; location not finite) give
// NaN; x = ±Infinity gives the limit.
import type { Rng } from '../../inference/rng';

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
  -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/**
 * log Gamma(x) for x > 0 (Lanczos approximation, g = 7; Numerical Recipes, 3rd ed., 6.1).
 * x <= 0 or NaN gives NaN.
 * @example logGamma(0.5) // returns ~0.5724 (log sqrt(pi))
 */
export function logGamma(x: number): number {
  if (!(x > 0)) return NaN;
  if (x === Infinity) return Infinity;
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let a = LANCZOS[0]!;
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i]! / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/**
 * The digamma function psi(x) = d/dx log Gamma(x) for x > 0: recurrence up to x >= 10, then
 * the asymptotic series (Abramowitz & Stegun 6.3.5 and 6.3.18). x <= 0 or NaN gives NaN.
 * @example digamma(1) // returns ~-0.5772 (minus the Euler-Mascheroni constant)
 */
export function digamma(x: number): number {
  if (!(x > 0)) return NaN;
  let result = 0;
  let y = x;
  while (y < 10) {
    result -= 1 / y;
    y += 1;
  }
  const f = 1 / (y * y);
  return result + Math.log(y) - 0.5 / y - f * (1 / 12 - f * (1 / 120 - f * (1 / 252 - f * (1 / 240 - f / 132))));
}

/** Continued fraction for the incomplete beta (modified Lentz; Numerical Recipes, 3rd ed., 6.4). */
function betaContinuedFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return h;
}

/**
 * The regularised incomplete beta function I_x(a, b) for a, b > 0 and 0 <= x <= 1.
 * Anything else gives NaN.
 * @example regularizedBeta(0.5, 2, 2) // returns 0.5
 */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0) || !(x >= 0) || !(x <= 1)) return NaN;
  if (x === 0) return 0;
  if (x === 1) return 1;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log1p(-x));
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(a, b, x)) / a;
  return 1 - (front * betaContinuedFraction(b, a, 1 - x)) / b;
}

function invalid(location: number, scale: number, df: number): boolean {
  return !Number.isFinite(location) || !(scale > 0) || !Number.isFinite(scale) || !(df > 0) || !Number.isFinite(df);
}

/**
 * Log density of the location-scale t.
 * @example studentTLogPdf(0, 0, 1, 1) // returns ~-1.1447 (Cauchy: -log pi)
 */
export function studentTLogPdf(x: number, location: number, scale: number, df: number): number {
  if (Number.isNaN(x) || invalid(location, scale, df)) return NaN;
  if (!Number.isFinite(x)) return -Infinity;
  const u = (x - location) / scale;
  return (
    logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - Math.log(scale) - ((df + 1) / 2) * Math.log1p((u * u) / df)
  );
}

export function studentTPdf(x: number, location: number, scale: number, df: number): number {
  return Math.exp(studentTLogPdf(x, location, scale, df));
}

/**
 * P(X > x), from the incomplete beta without cancellation in either tail.
 * @example studentTSurvival(1, 0, 1, 1) // returns 0.25 (Cauchy)
 */
export function studentTSurvival(x: number, location: number, scale: number, df: number): number {
  if (Number.isNaN(x) || invalid(location, scale, df)) return NaN;
  if (x === Infinity) return 0;
  if (x === -Infinity) return 1;
  const u = (x - location) / scale;
  const tail = 0.5 * regularizedBeta(df / (df + u * u), df / 2, 0.5);
  return u > 0 ? tail : 1 - tail;
}

/** @example studentTCdf(0, 0, 1, 3) // returns 0.5 */
export function studentTCdf(x: number, location: number, scale: number, df: number): number {
  if (Number.isNaN(x) || invalid(location, scale, df)) return NaN;
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  const u = (x - location) / scale;
  const tail = 0.5 * regularizedBeta(df / (df + u * u), df / 2, 0.5);
  return u > 0 ? 1 - tail : tail;
}

/** A Gamma(shape, 1) draw (Marsaglia & Tsang, ACM TOMS 26(3), 2000; shape < 1 by boosting). */
export function gammaSample(rng: Rng, shape: number): number {
  if (!(shape > 0) || !Number.isFinite(shape)) return NaN;
  if (shape < 1) return gammaSample(rng, shape + 1) * Math.pow(rng.uniform(), 1 / shape);
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    let x: number;
    let v: number;
    do {
      x = rng.normal();
      v = 1 + c * x;
    } while (v <= 0);
    v = v * v * v;
    const u = rng.uniform();
    if (u < 1 - 0.0331 * x * x * x * x || Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v;
  }
}

/** One draw: location + scale * Z / sqrt(V / df), Z standard normal, V chi-squared(df). */
export function studentTSample(rng: Rng, location: number, scale: number, df: number): number {
  if (invalid(location, scale, df)) return NaN;
  const v = 2 * gammaSample(rng, df / 2);
  return location + (scale * rng.normal()) / Math.sqrt(v / df);
}
