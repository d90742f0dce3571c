// Route-block computations on the tail-mixture model: the curvature of one route's
// conditional posterior, its Laplace approximation, and a block-coordinate warm start.
//
// Given the airport effects and hyperparameters, routes are conditionally independent, so
// each route's k parameters form a small block whose Hessian is cheap by central differences
// of the route's own gradient (2k passes over that route's flights).
import type { TailMixtureModel } from './tail-mixture';

/** Lower Cholesky factor of a symmetric positive-definite k x k matrix (row-major), or null. */
export function cholesky(a: Float64Array, k: number): Float64Array | null {
  const l = new Float64Array(k * k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * k + j]!;
      for (let p = 0; p < j; p++) s -= l[i * k + p]! * l[j * k + p]!;
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * k + i] = Math.sqrt(s);
      } else l[i * k + j] = s / l[j * k + j]!;
    }
  }
  return l;
}

/** Solves (L L') x = b in place of b, L from cholesky(). */
export function choleskySolve(l: Float64Array, k: number, b: Float64Array): Float64Array {
  const x = b.slice();
  for (let i = 0; i < k; i++) {
    let s = x[i]!;
    for (let p = 0; p < i; p++) s -= l[i * k + p]! * x[p]!;
    x[i] = s / l[i * k + i]!;
  }
  for (let i = k - 1; i >= 0; i--) {
    let s = x[i]!;
    for (let p = i + 1; p < k; p++) s -= l[p * k + i]! * x[p]!;
    x[i] = s / l[i * k + i]!;
  }
  return x;
}

/** Inverse of a symmetric positive-definite matrix from its Cholesky factor. */
export function inverseFromCholesky(l: Float64Array, k: number): Float64Array {
  const inv = new Float64Array(k * k);
  const e = new Float64Array(k);
  for (let c = 0; c < k; c++) {
    e.fill(0);
    e[c] = 1;
    const col = choleskySolve(l, k, e);
    for (let i = 0; i < k; i++) inv[i * k + c] = col[i]!;
  }
  return inv;
}

/**
 * Minus the Hessian (the precision) of route r's block at phi, by forward differences of its
 * gradient, symmetrised. `natural` holds every other parameter.
 */
export function routePrecision(model: TailMixtureModel, natural: Float64Array, route: number, phi: Float64Array): Float64Array {
  const { k } = model.layout;
  const precision = new Float64Array(k * k);
  const gp = new Float64Array(k);
  const g0 = new Float64Array(k);
  const x = new Float64Array(k);
  // Forward differences: k + 1 block gradients instead of central differences' 2k. The step's
  // truncation error (order h times the third derivative) is far below what a Laplace variance
  // needs, and the block gradient is the costliest call of the fit after the full gradient.
  model.routeBlockLogDensityGrad(natural, route, phi, g0);
  for (let j = 0; j < k; j++) {
    const h = 1e-4 * Math.max(1, Math.abs(phi[j]!));
    x.set(phi);
    x[j] = phi[j]! + h;
    model.routeBlockLogDensityGrad(natural, route, x, gp);
    for (let i = 0; i < k; i++) precision[i * k + j] = -(gp[i]! - g0[i]!) / h;
  }
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < i; j++) {
      const v = 0.5 * (precision[i * k + j]! + precision[j * k + i]!);
      precision[i * k + j] = v;
      precision[j * k + i] = v;
    }
  }
  return precision;
}

/** Cholesky of precision + ridge * I with the smallest ridge (0, 1e-6, 1e-5, ...) that works. */
function regularisedCholesky(precision: Float64Array, k: number): { l: Float64Array; ridge: number } | null {
  let ridge = 0;
  for (let attempt = 0; attempt < 30; attempt++) {
    const p = precision.slice();
    for (let i = 0; i < k; i++) p[i * k + i]! += ridge;
    const l = cholesky(p, k);
    if (l) return { l, ridge };
    ridge = ridge === 0 ? 1e-6 : ridge * 10;
  }
  return null;
}

/**
 * Gaussian approximation of route r's conditional posterior at the mode in `natural`: the
 * mean (the mode) and the lower Cholesky factor of the covariance.
 */
export function routeLaplace(model: TailMixtureModel, natural: Float64Array, route: number): { mean: Float64Array; chol: Float64Array; ridge: number } {
  const { k } = model.layout;
  const mean = natural.slice(model.layout.phi + route * k, model.layout.phi + (route + 1) * k);
  const reg = regularisedCholesky(routePrecision(model, natural, route, mean), k);
  const chol = reg ? cholesky(inverseFromCholesky(reg.l, k), k) : null;
  if (!reg || !chol) throw new RangeError(`route ${route}: its posterior curvature could not be made positive definite`);
  return { mean, chol, ridge: reg.ridge };
}

/**
 * A warm start for the full MAP fit by block-coordinate ascent: each sweep takes damped
 * Newton steps on every route's block, then re-solves the airport effects, population means
 * and sds given the routes (the Gaussian hierarchy's conditional modes). A few sweeps bring
 * the thousands of route blocks near their optimum, which plain L-BFGS over all coordinates
 * reaches only slowly. Modifies `natural` in place.
 */
export function warmStart(model: TailMixtureModel, natural: Float64Array, originOf: Int32Array, destinationOf: Int32Array, sweeps = 2): void {
  const L = model.layout;
  const { k } = L;
  const phi = new Float64Array(k);
  const trial = new Float64Array(k);
  const grad = new Float64Array(k);
  const scratch = new Float64Array(k);
  for (let sweep = 0; sweep < sweeps; sweep++) {
    for (let r = 0; r < L.routes; r++) {
      phi.set(natural.subarray(L.phi + r * k, L.phi + (r + 1) * k));
      const lp = model.routeBlockLogDensityGrad(natural, r, phi, grad);
      const reg = regularisedCholesky(routePrecision(model, natural, r, phi), k);
      if (!reg) continue;
      const step = choleskySolve(reg.l, k, grad);
      for (let alpha = 1; alpha > 1e-3; alpha *= 0.5) {
        for (let j = 0; j < k; j++) trial[j] = phi[j]! + alpha * step[j]!;
        const next = model.routeBlockLogDensityGrad(natural, r, trial, scratch);
        if (Number.isFinite(next) && next >= lp) {
          natural.set(trial, L.phi + r * k);
          break;
        }
      }
    }
    updateHierarchy(model, natural, originOf, destinationOf);
  }
}

/**
 * Given the route parameters, re-solves the Gaussian hierarchy: population means and airport
 * effects at their conditional modes (Gauss-Seidel), the route sd at its conditional mode and
 * the airport sds by the EM update sd^2 = mean(A^2 + Var A), which counts each effect's
 * uncertainty and so does not collapse to zero. Airport coordinates are stored non-centred.
 */
function updateHierarchy(model: TailMixtureModel, natural: Float64Array, originOf: Int32Array, destinationOf: Int32Array): void {
  const L = model.layout;
  const { k } = L;
  const routesFrom = new Float64Array(L.airports);
  const routesTo = new Float64Array(L.airports);
  for (let r = 0; r < L.routes; r++) {
    routesFrom[originOf[r]!]! += 1;
    routesTo[destinationOf[r]!]! += 1;
  }
  const A = new Float64Array(L.airports);
  const B = new Float64Array(L.airports);
  const sum = new Float64Array(L.airports);
  for (let j = 0; j < k; j++) {
    const phiAt = (r: number) => natural[L.phi + r * k + j]!;
    let sdA = Math.exp(natural[L.logSdOrigin + j]!);
    let sdB = Math.exp(natural[L.logSdDestination + j]!);
    let varRoute = Math.exp(2 * natural[L.logSdRoute + j]!);
    for (let a = 0; a < L.airports; a++) {
      A[a] = sdA * natural[L.origin + a * k + j]!;
      B[a] = sdB * natural[L.destination + a * k + j]!;
    }
    let pop = natural[L.pop + j]!;
    for (let pass = 0; pass < 5; pass++) {
      let s = 0;
      for (let r = 0; r < L.routes; r++) s += phiAt(r) - A[originOf[r]!]! - B[destinationOf[r]!]!;
      pop = s / L.routes;
      sum.fill(0);
      for (let r = 0; r < L.routes; r++) sum[originOf[r]!]! += phiAt(r) - pop - B[destinationOf[r]!]!;
      let ssA = 0;
      let nA = 0;
      for (let a = 0; a < L.airports; a++) {
        const precision = routesFrom[a]! / varRoute + 1 / (sdA * sdA);
        A[a] = sum[a]! / varRoute / precision;
        if (routesFrom[a]! > 0) {
          ssA += A[a]! * A[a]! + 1 / precision;
          nA++;
        }
      }
      sum.fill(0);
      for (let r = 0; r < L.routes; r++) sum[destinationOf[r]!]! += phiAt(r) - pop - A[originOf[r]!]!;
      let ssB = 0;
      let nB = 0;
      for (let a = 0; a < L.airports; a++) {
        const precision = routesTo[a]! / varRoute + 1 / (sdB * sdB);
        B[a] = sum[a]! / varRoute / precision;
        if (routesTo[a]! > 0) {
          ssB += B[a]! * B[a]! + 1 / precision;
          nB++;
        }
      }
      let ss = 0;
      for (let r = 0; r < L.routes; r++) ss += (phiAt(r) - pop - A[originOf[r]!]! - B[destinationOf[r]!]!) ** 2;
      varRoute = Math.max(ss / L.routes, 1e-8);
      sdA = Math.sqrt(Math.max(ssA / Math.max(nA, 1), 1e-8));
      sdB = Math.sqrt(Math.max(ssB / Math.max(nB, 1), 1e-8));
    }
    natural[L.pop + j] = pop;
    natural[L.logSdRoute + j] = 0.5 * Math.log(varRoute);
    natural[L.logSdOrigin + j] = Math.log(sdA);
    natural[L.logSdDestination + j] = Math.log(sdB);
    for (let a = 0; a < L.airports; a++) {
      natural[L.origin + a * k + j] = A[a]! / sdA;
      natural[L.destination + a * k + j] = B[a]! / sdB;
    }
  }
}

/** The coordinates the Laplace-EM step sets: the log sds of the route effects. */
export function routeSdCoordinates(model: TailMixtureModel): Int32Array {
  const L = model.layout;
  return Int32Array.from({ length: L.k }, (_, j) => L.logSdRoute + j);
}

/**
 * One Laplace-EM update of the route sds, everything else held at `natural` (in place).
 *
 * Route parameters are centred, phi_r ~ N(m_r, sd). For a parameter the data pin only
 * weakly (a Lomax tail index, a severe share), a joint MAP over phi and sd has no proper
 * mode: shrinking every route onto m_r and sd toward zero raises the joint density by about
 * R log(1/sd) for R routes, so L-BFGS shrinks that sd for as long as it runs (it never
 * converges) and every route gets nearly the same tail. The EM update of a variance
 * component maximises the Laplace-approximated marginal likelihood instead:
 * sd^2 = mean over routes of (phi_r - m_r)^2 + Var(phi_r | rest), the variance from each
 * route block's Laplace covariance (Dempster, Laird & Rubin 1977; the variance-component
 * case of Laird & Ware 1982). Airport and month effects are non-centred and keep their joint
 * MAP. Returns the largest |change| of a log sd.
 */
export function routeSdEmUpdate(model: TailMixtureModel, natural: Float64Array, originOf: Int32Array, destinationOf: Int32Array): number {
  const L = model.layout;
  const { k } = L;
  const ss = new Float64Array(k);
  for (let r = 0; r < L.routes; r++) {
    const { chol } = routeLaplace(model, natural, r);
    const o = originOf[r]!;
    const d = destinationOf[r]!;
    for (let j = 0; j < k; j++) {
      let variance = 0;
      for (let p = 0; p <= j; p++) variance += chol[j * k + p]! ** 2;
      const mean =
        natural[L.pop + j]! +
        Math.exp(natural[L.logSdOrigin + j]!) * natural[L.origin + o * k + j]! +
        Math.exp(natural[L.logSdDestination + j]!) * natural[L.destination + d * k + j]!;
      ss[j]! += (natural[L.phi + r * k + j]! - mean) ** 2 + variance;
    }
  }
  let change = 0;
  for (let j = 0; j < k; j++) {
    const logSd = 0.5 * Math.log(Math.max(ss[j]! / L.routes, 1e-16));
    change = Math.max(change, Math.abs(logSd - natural[L.logSdRoute + j]!));
    natural[L.logSdRoute + j] = logSd;
  }
  return change;
}
