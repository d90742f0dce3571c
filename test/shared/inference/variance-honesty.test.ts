// Variance honesty: on a posterior with a known, strong correlation, mean-field ADVI's 90%
// intervals under-cover and full-rank ADVI's do not.
//
// The posterior is exact and Gaussian: Bayesian linear regression y = a + b x + e with known
// noise sd and N(0, 100^2) priors, with x far from 0 so that a and b are strongly negatively
// correlated. Its covariance is (X'X / s^2 + I / 100^2)^-1 (conjugate normal linear model;
// e.g. Gelman et al., "Bayesian Data Analysis", 3rd ed., section 14.2). A mean-field Gaussian
// fitted by KL(q||p) has sd 1/sqrt(precision_ii), which is sqrt(1 - rho^2) times too small
// (Bishop, "Pattern Recognition and Machine Learning", section 10.1.2).
import { describe, expect, it } from 'vitest';
import { fitAdvi, fitFullRankAdvi } from '../../../shared/inference/advi';
import { createRng } from '../../../shared/inference/rng';
import type { Model } from '../../../shared/inference/model';

function regression() {
  const rng = createRng(31);
  const n = 40;
  const noiseSd = 2;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = 10 + rng.uniform() * 2;
    xs.push(x);
    ys.push(1.5 + 0.8 * x + noiseSd * rng.normal());
  }
  // Precision matrix and posterior mean in closed form.
  const p0 = 1 / 100 ** 2;
  let sx = 0;
  let sxx = 0;
  let sy = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sx += xs[i]!;
    sxx += xs[i]! ** 2;
    sy += ys[i]!;
    sxy += xs[i]! * ys[i]!;
  }
  const v = noiseSd ** 2;
  const L = [n / v + p0, sx / v, sx / v, sxx / v + p0];
  const det = L[0]! * L[3]! - L[1]! * L[2]!;
  const cov = [L[3]! / det, -L[1]! / det, -L[2]! / det, L[0]! / det];
  const rhsA = sy / v;
  const rhsB = sxy / v;
  const mean = [cov[0]! * rhsA + cov[1]! * rhsB, cov[2]! * rhsA + cov[3]! * rhsB];
  const model: Model = {
    dim: 2,
    names: ['a', 'b'],
    logDensityGrad(t, g) {
      const a = t[0]!;
      const b = t[1]!;
      let lp = -0.5 * p0 * (a * a + b * b);
      let ga = -p0 * a;
      let gb = -p0 * b;
      for (let i = 0; i < n; i++) {
        const r = ys[i]! - a - b * xs[i]!;
        lp -= (0.5 * r * r) / v;
        ga += r / v;
        gb += (r * xs[i]!) / v;
      }
      g[0] = ga;
      g[1] = gb;
      return lp;
    },
  };
  return { model, mean, cov };
}

/** Share of exact posterior draws inside each coordinate's central 90% interval from a fit. */
function coverage(mean: number[], cov: number[], fitMean: Float64Array, fitSd: Float64Array): number[] {
  const rng = createRng(77);
  const l11 = Math.sqrt(cov[0]!);
  const l21 = cov[2]! / l11;
  const l22 = Math.sqrt(cov[3]! - l21 * l21);
  const inside = [0, 0];
  const n = 20_000;
  for (let k = 0; k < n; k++) {
    const z1 = rng.normal();
    const z2 = rng.normal();
    const draw = [mean[0]! + l11 * z1, mean[1]! + l21 * z1 + l22 * z2];
    for (let i = 0; i < 2; i++) if (Math.abs(draw[i]! - fitMean[i]!) <= 1.6449 * fitSd[i]!) inside[i]!++;
  }
  return inside.map((c) => c / n);
}

describe('variance honesty on a posterior with known correlation', () => {
  const { model, mean, cov } = regression();
  const rho = cov[1]! / Math.sqrt(cov[0]! * cov[3]!);

  it('has the strong correlation the test relies on', () => {
    expect(rho).toBeLessThan(-0.95);
  });

  it('mean-field ADVI under-covers: its 90% intervals hold far fewer than 90% of the exact posterior', async () => {
    const fit = await fitAdvi(model, { rng: createRng(5) });
    // Theory: sd shrinks by sqrt(1 - rho^2); coverage 2 Phi(1.645 sqrt(1 - rho^2)) - 1.
    for (let i = 0; i < 2; i++) expect(fit.sd[i]! / Math.sqrt(cov[i * 3]!)).toBeLessThan(Math.sqrt(1 - rho * rho) * 1.3);
    for (const c of coverage(mean, cov, fit.mean, fit.sd)) expect(c).toBeLessThan(0.5);
  });

  it('full-rank ADVI covers: its 90% intervals hold 90% of the exact posterior, and it finds the correlation', async () => {
    const fit = await fitFullRankAdvi(model, { rng: createRng(5) });
    for (let i = 0; i < 2; i++) expect(Math.abs(fit.sd[i]! / Math.sqrt(cov[i * 3]!) - 1), `sd ${i}`).toBeLessThan(0.1);
    for (const c of coverage(mean, cov, fit.mean, fit.sd)) {
      expect(c).toBeGreaterThan(0.86);
      expect(c).toBeLessThan(0.94);
    }
    const d = fit.draws(createRng(8), 20_000);
    let sa = 0;
    let sb = 0;
    let saa = 0;
    let sbb = 0;
    let sab = 0;
    const n = 20_000;
    for (let k = 0; k < n; k++) {
      const a = d[2 * k]!;
      const b = d[2 * k + 1]!;
      sa += a; sb += b; saa += a * a; sbb += b * b; sab += a * b;
    }
    const ca = saa / n - (sa / n) ** 2;
    const cb = sbb / n - (sb / n) ** 2;
    const cab = sab / n - (sa / n) * (sb / n);
    expect(Math.abs(cab / Math.sqrt(ca * cb) - rho)).toBeLessThan(0.02);
  });
});
