// Maximum a posteriori fits by limited-memory BFGS, with a diagonal Laplace approximation
// read off the L-BFGS inverse-Hessian estimate at the mode.
//
// L-BFGS two-loop recursion and compact representation: Nocedal & Wright, "Numerical
// Optimization" (2nd ed., 2006), algorithms 7.4 and 7.5 and eq. 7.24 (Byrd, Nocedal &
// Schnabel 1994). The line search backtracks (Armijo condition); pairs with s'y <= 0 are skipped.
import { FitDivergedError, FitLoop, initialPoint, type FitOptions, type FitResult } from './fit-types';
import type { Model } from './model';
import type { Rng } from './rng';

/**
 * `tolerance` for MAP is the gain in log density (nats) the quasi-Newton model predicts from
 * one more full step; below it the fit has converged (default 1e-4).
 */
export interface MapOptions extends FitOptions {
  /** Pairs of the L-BFGS memory (default 10). */
  readonly memory?: number;
}

export interface LbfgsOutcome {
  readonly mode: Float64Array;
  readonly logDensity: number;
  readonly iterations: number;
  readonly converged: boolean;
  readonly stopReason: string;
  readonly gradientMaxAbs: number;
  /** Diagonal of the inverse-Hessian estimate of -log p at the mode (NaN entries when unknown). */
  readonly inverseHessianDiagonal: Float64Array;
  readonly evaluations: number;
}

const STALL_WINDOW = 20;
/**
 * Curvature pairs the quasi-Newton model must hold before its predicted gain may end the fit:
 * from one pair the model can be far off, and a fit started near (not at) the mode, such as a
 * refit from an earlier fit, would stop after a step or two.
 */
const MIN_PAIRS_TO_STOP = 3;

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    const v = Math.abs(a[i]!);
    if (v > m || Number.isNaN(v)) m = v;
  }
  return m;
}

/**
 * Minimise -log p by L-BFGS from the options' starting point. The building block of fitMap and
 * of the VI algorithms' starting points. Throws FitDivergedError if the start has a non-finite
 * density or a finite density ever comes with a non-finite gradient.
 */
export async function maximiseLbfgs(model: Model, options: MapOptions, loop: FitLoop): Promise<LbfgsOutcome> {
  const n = model.dim;
  const m = Math.max(1, Math.floor(options.memory ?? 10));
  const maxIter = loop.maxIterations;
  const gainTol = options.tolerance ?? 1e-4;
  const x = initialPoint(model, options);
  const g = new Float64Array(n);
  const xn = new Float64Array(n);
  const gn = new Float64Array(n);
  const d = new Float64Array(n);
  const S = Array.from({ length: m }, () => new Float64Array(n));
  const Y = Array.from({ length: m }, () => new Float64Array(n));
  const rho = new Float64Array(m);
  const alpha = new Float64Array(m);
  let stored = 0;
  let head = 0;
  let evaluations = 1;
  const h0 = new Float64Array(n).fill(1);
  const precondition = typeof model.curvatureDiagonal === 'function';
  let lastGamma = 1;
  const refreshPreconditioner = (at: Float64Array): void => {
    model.curvatureDiagonal!(at, h0);
    for (let i = 0; i < n; i++) {
      const c = h0[i]!;
      h0[i] = c > 0 && Number.isFinite(c) ? 1 / c : 1;
    }
  };

  // Work with f = -log p and its gradient.
  let f = -model.logDensityGrad(x, g);
  for (let i = 0; i < n; i++) g[i] = -g[i]!;
  if (!Number.isFinite(f)) throw new FitDivergedError(loop.method, 0, `the starting point has log density ${-f}`);
  if (!Number.isFinite(maxAbs(g))) throw new FitDivergedError(loop.method, 0, 'the gradient at the starting point is not finite');

  let iter = 0;
  let converged = false;
  let stopReason = 'iteration cap';
  let smallSteps = 0;
  let lastGain = Infinity;
  const history = new Float64Array(STALL_WINDOW);
  while (iter < maxIter) {
    await loop.tick(iter, -f);
    // Two-loop recursion: d = -H g.
    for (let i = 0; i < n; i++) d[i] = -g[i]!;
    for (let k = 0; k < stored; k++) {
      const j = (head - 1 - k + m) % m;
      const a = rho[j]! * dot(S[j]!, d);
      alpha[j] = a;
      const y = Y[j]!;
      for (let i = 0; i < n; i++) d[i]! -= a * y[i]!;
    }
    // Initial inverse Hessian H0 = gamma * diag(h0): h0 from the model's curvature diagonal
    // when it has one (refreshed every few iterations), scaled by the latest pair's s'y / y'H0y.
    if (precondition && iter % 10 === 0) refreshPreconditioner(x);
    let gamma = 1;
    if (stored > 0) {
      const j = (head - 1 + m) % m;
      const y = Y[j]!;
      let yh = 0;
      for (let i = 0; i < n; i++) yh += y[i]! * y[i]! * h0[i]!;
      gamma = 1 / (rho[j]! * yh);
    } else if (!precondition) {
      gamma = 1 / Math.max(1, maxAbs(g));
    }
    for (let i = 0; i < n; i++) d[i]! *= gamma * h0[i]!;
    lastGamma = gamma;
    for (let k = stored - 1; k >= 0; k--) {
      const j = (head - 1 - k + m) % m;
      const b = rho[j]! * dot(Y[j]!, d);
      const s = S[j]!;
      const c = alpha[j]! - b;
      for (let i = 0; i < n; i++) d[i]! += c * s[i]!;
    }
    let slope = dot(g, d);
    if (!(slope < 0)) {
      // Not a descent direction (stale curvature): restart from steepest descent.
      stored = 0;
      const sc = 1 / Math.max(1, maxAbs(g));
      for (let i = 0; i < n; i++) d[i] = -g[i]! * sc;
      slope = dot(g, d);
      if (!(slope < 0)) { converged = true; stopReason = 'zero gradient'; break; }
    } else if (stored >= Math.min(m, MIN_PAIRS_TO_STOP) && -0.5 * slope < gainTol && lastGain < 10 * gainTol) {
      // The quasi-Newton model predicts less than gainTol nats from a full step, and the last
      // step gained little too (a model built from few pairs can be badly wrong): at the mode.
      converged = true;
      stopReason = 'predicted gain below tolerance';
      break;
    }
    // Backtracking line search on the Armijo condition; a non-finite trial counts as too far.
    let t = 1;
    let fn = NaN;
    let accepted = false;
    for (let tries = 0; tries < 60; tries++) {
      for (let i = 0; i < n; i++) xn[i] = x[i]! + t * d[i]!;
      fn = -model.logDensityGrad(xn, gn);
      evaluations++;
      if (Number.isFinite(fn) && fn <= f + 1e-4 * t * slope) { accepted = true; break; }
      // Quadratic interpolation of the step, kept within [0.1, 0.5] of the last one.
      let next = 0.5;
      if (Number.isFinite(fn)) {
        const q = (-slope * t) / (2 * (fn - f - slope * t));
        if (Number.isFinite(q)) next = Math.min(0.5, Math.max(0.1, q));
      } else {
        next = 0.1;
      }
      t *= next;
    }
    if (!accepted) {
      if (stored > 0) { stored = 0; continue; }
      // No decrease even along the gradient: the mode is found to working precision.
      converged = true;
      stopReason = 'no further decrease (precision limit)';
      break;
    }
    for (let i = 0; i < n; i++) gn[i] = -gn[i]!;
    if (!Number.isFinite(maxAbs(gn))) throw new FitDivergedError(loop.method, iter + 1, 'the gradient became non-finite where the density is finite');
    const s = S[head]!;
    const y = Y[head]!;
    for (let i = 0; i < n; i++) {
      s[i] = xn[i]! - x[i]!;
      y[i] = gn[i]! - g[i]!;
    }
    const sy = dot(s, y);
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) {
      rho[head] = 1 / sy;
      head = (head + 1) % m;
      stored = Math.min(m, stored + 1);
    }
    const rel = Math.abs(f - fn) / Math.max(1, Math.abs(f), Math.abs(fn));
    lastGain = f - fn;
    x.set(xn);
    g.set(gn);
    f = fn;
    iter++;
    // Changes at rounding level for two steps running: nothing more to gain in float64.
    smallSteps = rel < 1e-14 ? smallSteps + 1 : 0;
    if (smallSteps >= 2) { converged = true; stopReason = 'relative change at rounding level'; break; }
    // Stalled: over the last STALL_WINDOW iterations the log density rose by less than
    // STALL_WINDOW * tolerance nats or 1e-9 relative (large hierarchical models creep for
    // hundreds of iterations along nearly flat directions long after the fit is useful).
    history[iter % STALL_WINDOW] = f;
    if (iter >= STALL_WINDOW) {
      const before = history[(iter + 1) % STALL_WINDOW]!;
      if (before - f < Math.max(STALL_WINDOW * gainTol, 1e-9 * Math.abs(f))) { converged = true; stopReason = 'stalled: negligible gain over the last iterations'; break; }
    }
    if (maxAbs(g) < 1e-9) { converged = true; stopReason = 'zero gradient'; break; }
  }
  return {
    mode: x,
    logDensity: -f,
    iterations: iter,
    converged,
    stopReason,
    gradientMaxAbs: maxAbs(g),
    inverseHessianDiagonal: compactInverseHessianDiagonal(S, Y, rho, head, stored, n, h0, lastGamma),
    evaluations,
  };
}

/**
 * diag(H) of the L-BFGS inverse Hessian in compact form, H = γI + W M Wᵀ with W = [S, γY]
 * (Nocedal & Wright eq. 7.24): O(n m²), never forming H. Without stored pairs, NaN.
 */
function compactInverseHessianDiagonal(S: Float64Array[], Y: Float64Array[], rho: Float64Array, head: number, stored: number, n: number, h0: Float64Array, gamma: number): Float64Array {
  const out = new Float64Array(n);
  if (stored === 0) return out.fill(NaN);
  const mCap = S.length;
  // Chronological order, oldest first. H0 = gamma * diag(h0) (Byrd, Nocedal & Schnabel 1994, thm 2.2).
  const idx = Array.from({ length: stored }, (_, k) => (head - stored + k + mCap) % mCap);
  const k = stored;
  const hy = Y.map((y) => {
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) v[i] = gamma * h0[i]! * y[i]!;
    return v;
  });
  // R (upper triangular, R_ij = s_i'y_j for i <= j), its inverse, D and Y'Y.
  const R = new Float64Array(k * k);
  const YY = new Float64Array(k * k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      if (i <= j) R[i * k + j] = dot(S[idx[i]!]!, Y[idx[j]!]!);
      YY[i * k + j] = dot(Y[idx[i]!]!, hy[idx[j]!]!);
    }
  }
  const Rinv = new Float64Array(k * k);
  for (let c = 0; c < k; c++) {
    // Back substitution for column c of R^-1.
    for (let i = k - 1; i >= 0; i--) {
      let s = i === c ? 1 : 0;
      for (let j = i + 1; j < k; j++) s -= R[i * k + j]! * Rinv[j * k + c]!;
      Rinv[i * k + c] = s / R[i * k + i]!;
    }
  }
  // A = R^-T (D + Y'H0 Y) R^-1.
  const mid = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) mid[i * k + j] = YY[i * k + j]! + (i === j ? R[i * k + i]! : 0);
  const tmp = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
    let s = 0;
    for (let l = 0; l < k; l++) s += mid[i * k + l]! * Rinv[l * k + j]!;
    tmp[i * k + j] = s;
  }
  const A = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
    let s = 0;
    for (let l = 0; l < k; l++) s += Rinv[l * k + i]! * tmp[l * k + j]!;
    A[i * k + j] = s;
  }
  const sRow = new Float64Array(k);
  const yRow = new Float64Array(k);
  for (let p = 0; p < n; p++) {
    for (let i = 0; i < k; i++) {
      sRow[i] = S[idx[i]!]![p]!;
      yRow[i] = Y[idx[i]!]![p]!;
    }
    let quad = 0;
    let cross = 0;
    for (let a = 0; a < k; a++) {
      let sa = 0;
      let ra = 0;
      for (let b = 0; b < k; b++) {
        sa += A[a * k + b]! * sRow[b]!;
        ra += Rinv[a * k + b]! * yRow[b]!;
      }
      quad += sRow[a]! * sa;
      cross += sRow[a]! * ra;
    }
    const h = gamma * h0[p]!;
    out[p] = h + quad - 2 * h * cross;
  }
  return out;
}

/** Draws from N(center, diag(sd²)), row-major. */
export function diagonalNormalDraws(rng: Rng, center: Float64Array, sd: Float64Array, count: number): Float64Array {
  const n = center.length;
  const out = new Float64Array(count * n);
  for (let c = 0; c < count; c++) for (let i = 0; i < n; i++) out[c * n + i] = center[i]! + sd[i]! * rng.normal();
  return out;
}

/**
 * The posterior mode by L-BFGS. `sd` is the square root of the inverse-Hessian estimate's
 * diagonal: an approximation that is good along the directions the optimiser explored and
 * crude elsewhere; use ADVI or NUTS for uncertainty that matters.
 */
export async function fitMap(model: Model, options: MapOptions): Promise<FitResult> {
  const loop = new FitLoop('map', options, options.maxIterations ?? 2000);
  const out = await maximiseLbfgs(model, options, loop);
  const sd = new Float64Array(model.dim);
  for (let i = 0; i < sd.length; i++) {
    const v = out.inverseHessianDiagonal[i]!;
    sd[i] = v > 0 ? Math.sqrt(v) : NaN;
  }
  const elapsedMs = loop.finish(out.iterations, out.logDensity);
  const mean = out.mode;
  return {
    method: 'map',
    names: model.names,
    iterations: out.iterations,
    elapsedMs,
    converged: out.converged,
    objective: out.logDensity,
    mean,
    sd,
    draws: (rng, count) => diagonalNormalDraws(rng, mean, sd, count),
    diagnostics: { stopReason: out.stopReason, gradientMaxAbs: out.gradientMaxAbs, evaluations: out.evaluations },
  };
}
