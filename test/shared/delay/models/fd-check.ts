// Central finite-difference check of a Model's gradient, shared by the model tests.
import type { Model } from '../../../../shared/inference/model';

export interface GradientMismatch {
  readonly index: number;
  readonly name: string;
  readonly analytic: number;
  readonly numeric: number;
}

/**
 * Compare logDensityGrad's gradient with (f(θ + h e_i) - f(θ - h e_i)) / 2h at every coordinate
 * (or `coordinates`). Returns the mismatches beyond |a - n| <= tol * max(1, |n|).
 */
export function finiteDifferenceMismatches(model: Model, theta: Float64Array, tol = 1e-5, h = 1e-5, coordinates?: readonly number[]): GradientMismatch[] {
  const grad = new Float64Array(model.dim);
  const scratch = new Float64Array(model.dim);
  model.logDensityGrad(theta, grad);
  const out: GradientMismatch[] = [];
  const idx = coordinates ?? Array.from({ length: model.dim }, (_, i) => i);
  const t = Float64Array.from(theta);
  for (const i of idx) {
    t[i] = theta[i]! + h;
    const up = model.logDensityGrad(t, scratch);
    t[i] = theta[i]! - h;
    const down = model.logDensityGrad(t, scratch);
    t[i] = theta[i]!;
    const numeric = (up - down) / (2 * h);
    const analytic = grad[i]!;
    if (!(Math.abs(analytic - numeric) <= tol * Math.max(1, Math.abs(numeric)))) out.push({ index: i, name: model.names[i] ?? String(i), analytic, numeric });
  }
  return out;
}
