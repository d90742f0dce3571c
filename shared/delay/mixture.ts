// Finite mixtures of delay distributions, e.g. a typical Gumbel plus a wider disrupted one.
//
// cdf, pdf and survival are the weighted sums of the components'; survival sums the
// components' own survival functions, so the far right tail keeps its precision.
import type { Rng } from '../inference/rng';
import { exponentialRow, strideCount, uniformRow } from './draw-buffers';
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
  return new MixtureDistribution(components.slice(), weights.slice());
}

type Component = DelayDistribution & GridEvaluation;
type Jump = readonly [number, number, number];

/** MixtureDistribution.weighted's function codes. */
const CDF = 0;
const SURVIVAL = 1;
const PDF = 2;

/**
 * A class rather than an object of closures: the risk engine makes one mixture per posterior
 * draw, thousands per scoring run, and each closure-built object cost about a dozen function
 * objects that lived as long as the run's tables. The optional GridEvaluation methods are
 * fields set to shared functions, or undefined where the components do not allow them, so
 * every instance has the same shape.
 */
class MixtureDistribution implements DelayDistribution, GridEvaluation {
  // Plain arrays: a typed array each would cost an off-heap store per mixture.
  readonly ws: number[];
  /** The components' locations and scales when all are Gumbels (for sampleInto), else null. */
  readonly locations: number[] | null;
  readonly scales: number[] | null;
  readonly jumps: readonly Jump[];
  scratch: Float64Array | null = null;
  readonly cdfGrid: ((lo: number, out: Float64Array, step?: number) => void) | undefined;
  readonly pdfGrid: ((lo: number, out: Float64Array, step?: number) => void) | undefined;
  readonly survivalAt: ((xs: Int32Array, count: number, out: Float64Array) => void) | undefined;
  readonly densityJumps: (() => readonly Jump[]) | undefined;
  readonly featureScale: (() => number) | undefined;
  /** The narrowest weighted component's featureScale (NaN when a component has none). */
  readonly narrowest: number;

  constructor(
    readonly comps: readonly Component[],
    ws: number[],
  ) {
    this.ws = ws;
    let gridded = true;
    let summable = true;
    let allGumbel = true;
    let jumpy = false;
    for (const d of comps) {
      gridded &&= d.cdfGrid !== undefined && d.pdfGrid !== undefined;
      // Components summed in order into each node, as survival(x) sums them.
      summable &&= d.addSurvivalAt !== undefined;
      allGumbel &&= d.gumbel !== undefined;
      jumpy ||= d.densityJumps !== undefined;
    }
    this.locations = allGumbel ? comps.map((d) => d.gumbel!.location) : null;
    this.scales = allGumbel ? comps.map((d) => d.gumbel!.scale) : null;
    this.jumps = jumpy ? comps.flatMap((d, k) => (d.densityJumps?.() ?? []).map(([x, jump, slope]) => [x, ws[k]! * jump, ws[k]! * slope] as const)) : [];
    this.cdfGrid = gridded ? mixtureCdfGrid : undefined;
    this.pdfGrid = gridded ? mixturePdfGrid : undefined;
    this.survivalAt = summable ? mixtureSurvivalAt : undefined;
    this.densityJumps = this.jumps.length > 0 ? mixtureJumps : undefined;
    let narrowest = Infinity;
    comps.forEach((d, k) => {
      if (ws[k]! > 0) narrowest = Math.min(narrowest, d.featureScale ? d.featureScale() : NaN);
    });
    this.narrowest = narrowest;
    this.featureScale = narrowest > 0 && narrowest < Infinity ? mixtureFeatureScale : undefined;
  }

  cdf(x: number): number {
    return this.weighted(x, CDF);
  }

  survival(x: number): number {
    return this.weighted(x, SURVIVAL);
  }

  pdf(x: number): number {
    return this.weighted(x, PDF);
  }

  // The weighted sum of the components' CDF, survival or density at x. A function code rather
  // than a closure: the risk tables call these thousands of times per route, and a closure per
  // call is garbage.
  private weighted(x: number, part: number): number {
    if (Number.isNaN(x)) return NaN;
    const { comps, ws } = this;
    let s = 0;
    for (let k = 0; k < comps.length; k++) {
      const w = ws[k]!;
      if (!(w > 0)) continue;
      const d = comps[k]!;
      s += w * (part === CDF ? d.cdf(x) : part === SURVIVAL ? d.survival(x) : d.pdf(x));
    }
    return s;
  }

  // Choose a component by its weight, then draw from it.
  sample(rng: Rng): number {
    return this.comps[componentIndex(this.ws, rng.uniform())]!.sample(rng);
  }

  // As sample, in place: a mixture of Gumbels with gumbelSample's formula written out; else a
  // component with its own sampleInto writes its draw into out[i] (a stride past the end stops
  // it after one), so no draw is returned from a call.
  sampleInto(rng: Rng, out: Float64Array, start: number, stride: number, cap: number): void {
    const { comps, ws, locations, scales } = this;
    if (locations && scales) {
      // The uniform and exponential of each draw in bulk, in the order the calls would draw them.
      const count = strideCount(out.length, start, stride);
      const us = uniformRow(count);
      const es = exponentialRow(count);
      rng.uniformExponentialPairs(us, es, count);
      for (let j = 0, i = start; j < count; j++, i += stride) {
        const k = componentIndex(ws, us[j]!);
        out[i] = Math.min(cap, locations[k]! - scales[k]! * Math.log(es[j]!));
      }
      return;
    }
    for (let i = start; i < out.length; i += stride) {
      const d = comps[componentIndex(ws, rng.uniform())]!;
      if (d.sampleInto) d.sampleInto(rng, out, i, out.length, cap);
      else out[i] = Math.min(cap, d.sample(rng));
    }
  }

  /** The components' grids, weighted, summed into out (see GridEvaluation). */
  grid(lo: number, out: Float64Array, step: number, density: boolean): void {
    const { comps, ws } = this;
    out.fill(0);
    for (let k = 0; k < comps.length; k++) {
      const w = ws[k]!;
      if (!(w > 0)) continue;
      const d = comps[k]!;
      // A component that adds its own weighted values (a Gumbel) needs no scratch row.
      if (d.addGrid) {
        d.addGrid(lo, out, step, w, density);
        continue;
      }
      if (!this.scratch || this.scratch.length < out.length) this.scratch = new Float64Array(out.length);
      const part = this.scratch.subarray(0, out.length);
      if (density) d.pdfGrid!(lo, part, step);
      else d.cdfGrid!(lo, part, step);
      for (let i = 0; i < out.length; i++) out[i]! += w * part[i]!;
    }
  }
}

function mixtureCdfGrid(this: MixtureDistribution, lo: number, out: Float64Array, step?: number): void {
  this.grid(lo, out, step ?? 1, false);
}

function mixturePdfGrid(this: MixtureDistribution, lo: number, out: Float64Array, step?: number): void {
  this.grid(lo, out, step ?? 1, true);
}

function mixtureSurvivalAt(this: MixtureDistribution, xs: Int32Array, count: number, out: Float64Array): void {
  const { comps, ws } = this;
  out.fill(0, 0, count);
  for (let k = 0; k < comps.length; k++) if (ws[k]! > 0) comps[k]!.addSurvivalAt!(xs, count, out, ws[k]!);
}

function mixtureJumps(this: MixtureDistribution): readonly Jump[] {
  return this.jumps;
}

function mixtureFeatureScale(this: MixtureDistribution): number {
  return this.narrowest;
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
