// The predictive delay distribution of one posterior draw of a tail-mixture route model.
//
// A typical Gumbel plus, for the mixture families, a disrupted Gumbel, Student-t or Lomax and
// (for 'gumbel-gumbel-lomax') a severe Lomax, each with its weight; an optional shift moves
// the whole distribution (departure delays derived from arrival delays add the en-route
// recovery offset).
import type { Rng } from '../../inference/rng';
import { addGumbelGrid, addGumbelSurvivals, EXP_NEGATIVE_MAX, expNegative, gumbelExponentialSample, gumbelLogPdf, gumbelPdf, oneMinusExpNeg } from '../gumbel';
import { LOMAX_START_MINUTES, type TailFamily } from '../models/tail-mixture';
import { logGamma, studentTCdf, studentTSample, studentTSurvival } from '../models/student-t';
import { componentIndex } from '../mixture';
import { exponentialRow, strideCount, uniformRow } from '../draw-buffers';
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
  return expOfNegative(c.shape * Math.log1p(v));
}

/** e^{-a} for a >= 0, by the table-based expNegative where it applies (3e-14 relative). */
function expOfNegative(a: number): number {
  return a <= EXP_NEGATIVE_MAX ? expNegative(a) : Math.exp(-a);
}

/**
 * weight * S(xs[k]) added into out[k] for a Lomax component: lomaxSurvival with the exp by
 * expOfNegative, within 3e-14 relative of it (the risk tables' tail nodes, where the Lomax's
 * exp and log were a tenth of an arrival table's time).
 */
function addLomaxSurvivals(c: Component, xs: Int32Array, count: number, out: Float64Array): void {
  const start = c.location;
  const inverseScale = 1 / c.scale;
  const alpha = c.shape;
  const weight = c.weight;
  for (let k = 0; k < count; k++) {
    const v = (xs[k]! - start) * inverseScale;
    out[k] = out[k]! + weight * (v <= 0 ? 1 : expOfNegative(alpha * Math.log1p(v)));
  }
}

/** Points between direct evaluations in lomaxGrid's recurrence. */
const LOMAX_RESYNC_POINTS = 32;
/**
 * Relative error allowed per step of lomaxGrid's series: over LOMAX_RESYNC_POINTS steps g is
 * off by under 32 times this, 3.2e-13, well inside the 1e-10 of the grid contract.
 */
const LOMAX_STEP_ERROR = 1e-14;

/**
 * A Lomax component's weighted F (or f) added into out at lo + i step. Both are made of
 * g(x) = (1 + v)^-p, v = (x - start) / lambda, with p = alpha for S and alpha + 1 for f. From one
 * point to the next g is multiplied by (1 + e)^-p, e = (step / lambda) / (1 + v), which shrinks
 * along the grid. Once e is small enough that the factor's binomial series to e^8 is off by
 * under LOMAX_STEP_ERROR (the series alternates with falling terms there, so its first omitted
 * term, p (p + 1) ... (p + 8) / 9! e^9, bounds the error), g is stepped by that series and
 * recomputed directly every LOMAX_RESYNC_POINTS points; before that, near the component's
 * start, every point is evaluated directly. So a wide grid needs a log and an exp only for its
 * first points (a series to e^8 rather than e^6 starts three times nearer the start, which
 * for the bundled fit's narrower severe components, lambda near 30 minutes, was over 100 points
 * sooner). The direct evaluations take expOfNegative's exp, 3e-14 relative.
 */
function lomaxGrid(c: Component, lo: number, out: Float64Array, density: boolean, step: number): void {
  const n = out.length;
  const lambda = c.scale;
  const p = density ? c.shape + 1 : c.shape;
  // f = (w alpha / lambda) g; F = w - w g. Before the start both are 0 (f is w alpha / lambda at it).
  const factor = density ? (c.weight * c.shape) / lambda : -c.weight;
  const base = density ? 0 : c.weight;
  const first = Math.max(0, Math.ceil((c.location - lo) / step));
  const delta = step / lambda;
  const inverseLambda = 1 / lambda;
  // Binomial coefficients of (1 + e)^-p: 1 - p e + p (p + 1) / 2 e^2 - ...
  const c1 = -p;
  const c2 = (-c1 * (p + 1)) / 2;
  const c3 = (-c2 * (p + 2)) / 3;
  const c4 = (-c3 * (p + 3)) / 4;
  const c5 = (-c4 * (p + 4)) / 5;
  const c6 = (-c5 * (p + 5)) / 6;
  const c7 = (-c6 * (p + 6)) / 7;
  const c8 = (-c7 * (p + 7)) / 8;
  const c9 = (-c8 * (p + 8)) / 9;
  const seriesLimit = Math.pow(LOMAX_STEP_ERROR / Math.abs(c9), 1 / 9);
  let g = 0;
  let stepped = LOMAX_RESYNC_POINTS;
  for (let i = first; i < n; i++) {
    const onePlusV = 1 + (lo + i * step - c.location) * inverseLambda;
    if (stepped >= LOMAX_RESYNC_POINTS) {
      g = expOfNegative(p * Math.log(onePlusV));
      stepped = 0;
    }
    out[i]! += base + factor * g;
    const e = delta / onePlusV;
    if (e <= seriesLimit) {
      g *= 1 + e * (c1 + e * (c2 + e * (c3 + e * (c4 + e * (c5 + e * (c6 + e * (c7 + e * c8)))))));
      stepped++;
    } else stepped = LOMAX_RESYNC_POINTS;
  }
}

function componentSurvival(c: Component, x: number): number {
  if (c.kind === 'gumbel') {
    // gumbelSurvival without its parameter checks (a bundle's are validated).
    return oneMinusExpNeg(Math.exp(-(x - c.location) / c.scale));
  }
  if (c.kind === 't') return studentTSurvival(x, c.location, c.scale, c.shape);
  return lomaxSurvival(c, x);
}

function componentCdf(c: Component, x: number): number {
  if (c.kind === 'gumbel') {
    // e^{-t}, t = e^{-z} >= 0, by the table exp where it applies (3e-14 relative).
    const t = Math.exp(-(x - c.location) / c.scale);
    return expOfNegative(t);
  }
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
  if (c.kind === 'gumbel') return gumbelExponentialSample(rng, c.location, c.scale);
  if (c.kind === 't') return studentTSample(rng, c.location, c.scale, c.shape);
  // Lomax by inversion, S^-1(U) = start + lambda (U^(-1/alpha) - 1), with E = -log U.
  return c.location + c.scale * Math.expm1(rng.exponential() / c.shape);
}

/**
 * Edge cases: NaN x gives NaN from every function; x = ±Infinity gives the limits. Parameters
 * come from a validated bundle, so they are finite.
 */
export class TailMixtureDistribution implements DelayDistribution {
  private readonly parts: readonly Component[];
  /** The parts' weights, for choosing one per sample. */
  private readonly weights: Float64Array;

  /** eta holds the family's unconstrained parameters (see FAMILY_PARAMETERS). */
  constructor(
    readonly family: TailFamily,
    eta: ArrayLike<number>,
    readonly df: number,
    readonly shiftMinutes = 0,
  ) {
    this.parts = components(family, eta, df, shiftMinutes);
    this.weights = Float64Array.from(this.parts, (c) => c.weight);
    this.uniformThenExponential = this.parts.every((c) => c.kind !== 't');
  }

  /** True when every component is a Gumbel or a Lomax, each sampled from one exponential. */
  private readonly uniformThenExponential: boolean;

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

  /** survival at xs[0..count) into out, component by component in the same order (GridEvaluation). */
  survivalAt(xs: Int32Array, count: number, out: Float64Array): void {
    out.fill(0, 0, count);
    for (const c of this.parts) {
      if (c.kind === 'gumbel') addGumbelSurvivals(xs, count, out, c.location, c.scale, c.weight);
      else if (c.kind === 'lomax') addLomaxSurvivals(c, xs, count, out);
      else for (let k = 0; k < count; k++) out[k] = out[k]! + c.weight * componentSurvival(c, xs[k]!);
    }
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
   * ratio e^{-step/beta} (addGumbelGrid), so one exp per point and component remains.
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
      addGumbelGrid(out, lo, step, c.location, c.scale, c.weight, density);
    }
  }

  /**
   * Each Lomax component starts at its location, where the density jumps by J = w alpha / lambda
   * and its slope by -(alpha + 1) J / lambda.
   */
  densityJumps(): readonly (readonly [number, number, number])[] {
    // Worked out once: the risk tables ask several times per draw, and each answer was garbage.
    return (this.jumps ??= this.parts
      .filter((c) => c.kind === 'lomax')
      .map((c) => {
        const jump = (c.weight * c.shape) / c.scale;
        return [c.location, jump, (-(c.shape + 1) * jump) / c.scale] as const;
      }));
  }

  private jumps?: readonly (readonly [number, number, number])[];

  /**
   * The narrowest component's width: a Gumbel's or t's scale; for a Lomax, lambda / (alpha + 1),
   * the length over which its density falls by a factor e just after its start.
   */
  featureScale(): number {
    let narrowest = Infinity;
    for (const c of this.parts) if (c.weight > 0) narrowest = Math.min(narrowest, c.kind === 'lomax' ? c.scale / (c.shape + 1) : c.scale);
    return narrowest;
  }

  sample(rng: Rng): number {
    return componentSample(this.parts[componentIndex(this.weights, rng.uniform())]!, rng);
  }

  /** As sample, in place (see DelayDistribution.sampleInto). */
  sampleInto(rng: Rng, out: Float64Array, start: number, stride: number, cap: number): void {
    const weights = this.weights;
    if (this.uniformThenExponential) {
      // Every component draws one exponential after the uniform that picks it: both in bulk,
      // in the order the calls would draw them.
      const count = strideCount(out.length, start, stride);
      const us = uniformRow(count);
      const es = exponentialRow(count);
      rng.uniformExponentialPairs(us, es, count);
      for (let j = 0, i = start; j < count; j++, i += stride) {
        const c = this.parts[componentIndex(weights, us[j]!)]!;
        const e = es[j]!;
        out[i] = Math.min(cap, c.kind === 'gumbel' ? c.location - c.scale * Math.log(e) : c.location + c.scale * Math.expm1(e / c.shape));
      }
      return;
    }
    for (let i = start; i < out.length; i += stride) {
      // componentSample's Gumbel and Lomax formulas inline: called, it returns each draw boxed
      // when V8 does not inline it (14 MB more per 1,000-traveller scoring run, measured).
      const c = this.parts[componentIndex(weights, rng.uniform())]!;
      if (c.kind === 'gumbel') out[i] = Math.min(cap, c.location - c.scale * Math.log(rng.exponential()));
      else if (c.kind === 'lomax') out[i] = Math.min(cap, c.location + c.scale * Math.expm1(rng.exponential() / c.shape));
      else out[i] = Math.min(cap, componentSample(c, rng));
    }
  }
}
