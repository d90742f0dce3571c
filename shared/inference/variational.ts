// The variational engine behind ADVI (mean-field and full-rank) and minibatch stochastic VI:
// Gaussian families in unconstrained space, reparameterised Monte Carlo ELBO gradients, and a
// step-size schedule that needs no hand tuning.
//
// ADVI: Kucukelbir, Tran, Ranganath, Gelman & Blei (2017), "Automatic Differentiation
// Variational Inference", JMLR 18(14). Adam: Kingma & Ba (2015). Gradient estimator by default:
// "sticking the landing" (Roeder, Wu & Duvenaud 2017, NeurIPS), exact at a Gaussian posterior.
// The schedule (our design, documented here because it is not ADVI's own): Adam-normalised
// steps, scaled per coordinate by the approximation's current sd so that a step means "a
// fraction of a posterior sd" whatever the data size; start at the MAP with sds from the
// L-BFGS inverse Hessian; every window of iterations compare the mean ELBO with the last
// window's, and when it has stopped improving beyond its Monte Carlo noise halve the step;
// after `reductions` halvings the fit has converged, and the result is the average of the
// last window's iterates (Polyak-Ruppert averaging), which removes most of the step noise.
import { FitDivergedError, FitLoop, initialPoint, type FitMethod, type FitOptions, type FitResult } from './fit-types';
import { maximiseLbfgs } from './map';
import type { Model } from './model';
import type { Rng } from './rng';

export interface VariationalOptions extends FitOptions {
  /** Monte Carlo draws per gradient (default 1, as in ADVI). */
  readonly gradSamples?: number;
  /** Iterations per convergence window (default 100). */
  readonly window?: number;
  /** Initial step, in units of the current sd per iteration (default 0.1). */
  readonly initialStep?: number;
  /** Halvings of the step before the fit counts as converged (default 4). */
  readonly reductions?: number;
  /** Start from the MAP and its Laplace sds (default true). Otherwise from `init`/the model's start with sd 1. */
  readonly initFromMap?: boolean;
  /** Iteration cap for that MAP start (default 1000). */
  readonly mapMaxIterations?: number;
  /**
   * Draw ε and -ε in pairs on the same data (default: on for SVI, off for full-data ADVI).
   * With minibatches the subsampling noise common to both halves cancels from the scale
   * gradient, which otherwise swamps it; each half stays unbiased.
   */
  readonly antithetic?: boolean;
  /** Use the "sticking the landing" gradient (default true); false gives the standard ADVI estimator. */
  readonly stickingTheLanding?: boolean;
}

/** A Gaussian approximation q(θ; λ) with θ = T(λ, ε), ε ~ N(0, I). */
export interface GaussianFamily {
  readonly kind: 'meanfield' | 'fullrank';
  readonly dim: number;
  /** λ, the variational parameters (mutated by the optimiser). */
  readonly params: Float64Array;
  /** Per-parameter step scale (sd units for locations, 1 for log-sds). */
  stepScale(out: Float64Array): void;
  /** θ = T(λ, ε). */
  transform(params: Float64Array, eps: Float64Array, theta: Float64Array): void;
  /** Adds weight * (∂θ/∂λ)ᵀ g to out: the data part of the reparameterised gradient. */
  accumulate(params: Float64Array, gTheta: Float64Array, eps: Float64Array, weight: number, out: Float64Array): void;
  /**
   * Adds ∇θ(-log q)(θ) at θ = T(λ, ε), i.e. Σ⁻¹(θ - μ) = L⁻ᵀε, to gTheta: with it and no
   * entropy gradient the estimator is the "sticking the landing" path derivative (Roeder, Wu &
   * Duvenaud 2017), unbiased and with zero variance where q equals the posterior.
   */
  pathCorrection(params: Float64Array, eps: Float64Array, gTheta: Float64Array): void;
  /** Entropy up to a constant, and its gradient added to out. */
  entropy(params: Float64Array, out: Float64Array | null): number;
  mean(params: Float64Array, out: Float64Array): void;
  sd(params: Float64Array, out: Float64Array): void;
  /** log q(θ) including the normalising constant. */
  logDensity(params: Float64Array, theta: Float64Array): number;
}

const LOG_2PI = Math.log(2 * Math.PI);

export function meanFieldFamily(dim: number): GaussianFamily {
  const params = new Float64Array(2 * dim);
  return {
    kind: 'meanfield',
    dim,
    params,
    stepScale(out) {
      for (let i = 0; i < dim; i++) {
        out[i] = Math.exp(params[dim + i]!);
        out[dim + i] = 1;
      }
    },
    transform(p, eps, theta) {
      for (let i = 0; i < dim; i++) theta[i] = p[i]! + Math.exp(p[dim + i]!) * eps[i]!;
    },
    accumulate(p, g, eps, w, out) {
      for (let i = 0; i < dim; i++) {
        out[i]! += w * g[i]!;
        out[dim + i]! += w * g[i]! * eps[i]! * Math.exp(p[dim + i]!);
      }
    },
    pathCorrection(p, eps, g) {
      for (let i = 0; i < dim; i++) g[i]! += eps[i]! * Math.exp(-p[dim + i]!);
    },
    entropy(p, out) {
      let h = 0;
      for (let i = 0; i < dim; i++) {
        h += p[dim + i]!;
        if (out) out[dim + i]! += 1;
      }
      return h;
    },
    mean(p, out) {
      for (let i = 0; i < dim; i++) out[i] = p[i]!;
    },
    sd(p, out) {
      for (let i = 0; i < dim; i++) out[i] = Math.exp(p[dim + i]!);
    },
    logDensity(p, theta) {
      let s = -0.5 * dim * LOG_2PI;
      for (let i = 0; i < dim; i++) {
        const z = (theta[i]! - p[i]!) * Math.exp(-p[dim + i]!);
        s -= 0.5 * z * z + p[dim + i]!;
      }
      return s;
    },
  };
}

/** Packed row-major lower triangle: entry (i, j), j <= i, lives at dim + i(i+1)/2 + j; diagonals are logs. */
export function fullRankFamily(dim: number): GaussianFamily {
  const tri = (dim * (dim + 1)) / 2;
  const params = new Float64Array(dim + tri);
  const at = (i: number, j: number): number => dim + (i * (i + 1)) / 2 + j;
  const solve = new Float64Array(dim);
  return {
    kind: 'fullrank',
    dim,
    params,
    stepScale(out) {
      for (let i = 0; i < dim; i++) {
        let v = 0;
        for (let j = 0; j < i; j++) v += params[at(i, j)]! ** 2;
        v += Math.exp(2 * params[at(i, i)]!);
        out[i] = Math.sqrt(v);
        // Off-diagonals move in units of the conditional sd L_ii: in units of the marginal sd
        // their step noise swamps narrow conditional directions (hierarchical ridges).
        const conditional = Math.exp(params[at(i, i)]!);
        for (let j = 0; j < i; j++) out[at(i, j)] = conditional;
        out[at(i, i)] = 1;
      }
    },
    transform(p, eps, theta) {
      for (let i = 0; i < dim; i++) {
        const row = dim + (i * (i + 1)) / 2;
        let s = p[i]! + Math.exp(p[row + i]!) * eps[i]!;
        for (let j = 0; j < i; j++) s += p[row + j]! * eps[j]!;
        theta[i] = s;
      }
    },
    accumulate(p, g, eps, w, out) {
      for (let i = 0; i < dim; i++) {
        const row = dim + (i * (i + 1)) / 2;
        const gi = w * g[i]!;
        out[i]! += gi;
        for (let j = 0; j < i; j++) out[row + j]! += gi * eps[j]!;
        out[row + i]! += gi * eps[i]! * Math.exp(p[row + i]!);
      }
    },
    pathCorrection(p, eps, g) {
      // Back substitution Lᵀ u = ε (Lᵀ is upper triangular), then g += u.
      for (let i = dim - 1; i >= 0; i--) {
        let r = eps[i]!;
        for (let k = i + 1; k < dim; k++) r -= p[at(k, i)]! * solve[k]!;
        solve[i] = r * Math.exp(-p[at(i, i)]!);
      }
      for (let i = 0; i < dim; i++) g[i]! += solve[i]!;
    },
    entropy(p, out) {
      let h = 0;
      for (let i = 0; i < dim; i++) {
        h += p[at(i, i)]!;
        if (out) out[at(i, i)]! += 1;
      }
      return h;
    },
    mean(p, out) {
      for (let i = 0; i < dim; i++) out[i] = p[i]!;
    },
    sd(p, out) {
      for (let i = 0; i < dim; i++) {
        let v = Math.exp(2 * p[at(i, i)]!);
        for (let j = 0; j < i; j++) v += p[at(i, j)]! ** 2;
        out[i] = Math.sqrt(v);
      }
    },
    logDensity(p, theta) {
      // Forward substitution L z = θ - μ.
      const z = new Float64Array(dim);
      let s = -0.5 * dim * LOG_2PI;
      for (let i = 0; i < dim; i++) {
        const row = dim + (i * (i + 1)) / 2;
        let r = theta[i]! - p[i]!;
        for (let j = 0; j < i; j++) r -= p[row + j]! * z[j]!;
        z[i] = r * Math.exp(-p[row + i]!);
        s -= 0.5 * z[i]! * z[i]! + p[row + i]!;
      }
      return s;
    },
  };
}

/**
 * Where the gradient of log p comes from: the full data or a minibatch estimate. With
 * `reuseBatch` a minibatch source evaluates the batch it drew last time (for antithetic pairs).
 */
export type GradientSource = (theta: Float64Array, grad: Float64Array, rng: Rng, reuseBatch: boolean) => number;

export interface VariationalRun {
  readonly method: FitMethod;
  readonly family: GaussianFamily;
  readonly gradient: GradientSource;
  /** Extra diagnostics the caller adds (e.g. batch size). */
  readonly diagnostics?: Readonly<Record<string, number | string | boolean>>;
  /** Defaults this method applies where the caller's options are silent. */
  readonly defaults?: Partial<Pick<VariationalOptions, 'window' | 'reductions' | 'antithetic' | 'gradSamples' | 'initialStep'>>;
}

function setLogSd(family: GaussianFamily, sd: Float64Array): void {
  const d = family.dim;
  for (let i = 0; i < d; i++) {
    const idx = family.kind === 'meanfield' ? d + i : d + (i * (i + 1)) / 2 + i;
    family.params[idx] = Math.log(sd[i]!);
  }
}

/** Monte Carlo ELBO estimate of the family's current parameters (NaN draws count as -Infinity). */
function estimateElbo(model: Model, family: GaussianFamily, rng: Rng, draws: number): number {
  const d = family.dim;
  const eps = new Float64Array(d);
  const theta = new Float64Array(d);
  const g = new Float64Array(d);
  let s = 0;
  for (let k = 0; k < draws; k++) {
    for (let i = 0; i < d; i++) eps[i] = rng.normal();
    family.transform(family.params, eps, theta);
    const lp = model.logDensityGrad(theta, g);
    s += Number.isFinite(lp) ? lp : -Infinity;
  }
  return s / draws + family.entropy(family.params, null);
}

/** Cholesky factor (row-major lower) of a symmetric matrix, or null if it is not positive definite. */
function cholesky(a: Float64Array, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j]!;
      for (let k = 0; k < j; k++) s -= l[i * n + k]! * l[j * n + k]!;
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else {
        l[i * n + j] = s / l[j * n + j]!;
      }
    }
  }
  return l;
}

/**
 * Start full-rank ADVI at the Laplace approximation: the covariance is the inverse of a
 * finite-difference Hessian at the mode (2 dim gradient calls). Returns false, leaving the
 * diagonal start, when the Hessian is not positive definite.
 */
function setLaplaceCovariance(model: Model, family: GaussianFamily, sd0: Float64Array): boolean {
  const n = family.dim;
  const mode = Float64Array.from(family.params.subarray(0, n));
  const gp = new Float64Array(n);
  const gm = new Float64Array(n);
  const H = new Float64Array(n * n);
  const t = Float64Array.from(mode);
  for (let j = 0; j < n; j++) {
    const h = 1e-3 * sd0[j]!;
    t[j] = mode[j]! + h;
    const a = model.logDensityGrad(t, gp);
    t[j] = mode[j]! - h;
    const b = model.logDensityGrad(t, gm);
    t[j] = mode[j]!;
    if (!Number.isFinite(a) || !Number.isFinite(b)) return false;
    for (let i = 0; i < n; i++) H[i * n + j] = -(gp[i]! - gm[i]!) / (2 * h);
  }
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) {
    const v = 0.5 * (H[i * n + j]! + H[j * n + i]!);
    H[i * n + j] = v;
    H[j * n + i] = v;
  }
  const lh = cholesky(H, n);
  if (!lh) return false;
  // Σ = H^-1 = (Lh Lhᵀ)^-1: invert Lh by forward substitution, then Σ = Lh^-ᵀ Lh^-1.
  const inv = new Float64Array(n * n);
  for (let c = 0; c < n; c++) {
    for (let i = c; i < n; i++) {
      let s = i === c ? 1 : 0;
      for (let k = c; k < i; k++) s -= lh[i * n + k]! * inv[k * n + c]!;
      inv[i * n + c] = s / lh[i * n + i]!;
    }
  }
  const cov = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) {
    let s = 0;
    for (let k = i; k < n; k++) s += inv[k * n + i]! * inv[k * n + j]!;
    cov[i * n + j] = s;
    cov[j * n + i] = s;
  }
  const l = cholesky(cov, n);
  if (!l) return false;
  for (let i = 0; i < n; i++) {
    const row = n + (i * (i + 1)) / 2;
    for (let j = 0; j < i; j++) family.params[row + j] = l[i * n + j]!;
    family.params[row + i] = Math.log(l[i * n + i]!);
  }
  return true;
}

/**
 * Optimise the ELBO of `run.family` for `model`. Throws FitDivergedError on non-finite
 * gradients or parameters, or when every retry of a draw lands where log p is not finite.
 */
export async function runVariational(model: Model, options: VariationalOptions, run: VariationalRun): Promise<FitResult> {
  const { family, method } = run;
  const rng = options.rng;
  const d = model.dim;
  const P = family.params.length;
  const maxIter = options.maxIterations ?? 10_000;
  const defaults = run.defaults ?? {};
  const window = Math.max(5, Math.floor(options.window ?? defaults.window ?? 100));
  const antithetic = options.antithetic ?? defaults.antithetic ?? false;
  const S = Math.max(1, Math.floor(options.gradSamples ?? defaults.gradSamples ?? 1));
  const maxReductions = Math.max(0, Math.floor(options.reductions ?? defaults.reductions ?? 4));
  const stl = options.stickingTheLanding ?? true;
  const relTol = options.tolerance ?? 1e-9;
  const loop = new FitLoop(method, options, maxIter);

  // Start: the MAP and its Laplace sds (clamped: L-BFGS curvature is crude in unexplored directions).
  const sd0 = new Float64Array(d).fill(1);
  let mapIterations = 0;
  if (options.initFromMap ?? true) {
    const mapLoop = new FitLoop(method, { ...options, onProgress: undefined }, options.mapMaxIterations ?? 1000);
    const map = await maximiseLbfgs(model, options, mapLoop);
    mapIterations = map.iterations;
    family.params.set(map.mode, 0);
    if (!model.curvatureDiagonal) {
      for (let i = 0; i < d; i++) {
        const v = map.inverseHessianDiagonal[i]!;
        sd0[i] = v > 0 ? Math.min(1, Math.max(1e-6, Math.sqrt(v))) : 0.1;
      }
    }
  } else {
    family.params.set(initialPoint(model, options), 0);
  }
  if (model.curvatureDiagonal) {
    // For a Gaussian posterior the mean-field optimum sd is 1/sqrt(H_ii): start there.
    const c = new Float64Array(d);
    model.curvatureDiagonal(family.params.subarray(0, d), c);
    for (let i = 0; i < d; i++) sd0[i] = c[i]! > 0 && Number.isFinite(c[i]!) ? Math.min(1, Math.max(1e-8, 1 / Math.sqrt(c[i]!))) : 0.1;
  }
  setLogSd(family, sd0);
  let laplaceStart = false;
  if (family.kind === 'fullrank' && (options.initFromMap ?? true)) {
    // The Laplace covariance is exact for Gaussian posteriors but can be far too wide on curved
    // ones (non-centred hierarchies); keep it only if its ELBO beats the diagonal start's.
    const diagonal = Float64Array.from(family.params);
    const elboDiagonal = estimateElbo(model, family, rng, 30);
    if (setLaplaceCovariance(model, family, sd0)) {
      if (estimateElbo(model, family, rng, 30) > elboDiagonal) laplaceStart = true;
      else family.params.set(diagonal);
    }
  }

  const params = family.params;
  const grad = new Float64Array(P);
  const scale = new Float64Array(P);
  const m1 = new Float64Array(P);
  const m2 = new Float64Array(P);
  const eps = new Float64Array(d);
  const theta = new Float64Array(d);
  const gTheta = new Float64Array(d);
  const gMirror = new Float64Array(d);
  const epsMirror = new Float64Array(d);
  const windowSum = new Float64Array(P);
  const boost = new Float64Array(P).fill(1);
  const lastSign = new Int8Array(P);
  const averaged = new Float64Array(P);
  const beta1 = 0.9;
  const beta2 = 0.999;
  let step = options.initialStep ?? defaults.initialStep ?? 0.1;
  let reductions = 0;
  let winElbo = 0;
  let winElboSq = 0;
  let prevMean = NaN;
  let prevVar = NaN;
  let olderMean = NaN;
  let lastC1 = 1;
  let lastC2 = 1;
  let olderVar = NaN;
  let lastMean = NaN;
  let lastSe = NaN;
  let retries = 0;
  let converged = false;
  let iter = 0;
  let haveAverage = false;

  for (; iter < maxIter; iter++) {
    grad.fill(0);
    let elbo = 0;
    for (let s = 0; s < S; s++) {
      let lp = NaN;
      let lpMirror = NaN;
      for (let attempt = 0; attempt < 10; attempt++) {
        for (let i = 0; i < d; i++) eps[i] = rng.normal();
        family.transform(params, eps, theta);
        lp = run.gradient(theta, gTheta, rng, false);
        if (Number.isFinite(lp) && antithetic) {
          for (let i = 0; i < d; i++) epsMirror[i] = -eps[i]!;
          family.transform(params, epsMirror, theta);
          lpMirror = run.gradient(theta, gMirror, rng, true);
          if (!Number.isFinite(lpMirror)) lp = NaN;
        }
        if (Number.isFinite(lp)) break;
        retries++;
      }
      if (!Number.isFinite(lp)) throw new FitDivergedError(method, iter, 'ten draws in a row from the approximation had a non-finite log density');
      if (antithetic) {
        if (stl) {
          family.pathCorrection(params, eps, gTheta);
          family.pathCorrection(params, epsMirror, gMirror);
        }
        family.accumulate(params, gTheta, eps, 0.5 / S, grad);
        family.accumulate(params, gMirror, epsMirror, 0.5 / S, grad);
        elbo += (0.5 * (lp + lpMirror)) / S;
      } else {
        if (stl) family.pathCorrection(params, eps, gTheta);
        family.accumulate(params, gTheta, eps, 1 / S, grad);
        elbo += lp / S;
      }
    }
    elbo += family.entropy(params, stl ? null : grad);
    family.stepScale(scale);
    const c1 = 1 - beta1 ** (iter + 1);
    const c2 = 1 - beta2 ** (iter + 1);
    for (let k = 0; k < P; k++) {
      const g = grad[k]!;
      if (!Number.isFinite(g)) throw new FitDivergedError(method, iter, `the ELBO gradient is not finite (parameter ${k})`);
      m1[k] = beta1 * m1[k]! + (1 - beta1) * g;
      m2[k] = beta2 * m2[k]! + (1 - beta2) * g * g;
      const upd = (step * boost[k]! * scale[k]! * (m1[k]! / c1)) / (Math.sqrt(m2[k]! / c2) + 1e-12);
      params[k]! += upd;
      windowSum[k]! += params[k]!;
    }
    winElbo += elbo;
    winElboSq += elbo * elbo;
    await loop.tick(iter, Number.isNaN(lastMean) ? elbo : lastMean);
    lastC1 = c1;
    lastC2 = c2;

    if ((iter + 1) % window === 0) {
      for (let k = 0; k < P; k++) {
        const v = windowSum[k]! / window;
        if (!Number.isFinite(v)) throw new FitDivergedError(method, iter, `variational parameter ${k} is not finite`);
        averaged[k] = v;
      }
      haveAverage = true;
      // Per-parameter step boost (in the spirit of Jacobs' 1988 delta-bar-delta): a parameter
      // whose averaged gradient kept one sign through the window is travelling far in units of
      // its own sd (e.g. a hierarchy scale moving away from its MAP value), so its step doubles,
      // up to 1024x; once the sign wavers the boost halves back toward 1.
      for (let k = 0; k < P; k++) {
        const r = Math.abs(m1[k]! / c1) / (Math.sqrt(m2[k]! / c2) + 1e-300);
        const sign = m1[k]! > 0 ? 1 : -1;
        if (r > 0.5 && sign === lastSign[k]) boost[k] = Math.min(1024, boost[k]! * 2);
        else boost[k] = Math.max(1, boost[k]! * 0.5);
        lastSign[k] = r > 0.5 ? sign : 0;
      }
      windowSum.fill(0);
      const mean = winElbo / window;
      // Monte Carlo variance of the window mean (draws treated as independent).
      const variance = Math.max(0, winElboSq / window - mean * mean) / window;
      winElbo = 0;
      winElboSq = 0;
      lastMean = mean;
      lastSe = Math.sqrt(variance);
      // Compare with the window before last: twice the signal of a slow climb for the same noise.
      if (!Number.isNaN(prevMean)) {
        const change = mean - prevMean;
        const noise = 2 * Math.sqrt(variance + prevVar);
        // Adam's |m / sqrt(v)| averages about 0.18 for pure noise (beta1 = 0.9) and nears 1 while
        // parameters still move steadily; a flat ELBO with that signal is a slow climb, not a stall.
        let snr = 0;
        for (let k = 0; k < P; k++) snr += Math.abs(m1[k]! / lastC1) / (Math.sqrt(m2[k]! / lastC2) + 1e-300);
        snr /= P;
        const stalled = (change < noise || Math.abs(change) <= relTol * Math.abs(mean)) && snr < 0.35;
        if (stalled) {
          if (reductions >= maxReductions) { converged = true; iter++; break; }
          reductions++;
          step *= 0.5;
        }
      }
      prevMean = olderMean;
      prevVar = olderVar;
      olderMean = mean;
      olderVar = variance;
    }
  }

  const finalParams = haveAverage ? averaged : Float64Array.from(params);
  const mean = new Float64Array(d);
  const sd = new Float64Array(d);
  family.mean(finalParams, mean);
  family.sd(finalParams, sd);
  const objective = Number.isNaN(lastMean) ? NaN : lastMean;
  const elapsedMs = loop.finish(iter, objective);
  const snapshot = Float64Array.from(finalParams);
  return {
    method,
    names: model.names,
    iterations: iter,
    elapsedMs,
    converged,
    objective,
    mean,
    sd,
    draws: (drawRng, count) => {
      const out = new Float64Array(count * d);
      const e = new Float64Array(d);
      const t = new Float64Array(d);
      for (let c = 0; c < count; c++) {
        for (let i = 0; i < d; i++) e[i] = drawRng.normal();
        family.transform(snapshot, e, t);
        out.set(t, c * d);
      }
      return out;
    },
    logApproxDensity: (t) => family.logDensity(snapshot, t),
    diagnostics: {
      elbo: objective,
      elboMonteCarloSe: lastSe,
      finalStep: step,
      stepReductions: reductions,
      mapIterations,
      laplaceStart,
      nonFiniteDrawRetries: retries,
      antithetic,
      stickingTheLanding: stl,
      ...(run.diagnostics ?? {}),
    },
  };
}
