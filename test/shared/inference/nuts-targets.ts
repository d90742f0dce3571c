// Analytic log densities with closed-form answers, shared by the sampler and diagnostics tests.
import type { Model } from '../../../shared/inference/model';

// A bivariate Gaussian with sds (s1, s2) and correlation rho: the closed form is the reference.
export function correlatedGaussian(rho: number, s1: number, s2: number, m1 = 0, m2 = 0): Model {
  const det = 1 - rho * rho;
  return {
    dim: 2,
    names: ['a', 'b'],
    logDensityGrad(t, g) {
      const x = (t[0]! - m1) / s1;
      const y = (t[1]! - m2) / s2;
      g[0] = -((x - rho * y) / det) / s1;
      g[1] = -((y - rho * x) / det) / s2;
      return (-0.5 * (x * x - 2 * rho * x * y + y * y)) / det;
    },
  };
}

export function independentGaussian(scales: Float64Array): Model {
  return {
    dim: scales.length,
    names: Array.from(scales, (_, i) => `x[${i}]`),
    logDensityGrad(t, g) {
      let lp = 0;
      for (let i = 0; i < scales.length; i++) {
        const z = t[i]! / scales[i]!;
        lp -= 0.5 * z * z;
        g[i] = -z / scales[i]!;
      }
      return lp;
    },
  };
}

// Neal's funnel (Neal, "Slice sampling", Annals of Statistics 2003): v ~ N(0, 3), x_i | v ~ N(0, e^(v/2)).
export function funnel(dim: number): Model {
  return {
    dim: dim + 1,
    names: ['v', ...Array.from({ length: dim }, (_, i) => `x[${i}]`)],
    logDensityGrad(t, g) {
      const v = t[0]!;
      let lp = -(v * v) / 18;
      g[0] = -v / 9;
      const ev = Math.exp(-v);
      for (let i = 1; i <= dim; i++) {
        const x = t[i]!;
        lp += -0.5 * x * x * ev - 0.5 * v;
        g[i] = -x * ev;
        g[0] = g[0]! + 0.5 * x * x * ev - 0.5;
      }
      return lp;
    },
  };
}
