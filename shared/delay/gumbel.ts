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
import type { DelayDistribution } from './predictive';

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
  if (Number.isNaN(x) || invalid(mu, beta)) return NaN;
  if (x === Infinity) return 0;
  if (x === -Infinity) return 1;
  return -Math.expm1(-Math.exp(-(x - mu) / beta));
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

export function gumbelMean(mu: number, beta: number): number {
  return invalid(mu, beta) ? NaN : mu + EULER_GAMMA * beta;
}

export function gumbelVariance(mu: number, beta: number): number {
  return invalid(mu, beta) ? NaN : (Math.PI * Math.PI * beta * beta) / 6;
}

/**
 * A Gumbel as a DelayDistribution object, for the risk engine and the models' predictives.
 * Invalid parameters throw here (once), rather than giving NaN on every later call.
 */
export function gumbelDistribution(mu: number, beta: number): DelayDistribution {
  if (invalid(mu, beta)) throw new RangeError(`Gumbel needs a finite location and a finite scale > 0, got (${mu}, ${beta})`);
  return {
    cdf: (x) => gumbelCdf(x, mu, beta),
    survival: (x) => gumbelSurvival(x, mu, beta),
    pdf: (x) => gumbelPdf(x, mu, beta),
    sample: (rng) => gumbelSample(rng, mu, beta),
  };
}
