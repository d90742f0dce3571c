// Draws from the Laplace approximation N(mode, (-H)^-1) at a posterior mode, with the full
// Hessian H of the log density taken by central differences of the gradient.
//
// The Laplace approximation (Gelman et al., Bayesian Data Analysis, 3rd ed., section 4.1)
// keeps the correlations that a diagonal sd drops; in non-centred hierarchies those
// correlations are strong, and ignoring them inflates the sd of every group's parameters.
import type { Model } from './model';
import type { Rng } from './rng';

/** Beyond this dimension the dense Hessian (dim^2 values, 2 dim gradients) is not worth it. */
export const LAPLACE_MAX_DIM = 500;

/**
 * The Cholesky factor L (lower, row-major) of the precision -H at `at`, with -H = L L^T;
 * null when -H is not positive definite or a gradient is not finite. Writes the gradient
 * at `at` into `grad`.
 */
function precisionCholesky(model: Model, at: Float64Array, grad: Float64Array): Float64Array | null {
  const d = model.dim;
  if (!Number.isFinite(model.logDensityGrad(at, grad))) return null;
  const precision = new Float64Array(d * d);
  const mode = at;
  const theta = Float64Array.from(mode);
  const gPlus = new Float64Array(d);
  const gMinus = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    const h = 1e-5 * Math.max(1, Math.abs(mode[j]!));
    theta[j] = mode[j]! + h;
    model.logDensityGrad(theta, gPlus);
    theta[j] = mode[j]! - h;
    model.logDensityGrad(theta, gMinus);
    theta[j] = mode[j]!;
    for (let i = 0; i < d; i++) {
      const v = -(gPlus[i]! - gMinus[i]!) / (2 * h);
      if (!Number.isFinite(v)) return null;
      precision[i * d + j] = v;
    }
  }
  // Symmetrise, then Cholesky precision = L L^T (lower L, in place).
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < i; j++) {
      const v = 0.5 * (precision[i * d + j]! + precision[j * d + i]!);
      precision[i * d + j] = v;
      precision[j * d + i] = v;
    }
  }
  const l = precision;
  for (let j = 0; j < d; j++) {
    let diag = l[j * d + j]!;
    for (let k = 0; k < j; k++) diag -= l[j * d + k]! ** 2;
    if (!(diag > 0)) return null;
    const ljj = Math.sqrt(diag);
    l[j * d + j] = ljj;
    for (let i = j + 1; i < d; i++) {
      let v = l[i * d + j]!;
      for (let k = 0; k < j; k++) v -= l[i * d + k]! * l[j * d + k]!;
      l[i * d + j] = v / ljj;
    }
  }
  return l;
}

/** Solves L L^T x = b in place (b becomes x). */
function cholSolve(l: Float64Array, d: number, b: Float64Array): void {
  for (let i = 0; i < d; i++) {
    let v = b[i]!;
    for (let k = 0; k < i; k++) v -= l[i * d + k]! * b[k]!;
    b[i] = v / l[i * d + i]!;
  }
  for (let i = d - 1; i >= 0; i--) {
    let v = b[i]!;
    for (let k = i + 1; k < d; k++) v -= l[k * d + i]! * b[k]!;
    b[i] = v / l[i * d + i]!;
  }
}

/**
 * `count` draws (count x dim, row-major) from N(m, (-H(m))^-1), where m is `start` refined
 * by `newtonSteps` Newton steps toward the mode (0: `start` is taken as the mode). Null when
 * the Hessian is not negative definite on the way, a gradient is not finite, or
 * dim > LAPLACE_MAX_DIM.
 */
export function laplaceDraws(model: Model, start: Float64Array, rng: Rng, count: number, newtonSteps = 0): Float64Array | null {
  const d = model.dim;
  if (d > LAPLACE_MAX_DIM || start.length !== d) return null;
  const mode = Float64Array.from(start);
  const grad = new Float64Array(d);
  let l = precisionCholesky(model, mode, grad);
  if (!l) return null;
  let lp = model.logDensityGrad(mode, grad);
  const step = new Float64Array(d);
  const candidate = new Float64Array(d);
  const candidateGrad = new Float64Array(d);
  for (let n = 0; n < newtonSteps; n++) {
    // Damped Newton: theta += alpha (-H)^-1 g, halving alpha until the density rises and the
    // curvature there is still that of a maximum.
    step.set(grad);
    cholSolve(l, d, step);
    let accepted = false;
    for (let alpha = 1; alpha >= 1 / 64 && !accepted; alpha /= 2) {
      for (let i = 0; i < d; i++) candidate[i] = mode[i]! + alpha * step[i]!;
      const candidateLp = model.logDensityGrad(candidate, candidateGrad);
      if (!(candidateLp > lp)) continue;
      const candidateL = precisionCholesky(model, candidate, candidateGrad);
      if (!candidateL) continue;
      mode.set(candidate);
      grad.set(candidateGrad);
      lp = candidateLp;
      l = candidateL;
      accepted = true;
    }
    if (!accepted) break;
  }
  // theta = mode + L^-T z has covariance (L L^T)^-1.
  const out = new Float64Array(count * d);
  const x = new Float64Array(d);
  for (let s = 0; s < count; s++) {
    for (let i = 0; i < d; i++) x[i] = rng.normal();
    for (let i = d - 1; i >= 0; i--) {
      let v = x[i]!;
      for (let k = i + 1; k < d; k++) v -= l[k * d + i]! * x[k]!;
      x[i] = v / l[i * d + i]!;
    }
    for (let i = 0; i < d; i++) out[s * d + i] = mode[i]! + x[i]!;
  }
  return out;
}
