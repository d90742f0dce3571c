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
   * F at the whole minutes lo, lo + 1, ..., into out (the risk tables' GridEvaluation), equal to
   * cdf(x) up to rounding: a Gumbel's e^{-z} is stepped by the constant ratio e^{-1/beta} per
   * minute and recomputed every RESYNC_MINUTES, so one exp per point and component remains.
   */
  cdfGrid(lo: number, out: Float64Array): void {
    this.grid(lo, out, false);
  }

  /** f at the whole minutes lo, lo + 1, ..., into out, equal to pdf(x) up to rounding. */
  pdfGrid(lo: number, out: Float64Array): void {
    this.grid(lo, out, true);
  }

  private grid(lo: number, out: Float64Array, density: boolean): void {
    out.fill(0);
    const n = out.length;
    for (const c of this.parts) {
      if (c.kind !== 'gumbel') {
        for (let i = 0; i < n; i++) out[i]! += c.weight * (density ? componentPdf(c, lo + i) : componentCdf(c, lo + i));
        continue;
      }
      const ratio = Math.exp(-1 / c.scale);
      const scale = c.weight / c.scale;
      let t = 0;
      for (let i = 0; i < n; i++) {
        // Recompute e^{-z} directly now and then: no drift, and no Infinity carried forward
        // from far below the location, where e^{-z} overflows.
        if (i % RESYNC_MINUTES === 0 || !Number.isFinite(t)) t = Math.exp(-(lo + i - c.location) / c.scale);
        else t *= ratio;
        const f = Math.exp(-t);
        // f underflows to 0 long before t overflows; multiplying t by f first keeps 0 * Infinity out.
        out[i]! += density ? (f === 0 ? 0 : scale * (t * f)) : c.weight * f;
      }
    }
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
