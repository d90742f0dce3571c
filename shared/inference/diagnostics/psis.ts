// Pareto-smoothed importance sampling (PSIS) and its k-hat diagnostic, used to judge a
// variational approximation against the exact posterior density.
//
// Vehtari, Simpson, Gelman, Yao & Gabry, "Pareto smoothed importance sampling", JMLR 25
// (2024); Yao, Vehtari, Simpson & Gelman, "Yes, but did it work?: evaluating variational
// inference", ICML 2018 (k-hat < 0.5 good, 0.5-0.7 usable, > 0.7 unreliable). The
// generalised Pareto fit is Zhang & Stephens, "A new and efficient estimation method for
// the generalized Pareto distribution", Technometrics 51 (2009), with the weakly
// informative shrinkage of k toward 0.5 used by those papers' reference code.
import type { Model } from '../model';
import type { Rng } from '../rng';

export interface GeneralisedParetoFit {
  /** Shape; > 0 means a heavy (power-law) tail with finite moments below 1/k. */
  readonly k: number;
  /** Scale. */
  readonly sigma: number;
}

/**
 * Fits a generalised Pareto distribution (location 0) to positive exceedances sorted
 * ascending. Needs at least 5 values; fewer, or any non-finite value, gives k = NaN.
 */
export function fitGeneralisedPareto(sortedExceedances: Float64Array): GeneralisedParetoFit {
  const x = sortedExceedances;
  const n = x.length;
  if (n < 5) return { k: NaN, sigma: NaN };
  for (let i = 0; i < n; i++) if (!Number.isFinite(x[i]!)) return { k: NaN, sigma: NaN };
  const priorB = 3;
  const priorK = 10;
  const m = 30 + Math.floor(Math.sqrt(n));
  const xMax = x[n - 1]!;
  const xQuarter = x[Math.floor(n / 4 + 0.5) - 1]!;
  const b = new Float64Array(m);
  const logLik = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const bj = 1 / xMax + (1 - Math.sqrt(m / (j + 1 - 0.5))) / (priorB * xQuarter);
    b[j] = bj;
    let kj = 0;
    for (let i = 0; i < n; i++) kj += Math.log1p(-bj * x[i]!);
    kj /= n;
    // Profile log-likelihood of b (Zhang & Stephens 2009, eq. 2).
    logLik[j] = n * (Math.log(-bj / kj) - kj - 1);
  }
  let maxLik = -Infinity;
  for (let j = 0; j < m; j++) if (logLik[j]! > maxLik) maxLik = logLik[j]!;
  let total = 0;
  for (let j = 0; j < m; j++) total += Math.exp(logLik[j]! - maxLik);
  let wSum = 0;
  let bPost = 0;
  for (let j = 0; j < m; j++) {
    const w = Math.exp(logLik[j]! - maxLik) / total;
    // Negligible grid weights are dropped before renormalising, as in the reference code.
    if (w < 10 * Number.EPSILON) continue;
    wSum += w;
    bPost += w * b[j]!;
  }
  bPost /= wSum;
  let k = 0;
  for (let i = 0; i < n; i++) k += Math.log1p(-bPost * x[i]!);
  k /= n;
  const sigma = -k / bPost;
  return { k: (n * k + priorK * 0.5) / (n + priorK), sigma };
}

/** Quantile function of the generalised Pareto distribution (location 0). */
function gpdQuantile(p: number, k: number, sigma: number): number {
  return Math.abs(k) < Number.EPSILON ? -sigma * Math.log1p(-p) : (sigma * Math.expm1(-k * Math.log1p(-p))) / k;
}

export interface ParetoSmoothed {
  /** Smoothed, self-normalised log weights (they log-sum-exp to 0). */
  readonly logWeights: Float64Array;
  /** The Pareto shape estimate of the raw weights' upper tail. */
  readonly k: number;
  readonly tailLength: number;
}

/**
 * Pareto-smooths raw log importance weights (log p - log q per draw). Non-finite k (too few
 * or tied tail values) leaves the tail unsmoothed and reports k = Infinity; NaN in the
 * input gives k = NaN. Needs at least 2 draws.
 */
export function paretoSmooth(rawLogWeights: Float64Array, relativeEfficiency = 1): ParetoSmoothed {
  const s = rawLogWeights.length;
  if (s < 2) throw new RangeError(`PSIS needs at least 2 draws, got ${s}`);
  let max = -Infinity;
  for (let i = 0; i < s; i++) {
    const v = rawLogWeights[i]!;
    if (Number.isNaN(v)) return { logWeights: new Float64Array(s).fill(NaN), k: NaN, tailLength: 0 };
    if (v > max) max = v;
  }
  const lw = new Float64Array(s);
  for (let i = 0; i < s; i++) lw[i] = rawLogWeights[i]! - max;
  const tailWanted = Math.ceil(Math.min(s / 5, 3 * Math.sqrt(s / relativeEfficiency)));
  const order = new Int32Array(s);
  for (let i = 0; i < s; i++) order[i] = i;
  order.sort((a, b) => lw[a]! - lw[b]!);
  const cutoffIndex = s - tailWanted - 1;
  // Below the smallest normal double exp() underflows; the cut-off cannot sit there.
  const cutoff = Math.max(cutoffIndex >= 0 ? lw[order[cutoffIndex]!]! : -Infinity, Math.log(2.2250738585072014e-308));
  let first = s;
  while (first > 0 && lw[order[first - 1]!]! > cutoff) first--;
  const tailLength = s - first;
  let k = Infinity;
  if (tailLength > 4) {
    const expCutoff = Math.exp(cutoff);
    const exceed = new Float64Array(tailLength);
    for (let j = 0; j < tailLength; j++) exceed[j] = Math.exp(lw[order[first + j]!]!) - expCutoff;
    const fit = fitGeneralisedPareto(exceed);
    k = fit.k;
    if (Number.isFinite(k)) {
      for (let j = 0; j < tailLength; j++) {
        const smoothed = Math.log(gpdQuantile((j + 0.5) / tailLength, k, fit.sigma) + expCutoff);
        // Truncate at the largest raw weight (0 after the shift).
        lw[order[first + j]!] = Math.min(0, smoothed);
      }
    } else {
      k = Infinity;
    }
  }
  let total = -Infinity;
  for (let i = 0; i < s; i++) {
    const v = lw[i]!;
    if (v === -Infinity) continue;
    total = total === -Infinity ? v : total > v ? total + Math.log1p(Math.exp(v - total)) : v + Math.log1p(Math.exp(total - v));
  }
  for (let i = 0; i < s; i++) lw[i] = lw[i]! - total;
  return { logWeights: lw, k, tailLength };
}

/** The PSIS k-hat of raw log importance weights. */
export function paretoKHat(rawLogWeights: Float64Array): number {
  return paretoSmooth(rawLogWeights).k;
}

/**
 * The sample-size-dependent k-hat threshold above which PSIS estimates are unreliable:
 * min(1 - 1/log10(S), 0.7) (Vehtari et al. 2024, section 3.2.3).
 */
export function paretoKThreshold(draws: number): number {
  return Math.min(1 - 1 / Math.log10(draws), 0.7);
}

/** What PSIS needs from an approximation: draws from it and its normalised log density (FitResult of VI). */
export interface Approximation {
  draws(rng: Rng, count: number): Float64Array;
  logApproxDensity(theta: Float64Array): number;
}

export interface VariationalCheck {
  readonly k: number;
  /** 'good' below 0.5, 'ok' up to the sample-size threshold, 'unreliable' above (Yao et al. 2018). */
  readonly verdict: 'good' | 'ok' | 'unreliable';
  readonly draws: number;
  /** Draws at which the model's log density was not finite (weight 0). */
  readonly nonFinite: number;
}

/**
 * Checks a variational approximation q with PSIS: draws from q, weights them by p / q with
 * the model's exact (unnormalised) log density, and reports k-hat. The verdict is
 * 'unreliable' when k-hat is NaN. Throws RangeError when the draws do not match model.dim.
 */
export function checkVariationalFit(model: Model, q: Approximation, rng: Rng, draws = 1000): VariationalCheck {
  const dim = model.dim;
  const thetas = q.draws(rng, draws);
  if (thetas.length !== draws * dim) throw new RangeError(`the approximation gave ${thetas.length} values for ${draws} draws of dimension ${dim}`);
  const grad = new Float64Array(dim);
  const logWeights = new Float64Array(draws);
  let nonFinite = 0;
  for (let s = 0; s < draws; s++) {
    const theta = thetas.subarray(s * dim, (s + 1) * dim);
    const logP = model.logDensityGrad(theta, grad);
    const logQ = q.logApproxDensity(theta);
    if (Number.isFinite(logP) && Number.isFinite(logQ)) logWeights[s] = logP - logQ;
    else {
      logWeights[s] = -Infinity;
      nonFinite++;
    }
  }
  const k = paretoKHat(logWeights);
  const verdict = k < 0.5 ? 'good' : k <= paretoKThreshold(draws) ? 'ok' : 'unreliable';
  return { k, verdict, draws, nonFinite };
}
