// The predictive delay distribution of one posterior draw of a tail-mixture route model.
//
// A typical Gumbel plus, for the mixture families, a disrupted Gumbel, Student-t or Lomax and
// (for 'gumbel-gumbel-lomax') a severe Lomax, each with its weight; an optional shift moves
// the whole distribution (departure delays derived from arrival delays add the en-route
// recovery offset).
import type { Rng } from '../../inference/rng';
import { gumbelCdf, gumbelLogPdf, gumbelPdf, gumbelSample, gumbelSurvival } from '../gumbel';
import { LOMAX_START_MINUTES, type TailFamily } from '../models/tail-mixture';
import { logGamma, studentTCdf, studentTSample, studentTSurvival } from '../models/student-t';
import type { DelayDistribution } from '../predictive';

type ComponentKind = 'gumbel' | 't' | 'lomax';

interface Component {
  readonly kind: ComponentKind;
  readonly weight: number;
  /** Gumbel: location; t: location; Lomax: where its support starts. */
  readonly location: number;
  /** Gumbel beta, t scale, Lomax lambda. */
  readonly scale: number;
  /** t degrees of freedom, Lomax tail index alpha. */
  readonly shape: number;
  /** log of the t density's constant, computed once (pdf is the hot call in scoring). */
  readonly logConstant: number;
}

/** How often cdfGrid and pdfGrid recompute a Gumbel's e^{-z} instead of stepping it. */
const RESYNC_MINUTES = 32;

function sigmoid(x: number): number {
  return 1 / (1 + Math.exp(-x));
}

function components(family: TailFamily, eta: ArrayLike<number>, df: number, shift: number): Component[] {
  const typical = (weight: number): Component => ({ kind: 'gumbel', weight, location: eta[0]! + shift, scale: Math.exp(eta[1]!), shape: NaN, logConstant: NaN });
  const lomax = (weight: number, logLambda: number, logAlpha: number): Component => ({
    kind: 'lomax',
    weight,
    location: LOMAX_START_MINUTES + shift,
    scale: Math.exp(logLambda),
    shape: Math.exp(logAlpha),
    logConstant: NaN,
  });
  if (family === 'gumbel') return [typical(1)];
  const w = sigmoid(eta[4]!);
  switch (family) {
    case 'gumbel-gumbel':
      return [typical(1 - w), { kind: 'gumbel', weight: w, location: eta[2]! + shift, scale: Math.exp(eta[3]!), shape: NaN, logConstant: NaN }];
    case 'gumbel-t': {
      const logConstant = logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - eta[3]!;
      return [typical(1 - w), { kind: 't', weight: w, location: eta[2]! + shift, scale: Math.exp(eta[3]!), shape: df, logConstant }];
    }
    case 'gumbel-lomax':
      return [typical(1 - w), lomax(w, eta[2]!, eta[3]!)];
    case 'gumbel-gumbel-lomax': {
      const v = sigmoid(eta[7]!);
      return [
        typical(1 - w),
        { kind: 'gumbel', weight: w * (1 - v), location: eta[2]! + shift, scale: Math.exp(eta[3]!), shape: NaN, logConstant: NaN },
        lomax(w * v, eta[5]!, eta[6]!),
      ];
    }
  }
}

function lomaxSurvival(c: Component, x: number): number {
  const v = (x - c.location) / c.scale;
  if (v <= 0) return 1;
  return Math.exp(-c.shape * Math.log1p(v));
}

/** How far a Lomax grid's cubic interpolation may stray from the exact value, in F or f. */
const LOMAX_GRID_TOLERANCE = 1e-10;

/**
 * A Lomax component's weighted F (or f) added into out at lo + i step. Both are made of
 * g(x) = (1 + v)^-p, v = (x - start) / lambda, with p = alpha for S and alpha + 1 for f: smooth
 * past the start, so g is evaluated exactly every K points and by cubic Hermite interpolation
 * (from g and g' = -p g / (lambda (1 + v))) between them. K is the largest power of two up to 16
 * whose error bound h^4 max|g^(4)| / 384 (h = K step; the maximum is at the first point) keeps
 * the weighted error under LOMAX_GRID_TOLERANCE; it is 1 for a narrow or heavy component.
 */
function lomaxGrid(c: Component, lo: number, out: Float64Array, density: boolean, step: number): void {
  const n = out.length;
  const lambda = c.scale;
  const p = density ? c.shape + 1 : c.shape;
  // f = (w alpha / lambda) g; F = w - w g. Before the start both are 0 (f is w alpha / lambda at it).
  const factor = density ? (c.weight * c.shape) / lambda : -c.weight;
  const base = density ? 0 : c.weight;
  let first = Math.max(0, Math.ceil((c.location - lo) / step));
  if (first >= n) return;
  const vAt = (i: number) => (lo + i * step - c.location) / lambda;
  const g = (i: number) => Math.exp(-p * Math.log1p(vAt(i)));
  const fourth = (p * (p + 1) * (p + 2) * (p + 3)) / lambda ** 4 / (1 + vAt(first)) ** (p + 4);
  let span = 1;
  while (span < 16 && (2 * span * step) ** 4 * fourth * Math.abs(factor) <= 384 * LOMAX_GRID_TOLERANCE) span *= 2;
  if (span === 1) {
    for (let i = first; i < n; i++) out[i]! += base + factor * g(i);
    return;
  }
  let g0 = g(first);
  let d0 = (-p * g0) / (lambda * (1 + vAt(first))); // dg/dx
  out[first]! += base + factor * g0;
  while (first < n - 1) {
    const last = Math.min(n - 1, first + span);
    const g1 = g(last);
    const d1 = (-p * g1) / (lambda * (1 + vAt(last)));
    const width = (last - first) * step;
    for (let i = first + 1; i < last; i++) {
      const t = (i - first) / (last - first);
      const t2 = t * t;
      const t3 = t2 * t;
      const value = (2 * t3 - 3 * t2 + 1) * g0 + (t3 - 2 * t2 + t) * width * d0 + (3 * t2 - 2 * t3) * g1 + (t3 - t2) * width * d1;
      out[i]! += base + factor * value;
    }
    out[last]! += base + factor * g1;
    first = last;
    g0 = g1;
    d0 = d1;
  }
}

function componentSurvival(c: Component, x: number): number {
  if (c.kind === 'gumbel') return gumbelSurvival(x, c.location, c.scale);
  if (c.kind === 't') return studentTSurvival(x, c.location, c.scale, c.shape);
  return lomaxSurvival(c, x);
}

function componentCdf(c: Component, x: number): number {
  if (c.kind === 'gumbel') return gumbelCdf(x, c.location, c.scale);
  if (c.kind === 't') return studentTCdf(x, c.location, c.scale, c.shape);
  return 1 - lomaxSurvival(c, x);
}

function componentPdf(c: Component, x: number): number {
  if (c.kind === 'gumbel') return gumbelPdf(x, c.location, c.scale);
  if (!Number.isFinite(x)) return 0;
  const u = (x - c.location) / c.scale;
  if (c.kind === 't') return Math.exp(c.logConstant - ((c.shape + 1) / 2) * Math.log1p((u * u) / c.shape));
  return u < 0 ? 0 : (c.shape / c.scale) * Math.exp(-(c.shape + 1) * Math.log1p(u));
}

function componentLogPdf(c: Component, x: number): number {
  if (c.kind === 'gumbel') return gumbelLogPdf(x, c.location, c.scale);
  if (!Number.isFinite(x)) return -Infinity;
  const u = (x - c.location) / c.scale;
  if (c.kind === 't') return c.logConstant - ((c.shape + 1) / 2) * Math.log1p((u * u) / c.shape);
  return u < 0 ? -Infinity : Math.log(c.shape / c.scale) - (c.shape + 1) * Math.log1p(u);
}

function componentSample(c: Component, rng: Rng): number {
  if (c.kind === 'gumbel') return gumbelSample(rng, c.location, c.scale);
  if (c.kind === 't') return studentTSample(rng, c.location, c.scale, c.shape);
  return c.location + c.scale * Math.expm1(-Math.log(rng.uniform()) / c.shape);
}

/**
 * Edge cases: NaN x gives NaN from every function; x = ±Infinity gives the limits. Parameters
 * come from a validated bundle, so they are finite.
 */
export class TailMixtureDistribution implements DelayDistribution {
  private readonly parts: readonly Component[];

  /** eta holds the family's unconstrained parameters (see FAMILY_PARAMETERS). */
  constructor(
    readonly family: TailFamily,
    eta: ArrayLike<number>,
    readonly df: number,
    readonly shiftMinutes = 0,
  ) {
    this.parts = components(family, eta, df, shiftMinutes);
  }

  /** The weight of everything but the typical component (0 for a single Gumbel). */
  get disruptedWeight(): number {
    return 1 - this.parts[0]!.weight;
  }

  cdf(x: number): number {
    if (Number.isNaN(x)) return NaN;
    let s = 0;
    for (const c of this.parts) s += c.weight * componentCdf(c, x);
    return s;
  }

  survival(x: number): number {
    if (Number.isNaN(x)) return NaN;
    let s = 0;
    for (const c of this.parts) s += c.weight * componentSurvival(c, x);
    return s;
  }

  pdf(x: number): number {
    if (Number.isNaN(x)) return NaN;
    let s = 0;
    for (const c of this.parts) s += c.weight * componentPdf(c, x);
    return s;
  }

  /** log pdf by log-sum-exp over components: finite where pdf underflows to 0. */
  logPdf(x: number): number {
    if (Number.isNaN(x)) return NaN;
    let top = -Infinity;
    const logs = this.parts.map((c) => Math.log(c.weight) + componentLogPdf(c, x));
    for (const l of logs) if (l > top) top = l;
    if (top === -Infinity) return -Infinity;
    let sum = 0;
    for (const l of logs) sum += Math.exp(l - top);
    return top + Math.log(sum);
  }

  /**
   * F at lo, lo + step, lo + 2 step, ... into out (the risk tables' GridEvaluation; step 1
   * unless given), equal to cdf(x) up to rounding: a Gumbel's e^{-z} is stepped by the constant
   * ratio e^{-step/beta} and recomputed every RESYNC_MINUTES points, so one exp per point and
   * component remains.
   */
  cdfGrid(lo: number, out: Float64Array, step = 1): void {
    this.grid(lo, out, false, step);
  }

  /** f at lo, lo + step, ... into out, equal to pdf(x) up to rounding. */
  pdfGrid(lo: number, out: Float64Array, step = 1): void {
    this.grid(lo, out, true, step);
  }

  private grid(lo: number, out: Float64Array, density: boolean, step: number): void {
    out.fill(0);
    const n = out.length;
    for (const c of this.parts) {
      if (c.kind === 'lomax') {
        lomaxGrid(c, lo, out, density, step);
        continue;
      }
      if (c.kind !== 'gumbel') {
        for (let i = 0; i < n; i++) out[i]! += c.weight * (density ? componentPdf(c, lo + i * step) : componentCdf(c, lo + i * step));
        continue;
      }
      const ratio = Math.exp(-step / c.scale);
      const scale = c.weight / c.scale;
      let t = 0;
      for (let i = 0; i < n; i++) {
        // Recompute e^{-z} directly now and then: no drift, and no Infinity carried forward
        // from far below the location, where e^{-z} overflows.
        if (i % RESYNC_MINUTES === 0 || !Number.isFinite(t)) t = Math.exp(-(lo + i * step - c.location) / c.scale);
        else t *= ratio;
        const f = Math.exp(-t);
        // f underflows to 0 long before t overflows; multiplying t by f first keeps 0 * Infinity out.
        out[i]! += density ? (f === 0 ? 0 : scale * (t * f)) : c.weight * f;
      }
    }
  }

  /**
   * Each Lomax component starts at its location, where the density jumps by J = w alpha / lambda
   * and its slope by -(alpha + 1) J / lambda.
   */
  densityJumps(): readonly (readonly [number, number, number])[] {
    return this.parts
      .filter((c) => c.kind === 'lomax')
      .map((c) => {
        const jump = (c.weight * c.shape) / c.scale;
        return [c.location, jump, (-(c.shape + 1) * jump) / c.scale] as const;
      });
  }

  sample(rng: Rng): number {
    let u = rng.uniform();
    for (let i = 0; i < this.parts.length - 1; i++) {
      u -= this.parts[i]!.weight;
      if (u < 0) return componentSample(this.parts[i]!, rng);
    }
    return componentSample(this.parts[this.parts.length - 1]!, rng);
  }
}
