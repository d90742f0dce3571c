// Finite mixtures of delay distributions, e.g. a typical Gumbel plus a wider disrupted one.
//
// cdf, pdf and survival are the weighted sums of the components'; survival sums the
// components' own survival functions, so the far right tail keeps its precision.
import type { Rng } from '../inference/rng';
import type { DelayDistribution, GridEvaluation } from './predictive';

/**
 * A mixture with the given components and weights (non-negative, summing to 1 within 1e-9).
 * Bad weights or no components throw a RangeError; NaN input gives NaN from every function.
 * When every component evaluates grids (GridEvaluation), so does the mixture, and it declares
 * its components' density jumps, weighted.
 * @example mixtureDistribution([gumbelDistribution(0, 1), gumbelDistribution(30, 40)], [0.8, 0.2]).survival(60) // ~0.0487
 */
export function mixtureDistribution(components: readonly (DelayDistribution & GridEvaluation)[], weights: readonly number[]): DelayDistribution & GridEvaluation {
  if (components.length === 0) throw new RangeError('a mixture needs at least one component');
  if (weights.length !== components.length) throw new RangeError(`${components.length} components but ${weights.length} weights`);
  let total = 0;
  for (const w of weights) {
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`mixture weights must be finite and >= 0, got ${w}`);
    total += w;
  }
  if (Math.abs(total - 1) > 1e-9) throw new RangeError(`mixture weights must sum to 1, got ${total}`);
  const comps = components.slice();
  const ws = Float64Array.from(weights);

  const gridded = comps.every((d) => d.cdfGrid && d.pdfGrid);
  let scratch = new Float64Array(0);
  const grid = (lo: number, out: Float64Array, step: number | undefined, density: boolean) => {
    out.fill(0);
    for (let k = 0; k < comps.length; k++) {
      const w = ws[k]!;
      if (!(w > 0)) continue;
      const d = comps[k]!;
      // A component that adds its own weighted values (a Gumbel) needs no scratch row.
      if (d.addGrid) {
        d.addGrid(lo, out, step ?? 1, w, density);
        continue;
      }
      if (scratch.length < out.length) scratch = new Float64Array(out.length);
      const part = scratch.subarray(0, out.length);
      if (density) d.pdfGrid!(lo, part, step);
      else d.cdfGrid!(lo, part, step);
      for (let i = 0; i < out.length; i++) out[i]! += w * part[i]!;
    }
  };
  // Plain arrays: a typed array each would cost an off-heap store per mixture, and the risk
  // engine makes one mixture per posterior draw.
  const allGumbel = comps.every((d) => d.gumbel);
  const locations = allGumbel ? comps.map((d) => d.gumbel!.location) : undefined;
  const scales = allGumbel ? comps.map((d) => d.gumbel!.scale) : undefined;
  // Components summed in order into each node, as survival(x) sums them.
  const summable = comps.every((d) => d.addSurvivalAt);
  const survivalAt = (xs: Int32Array, count: number, out: Float64Array) => {
    out.fill(0, 0, count);
    for (let k = 0; k < comps.length; k++) if (ws[k]! > 0) comps[k]!.addSurvivalAt!(xs, count, out, ws[k]!);
  };
  const jumps = comps.some((d) => d.densityJumps) ? comps.flatMap((d, k) => (d.densityJumps?.() ?? []).map(([x, jump, slope]) => [x, ws[k]! * jump, ws[k]! * slope] as const)) : [];
  // One literal with every field (absent ones undefined): spreading optional parts into it made
  // each mixture object the slow way, and the risk tables make one per posterior draw.
  return {
    cdfGrid: gridded ? (lo: number, out: Float64Array, step?: number) => grid(lo, out, step, false) : undefined,
    pdfGrid: gridded ? (lo: number, out: Float64Array, step?: number) => grid(lo, out, step, true) : undefined,
    densityJumps: jumps.length > 0 ? () => jumps : undefined,
    survivalAt: summable ? survivalAt : undefined,
    // Plain loops rather than a helper taking a closure: the risk tables call these thousands
    // of times per route, and a closure per call is garbage.
    cdf: (x) => {
      if (Number.isNaN(x)) return NaN;
      let s = 0;
      for (let k = 0; k < comps.length; k++) if (ws[k]! > 0) s += ws[k]! * comps[k]!.cdf(x);
      return s;
    },
    survival: (x) => {
      if (Number.isNaN(x)) return NaN;
      let s = 0;
      for (let k = 0; k < comps.length; k++) if (ws[k]! > 0) s += ws[k]! * comps[k]!.survival(x);
      return s;
    },
    pdf: (x) => {
      if (Number.isNaN(x)) return NaN;
      let s = 0;
      for (let k = 0; k < comps.length; k++) if (ws[k]! > 0) s += ws[k]! * comps[k]!.pdf(x);
      return s;
    },
    // Choose a component by its weight, then draw from it.
    sample: (rng: Rng) => comps[componentIndex(ws, rng.uniform())]!.sample(rng),
    // As sample, in place: a mixture of Gumbels with gumbelSample's formula written out; else
    // a component with its own sampleInto writes its draw into out[i] (a stride past the end
    // stops it after one), so no draw is returned from a call.
    sampleInto: (rng: Rng, out: Float64Array, start: number, stride: number, cap: number) => {
      if (locations) {
        for (let i = start; i < out.length; i += stride) {
          const k = componentIndex(ws, rng.uniform());
          out[i] = Math.min(cap, locations[k]! - scales![k]! * Math.log(-Math.log(rng.uniform())));
        }
        return;
      }
      for (let i = start; i < out.length; i += stride) {
        const d = comps[componentIndex(ws, rng.uniform())]!;
        if (d.sampleInto) d.sampleInto(rng, out, i, out.length, cap);
        else out[i] = Math.min(cap, d.sample(rng));
      }
    },
  };
}

/**
 * The component that uniform u picks for the given weights: the first k where u falls below
 * w[0] + ... + w[k] (subtracted in turn), the last when rounding leaves u above them all.
 */
export function componentIndex(weights: ArrayLike<number>, u: number): number {
  const last = weights.length - 1;
  let k = 0;
  while (k < last) {
    u -= weights[k]!;
    if (u < 0) break;
    k++;
  }
  return k;
}
