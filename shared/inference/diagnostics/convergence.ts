// Convergence diagnostics for MCMC draws: rank-normalised split R-hat, bulk and tail
// effective sample size.
//
// Vehtari, Gelman, Simpson, Carpenter & Buerkner, "Rank-normalization, folding, and
// localization: an improved R-hat for assessing convergence of MCMC", Bayesian Analysis 16
// (2021). ESS uses Geyer's initial monotone sequence (Geyer, "Practical Markov chain Monte
// Carlo", Statistical Science 7, 1992) on autocorrelations pooled across chains, as in
// that paper's section 3.2 and the Stan reference manual.
//
// Input layout everywhere: one coordinate's draws, chain after chain (chains x n), n >= 4
// per chain. A coordinate with zero variance, or any non-finite draw, gives NaN.
import { normalQuantile } from './normal-quantile';

function checkLayout(draws: Float64Array, chains: number): number {
  if (!Number.isInteger(chains) || chains < 1) throw new RangeError(`chains must be a whole number >= 1, got ${chains}`);
  const n = draws.length / chains;
  if (!Number.isInteger(n)) throw new RangeError(`${draws.length} draws do not divide into ${chains} chains`);
  if (n < 4) throw new RangeError(`need at least 4 draws per chain, got ${n}`);
  return n;
}

function allFinite(draws: Float64Array): boolean {
  for (let i = 0; i < draws.length; i++) if (!Number.isFinite(draws[i]!)) return false;
  return true;
}

/** Each chain cut into a first and second half (the middle draw of an odd chain dropped). */
export function splitChains(draws: Float64Array, chains: number): { draws: Float64Array; chains: number } {
  const n = checkLayout(draws, chains);
  const half = Math.floor(n / 2);
  const out = new Float64Array(2 * chains * half);
  for (let c = 0; c < chains; c++) {
    out.set(draws.subarray(c * n, c * n + half), 2 * c * half);
    out.set(draws.subarray(c * n + n - half, c * n + n), (2 * c + 1) * half);
  }
  return { draws: out, chains: 2 * chains };
}

/**
 * Normal scores of the pooled ranks, ties given their average rank:
 * z = Phi^-1((r - 3/8) / (S + 1/4)) (Blom's offset, Vehtari et al. 2021, eq. 14).
 */
export function rankNormalise(draws: Float64Array): Float64Array {
  const s = draws.length;
  const order = new Int32Array(s);
  for (let i = 0; i < s; i++) order[i] = i;
  order.sort((a, b) => draws[a]! - draws[b]!);
  const z = new Float64Array(s);
  let i = 0;
  while (i < s) {
    let j = i;
    while (j + 1 < s && draws[order[j + 1]!] === draws[order[i]!]) j++;
    const rank = (i + j) / 2 + 1;
    const score = normalQuantile((rank - 0.375) / (s + 0.25));
    for (let k = i; k <= j; k++) z[order[k]!] = score;
    i = j + 1;
  }
  return z;
}

/** Sample quantile, R's type 7 (linear interpolation between order statistics). */
export function quantile(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

function chainMoments(draws: Float64Array, chains: number, n: number): { means: Float64Array; vars: Float64Array } {
  const means = new Float64Array(chains);
  const vars = new Float64Array(chains);
  for (let c = 0; c < chains; c++) {
    let m = 0;
    for (let t = 0; t < n; t++) m += draws[c * n + t]!;
    m /= n;
    let v = 0;
    for (let t = 0; t < n; t++) v += (draws[c * n + t]! - m) ** 2;
    means[c] = m;
    vars[c] = v / (n - 1);
  }
  return { means, vars };
}

function variance(x: Float64Array): number {
  if (x.length < 2) return 0;
  let m = 0;
  for (let i = 0; i < x.length; i++) m += x[i]!;
  m /= x.length;
  let v = 0;
  for (let i = 0; i < x.length; i++) v += (x[i]! - m) ** 2;
  return v / (x.length - 1);
}

/** The classic potential scale reduction over the chains as given (no splitting). */
export function rhatBasic(draws: Float64Array, chains: number): number {
  const n = checkLayout(draws, chains);
  if (!allFinite(draws)) return NaN;
  const { means, vars } = chainMoments(draws, chains, n);
  const b = n * variance(means);
  let w = 0;
  for (let c = 0; c < chains; c++) w += vars[c]!;
  w /= chains;
  if (!(w > 0)) return NaN;
  return Math.sqrt(((n - 1) / n) * w + b / n) / Math.sqrt(w);
}

/**
 * Rank-normalised split R-hat: the larger of the bulk R-hat (ranks) and the tail R-hat
 * (ranks of |x - median|). Values above 1.01 signal chains that have not mixed.
 * @example splitRhat(drawsOf4WellMixedChains, 4) // returns ~1.00
 */
export function splitRhat(draws: Float64Array, chains: number): number {
  checkLayout(draws, chains);
  if (!allFinite(draws)) return NaN;
  const split = splitChains(draws, chains);
  const bulk = rhatBasic(rankNormalise(split.draws), split.chains);
  const sorted = Float64Array.from(draws).sort();
  const median = quantile(sorted, 0.5);
  const folded = new Float64Array(split.draws.length);
  for (let i = 0; i < folded.length; i++) folded[i] = Math.abs(split.draws[i]! - median);
  const tail = rhatBasic(rankNormalise(folded), split.chains);
  return Math.max(bulk, tail);
}

/**
 * Effective sample size of the chains as given (no splitting, no ranks), with the
 * autocorrelations computed lag by lag only as far as Geyer's truncation needs.
 */
export function effectiveSampleSize(draws: Float64Array, chains: number): number {
  const n = checkLayout(draws, chains);
  if (!allFinite(draws)) return NaN;
  const { means, vars } = chainMoments(draws, chains, n);
  let meanVar = 0;
  for (let c = 0; c < chains; c++) meanVar += vars[c]!;
  meanVar /= chains;
  let varPlus = (meanVar * (n - 1)) / n;
  if (chains > 1) varPlus += variance(means);
  if (!(varPlus > 0)) return NaN;

  // Mean over chains of the (biased, 1/n) autocovariance at lag t.
  const acov = (t: number): number => {
    let sum = 0;
    for (let c = 0; c < chains; c++) {
      const base = c * n;
      const m = means[c]!;
      let s = 0;
      for (let i = 0; i + t < n; i++) s += (draws[base + i]! - m) * (draws[base + i + t]! - m);
      sum += s / n;
    }
    return sum / chains;
  };
  const rho = new Float64Array(n + 1);
  rho[0] = 1;
  let rhoEven = 1;
  let rhoOdd = 1 - (meanVar - acov(1)) / varPlus;
  rho[1] = rhoOdd;
  // Geyer's initial positive sequence, then the initial monotone sequence. Index
  // conventions follow the posterior R package and ArviZ, whose values the tests check.
  let t = 1;
  while (t < n - 3 && rhoEven + rhoOdd > 0) {
    rhoEven = 1 - (meanVar - acov(t + 1)) / varPlus;
    rhoOdd = 1 - (meanVar - acov(t + 2)) / varPlus;
    if (rhoEven + rhoOdd >= 0) {
      rho[t + 1] = rhoEven;
      rho[t + 2] = rhoOdd;
    }
    t += 2;
  }
  const maxT = t - 2;
  // The first negative pair's even term stays in as a bias correction for antithetic chains.
  if (rhoEven > 0) rho[maxT + 1] = rhoEven;
  for (let s = 1; s <= maxT - 2; s += 2) {
    if (rho[s + 1]! + rho[s + 2]! > rho[s - 1]! + rho[s]!) {
      rho[s + 1] = (rho[s - 1]! + rho[s]!) / 2;
      rho[s + 2] = rho[s + 1]!;
    }
  }
  let sum = 0;
  for (let s = 0; s <= maxT; s++) sum += rho[s]!;
  const tau = -1 + 2 * sum + rho[maxT + 1]!;
  const total = chains * n;
  return total / Math.max(tau, 1 / Math.log10(total));
}

/** Bulk ESS: ESS of the rank-normalised split chains. */
export function effectiveSampleSizeBulk(draws: Float64Array, chains: number): number {
  checkLayout(draws, chains);
  if (!allFinite(draws)) return NaN;
  const split = splitChains(draws, chains);
  return effectiveSampleSize(rankNormalise(split.draws), split.chains);
}

/** ESS of the indicator x <= q_p on split chains: how well the p-quantile is estimated. */
export function effectiveSampleSizeQuantile(draws: Float64Array, chains: number, p: number): number {
  checkLayout(draws, chains);
  if (!allFinite(draws) || !(p > 0 && p < 1)) return NaN;
  const split = splitChains(draws, chains);
  const q = quantile(Float64Array.from(split.draws).sort(), p);
  const indicator = new Float64Array(split.draws.length);
  for (let i = 0; i < indicator.length; i++) indicator[i] = split.draws[i]! <= q ? 1 : 0;
  return effectiveSampleSize(indicator, split.chains);
}

/** Tail ESS: the smaller of the 5% and 95% quantile ESS (Vehtari et al. 2021, section 4.3). */
export function effectiveSampleSizeTail(draws: Float64Array, chains: number): number {
  return Math.min(effectiveSampleSizeQuantile(draws, chains, 0.05), effectiveSampleSizeQuantile(draws, chains, 0.95));
}
