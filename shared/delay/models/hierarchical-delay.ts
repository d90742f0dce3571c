// The log posterior, hand-derived gradient and parameter layout shared by the `grouped` and
// `route` delay models (Gumbel or two-component Gumbel mixture), over weighted
// (group, value, count) data, with a point or an interval (rounded-minute) likelihood.
//
// Parameters: every per-group quantity q (location, log-scale, and for mixtures the logit of
// the disrupted weight) has its own non-centred hierarchy
//
//   q[g] = pop + sigmaOrigin * zOrigin[origin(g)] + sigmaDest * zDest[dest(g)] + sigmaGroup * zGroup[g]
//   z ~ Normal(0, 1), sigma ~ HalfNormal(s) (sampled as log sigma, Jacobian included),
//   pop ~ Normal(m, s)
//
// The airport terms are absent in the `grouped` model. Non-centred parameterisation: Papaspiliopoulos,
// Roberts & Sköld (2007), "A general framework for the parametrization of hierarchical models".
// The mixture's disrupted component is Gumbel(location + shift, scale * (1 + e^c)) with shift and c
// shared by every group, so it is always wider than the typical component.
//
// Unconstrained vector: for each hierarchy in the order [location, logScale, logitWeight?]
//   [pop, logSigmaGroup, (logSigmaOrigin, logSigmaDest,) zOrigin[A], zDest[A], zGroup[G]]
// then, for mixtures, [shift, c]. `HierarchyLayout` gives the offsets.
import type { MinibatchModel, Model, WeightedData } from '../../inference/model';

export type HierarchyName = 'location' | 'logScale' | 'logitWeight';

/** Normal prior on the population value, half-normal prior on each hierarchy scale. */
export interface HierarchyPrior {
  readonly popMean: number;
  readonly popSd: number;
  /** Half-normal scale for sigmaGroup and (route model) sigmaOrigin and sigmaDest. */
  readonly sigmaScale: number;
}

export interface MixturePrior {
  /** Normal prior on the disrupted component's location shift, in minutes. */
  readonly shiftMean: number;
  readonly shiftSd: number;
  /** Normal prior on c, where the disrupted scale is the typical scale times 1 + e^c. */
  readonly logExcessMean: number;
  readonly logExcessSd: number;
}

export interface DelayModelPriors {
  readonly location: HierarchyPrior;
  readonly logScale: HierarchyPrior;
  readonly logitWeight: HierarchyPrior;
  readonly mixture: MixturePrior;
}

/**
 * Weakly informative defaults for delays in minutes (our choice, no source): locations within
 * a few hours, typical scales from about a minute to a few hours, a disrupted share from a
 * fraction of a percent to about a half.
 */
export const DEFAULT_DELAY_PRIORS: DelayModelPriors = {
  location: { popMean: 0, popSd: 60, sigmaScale: 30 },
  logScale: { popMean: Math.log(15), popSd: 1.5, sigmaScale: 1 },
  logitWeight: { popMean: -1.5, popSd: 1.5, sigmaScale: 1 },
  mixture: { shiftMean: 30, shiftSd: 60, logExcessMean: 1, logExcessSd: 1.5 },
};

export interface DelayModelOptions {
  readonly mixture?: boolean;
  /**
   * Interval likelihood: each value v stands for the interval (v - h, v + h] with h this
   * half-width (0.5 for delays rounded to the minute). Omitted or 0: the point density.
   */
  readonly intervalHalfWidth?: number;
  readonly priors?: Partial<DelayModelPriors>;
}

/** Airports of each group, for the route model. */
export interface AirportStructure {
  readonly airportCount: number;
  readonly origin: Int32Array;
  readonly destination: Int32Array;
}

export interface HierarchyOffsets {
  readonly pop: number;
  readonly logSigmaGroup: number;
  /** -1 in the grouped model. */
  readonly logSigmaOrigin: number;
  readonly logSigmaDest: number;
  readonly zOrigin: number;
  readonly zDest: number;
  readonly zGroup: number;
}

export interface HierarchyLayout {
  readonly location: HierarchyOffsets;
  readonly logScale: HierarchyOffsets;
  /** Present for mixtures. */
  readonly logitWeight?: HierarchyOffsets;
  /** Offsets of the mixture's shared shift and c; -1 without a mixture. */
  readonly shift: number;
  readonly logExcess: number;
  readonly dim: number;
}

function buildLayout(groupCount: number, airportCount: number, hasAirports: boolean, mixture: boolean): HierarchyLayout {
  let at = 0;
  const one = (): HierarchyOffsets => {
    const pop = at++;
    const logSigmaGroup = at++;
    const logSigmaOrigin = hasAirports ? at++ : -1;
    const logSigmaDest = hasAirports ? at++ : -1;
    const zOrigin = at;
    at += hasAirports ? airportCount : 0;
    const zDest = at;
    at += hasAirports ? airportCount : 0;
    const zGroup = at;
    at += groupCount;
    return { pop, logSigmaGroup, logSigmaOrigin, logSigmaDest, zOrigin, zDest, zGroup };
  };
  const location = one();
  const logScale = one();
  const logitWeight = mixture ? one() : undefined;
  const shift = mixture ? at++ : -1;
  const logExcess = mixture ? at++ : -1;
  return { location, logScale, logitWeight, shift, logExcess, dim: at };
}

function hierarchyNames(prefix: string, offsets: HierarchyOffsets, groupCount: number, airportCount: number, hasAirports: boolean, out: string[]): void {
  out[offsets.pop] = `${prefix}_pop`;
  out[offsets.logSigmaGroup] = `${prefix}_log_sigma_group`;
  if (hasAirports) {
    out[offsets.logSigmaOrigin] = `${prefix}_log_sigma_origin`;
    out[offsets.logSigmaDest] = `${prefix}_log_sigma_dest`;
    for (let a = 0; a < airportCount; a++) {
      out[offsets.zOrigin + a] = `${prefix}_z_origin[${a}]`;
      out[offsets.zDest + a] = `${prefix}_z_dest[${a}]`;
    }
  }
  for (let g = 0; g < groupCount; g++) out[offsets.zGroup + g] = `${prefix}_z_group[${g}]`;
}

/** Constrained parameters of one group under one parameter vector. */
export interface GroupParameters {
  readonly location: number;
  readonly scale: number;
  /** Mixture only: the disrupted component's weight, location and scale. */
  readonly disruptedWeight?: number;
  readonly disruptedLocation?: number;
  readonly disruptedScale?: number;
}

// Likelihood kernels. Each runs over plain typed arrays of (group, value, weight) with the
// per-group constants precomputed, inline and allocation-free: V8 runs these several times
// faster than the same arithmetic behind a helper call or a per-element batch indirection,
// which is why the Gumbel terms are written out in each kernel rather than shared.
//
// Point term, z = (x - m) / b:  log f = -log b - z - e^-z,
//   d/dm = (1 - e^-z) / b,  d/d(log b) = -1 + z (1 - e^-z).
// Interval term over (x - h, x + h], with A = e^-za, B = e^-zb, D = A - B, q = 1 - e^-D:
//   log P = -B + log q,  d/dA = (1 - q) / q,  d/dB = -1 - (1 - q) / q,
//   dA/dm = A / b, dA/d(log b) = A za (likewise for B). This form keeps precision in both tails.

function plainPointKernel(n: number, group: Int32Array, value: Float64Array, weight: Float64Array, loc: Float64Array, inv: Float64Array, logScale: Float64Array, gLoc: Float64Array, gLs: Float64Array): number {
  let lp = 0;
  for (let i = 0; i < n; i++) {
    const w = weight[i]!;
    const g = group[i]!;
    const iv = inv[g]!;
    const z = (value[i]! - loc[g]!) * iv;
    const e = Math.exp(-z);
    lp += w * (-logScale[g]! - z - e);
    gLoc[g]! += w * (1 - e) * iv;
    gLs[g]! += w * (-1 + z * (1 - e));
  }
  return lp;
}

function plainIntervalKernel(n: number, group: Int32Array, value: Float64Array, weight: Float64Array, h: number, loc: Float64Array, inv: Float64Array, gLoc: Float64Array, gLs: Float64Array): number {
  let lp = 0;
  for (let i = 0; i < n; i++) {
    const w = weight[i]!;
    const g = group[i]!;
    const iv = inv[g]!;
    const za = (value[i]! - h - loc[g]!) * iv;
    const zb = za + 2 * h * iv;
    const A = Math.exp(-za);
    const B = Math.exp(-zb);
    const D = A - B;
    // The direct form of 1 - e^-D is exact enough unless the interval is tiny against the scale.
    const q = D > 1e-5 ? 1 - Math.exp(-D) : -Math.expm1(-D);
    const gA = (1 - q) / q;
    const gB = -1 - gA;
    lp += w * (-B + Math.log(q));
    gLoc[g]! += w * (gA * A + gB * B) * iv;
    gLs[g]! += w * (gA * A * za + gB * B * zb);
  }
  return lp;
}

/**
 * Per-group constants of the mixture kernels, 8 per group: typical location, 1/scale, log scale;
 * disrupted location, 1/scale, log scale; log w, log(1 - w) for disrupted weight w.
 */
const MIX_STRIDE = 8;

/** Writes the gradients of the shared shift and log-ratio (before the softplus chain) into out[0], out[1]. */
function mixturePointKernel(n: number, group: Int32Array, value: Float64Array, weight: Float64Array, pre: Float64Array, gLoc: Float64Array, gLs: Float64Array, gEta: Float64Array, out: Float64Array): number {
  let lp = 0;
  let gShift = 0;
  let gRatio = 0;
  for (let i = 0; i < n; i++) {
    const wt = weight[i]!;
    const g = group[i]!;
    const x = value[i]!;
    const o = g * MIX_STRIDE;
    const iv1 = pre[o + 1]!;
    const z1 = (x - pre[o]!) * iv1;
    const e1 = Math.exp(-z1);
    const l1 = pre[o + 7]! - pre[o + 2]! - z1 - e1;
    const iv2 = pre[o + 4]!;
    const z2 = (x - pre[o + 3]!) * iv2;
    const e2 = Math.exp(-z2);
    const l2 = pre[o + 6]! - pre[o + 5]! - z2 - e2;
    // log-sum-exp of the weighted components and the disrupted responsibility r2, with one exp.
    const diff = l2 - l1;
    const t = Math.exp(-Math.abs(diff));
    lp += wt * ((diff > 0 ? l2 : l1) + Math.log1p(t));
    const r2 = diff > 0 ? 1 / (1 + t) : t / (1 + t);
    const r1 = 1 - r2;
    const d2m = (1 - e2) * iv2;
    const d2s = -1 + z2 * (1 - e2);
    gLoc[g]! += wt * (r1 * (1 - e1) * iv1 + r2 * d2m);
    gLs[g]! += wt * (r1 * (-1 + z1 * (1 - e1)) + r2 * d2s);
    gEta[g]! += wt * r2;
    gShift += wt * r2 * d2m;
    gRatio += wt * r2 * d2s;
  }
  out[0] = gShift;
  out[1] = gRatio;
  return lp;
}

function mixtureIntervalKernel(n: number, group: Int32Array, value: Float64Array, weight: Float64Array, h: number, pre: Float64Array, gLoc: Float64Array, gLs: Float64Array, gEta: Float64Array, out: Float64Array): number {
  let lp = 0;
  let gShift = 0;
  let gRatio = 0;
  for (let i = 0; i < n; i++) {
    const wt = weight[i]!;
    const g = group[i]!;
    const x = value[i]!;
    const o = g * MIX_STRIDE;
    const iv1 = pre[o + 1]!;
    const za1 = (x - h - pre[o]!) * iv1;
    const zb1 = za1 + 2 * h * iv1;
    const A1 = Math.exp(-za1);
    const B1 = Math.exp(-zb1);
    const D1 = A1 - B1;
    const q1 = D1 > 1e-5 ? 1 - Math.exp(-D1) : -Math.expm1(-D1);
    const gA1 = (1 - q1) / q1;
    const gB1 = -1 - gA1;
    const l1 = pre[o + 7]! - B1 + Math.log(q1);
    const iv2 = pre[o + 4]!;
    const za2 = (x - h - pre[o + 3]!) * iv2;
    const zb2 = za2 + 2 * h * iv2;
    const A2 = Math.exp(-za2);
    const B2 = Math.exp(-zb2);
    const D2 = A2 - B2;
    const q2 = D2 > 1e-5 ? 1 - Math.exp(-D2) : -Math.expm1(-D2);
    const gA2 = (1 - q2) / q2;
    const gB2 = -1 - gA2;
    const l2 = pre[o + 6]! - B2 + Math.log(q2);
    const diff = l2 - l1;
    const t = Math.exp(-Math.abs(diff));
    lp += wt * ((diff > 0 ? l2 : l1) + Math.log1p(t));
    const r2 = diff > 0 ? 1 / (1 + t) : t / (1 + t);
    const r1 = 1 - r2;
    const d2m = (gA2 * A2 + gB2 * B2) * iv2;
    const d2s = gA2 * A2 * za2 + gB2 * B2 * zb2;
    gLoc[g]! += wt * (r1 * (gA1 * A1 + gB1 * B1) * iv1 + r2 * d2m);
    gLs[g]! += wt * (r1 * (gA1 * A1 * za1 + gB1 * B1 * zb1) + r2 * d2s);
    gEta[g]! += wt * r2;
    gShift += wt * r2 * d2m;
    gRatio += wt * r2 * d2s;
  }
  out[0] = gShift;
  out[1] = gRatio;
  return lp;
}

function completePriors(p: Partial<DelayModelPriors> | undefined): DelayModelPriors {
  return { ...DEFAULT_DELAY_PRIORS, ...(p ?? {}) };
}

function checkData(data: WeightedData, airports: AirportStructure | null, h: number): void {
  const n = data.group.length;
  if (!(data.groupCount >= 1) || !Number.isInteger(data.groupCount)) throw new RangeError(`groupCount must be a whole number >= 1, got ${data.groupCount}`);
  if (data.value.length !== n || data.count.length !== n) throw new RangeError('group, value and count must have the same length');
  for (let i = 0; i < n; i++) {
    const g = data.group[i]!;
    if (!(g >= 0 && g < data.groupCount)) throw new RangeError(`data unit ${i} has group ${g}, outside [0, ${data.groupCount})`);
    if (!Number.isFinite(data.value[i]!)) throw new RangeError(`data unit ${i} has a non-finite value ${data.value[i]}`);
    const c = data.count[i]!;
    if (!(c >= 0) || !Number.isFinite(c)) throw new RangeError(`data unit ${i} has an invalid count ${c}`);
  }
  if (!(h >= 0) || !Number.isFinite(h)) throw new RangeError(`intervalHalfWidth must be finite and >= 0, got ${h}`);
  if (airports) {
    if (!(airports.airportCount >= 1)) throw new RangeError(`airportCount must be >= 1, got ${airports.airportCount}`);
    if (airports.origin.length !== data.groupCount || airports.destination.length !== data.groupCount) {
      throw new RangeError(`origin and destination need one entry per route (${data.groupCount})`);
    }
    for (let g = 0; g < data.groupCount; g++) {
      const o = airports.origin[g]!;
      const d = airports.destination[g]!;
      if (!(o >= 0 && o < airports.airportCount) || !(d >= 0 && d < airports.airportCount)) {
        throw new RangeError(`route ${g} has an airport index outside [0, ${airports.airportCount})`);
      }
    }
  }
}

/**
 * The shared engine. Construct it through createGroupedModel / createRouteModel (models/grouped.ts,
 * models/route.ts), which document the user-facing layout.
 */
export class HierarchicalDelayModel implements Model {
  readonly dim: number;
  readonly names: readonly string[];
  readonly layout: HierarchyLayout;
  readonly mixture: boolean;
  readonly groupCount: number;
  readonly airportCount: number;
  readonly intervalHalfWidth: number;
  readonly priors: DelayModelPriors;
  readonly minibatch: MinibatchModel;
  /** Total count over all units (the number of flights). */
  readonly totalCount: number;
  /** Total count per group. */
  readonly groupCounts: Float64Array;

  private readonly hasAirports: boolean;
  private readonly origin: Int32Array;
  private readonly destination: Int32Array;
  private readonly hier: HierarchyOffsets[];
  private readonly hierPriors: HierarchyPrior[];
  // Per-hierarchy per-group values and their accumulated gradients, reused across calls.
  private readonly groupValue: Float64Array[];
  private readonly groupGrad: Float64Array[];
  private readonly sigma = new Float64Array(9);
  // Mixture scalars accumulated in the hot loop.
  private gradShift = 0;
  private gradLogExcess = 0;
  private readonly mixturePre: Float64Array;
  private readonly invScale: Float64Array;
  private readonly mixtureScalars = new Float64Array(2);
  private readonly groupWeightSum: Float64Array;
  private batchGroup = new Int32Array(0);
  private batchValue = new Float64Array(0);
  private batchWeight = new Float64Array(0);

  constructor(
    readonly data: WeightedData,
    airports: AirportStructure | null,
    options: DelayModelOptions = {},
  ) {
    const h = options.intervalHalfWidth ?? 0;
    checkData(data, airports, h);
    this.mixture = options.mixture ?? false;
    this.intervalHalfWidth = h;
    this.priors = completePriors(options.priors);
    this.groupCount = data.groupCount;
    this.hasAirports = airports !== null;
    this.airportCount = airports?.airportCount ?? 0;
    this.origin = airports?.origin ?? new Int32Array(0);
    this.destination = airports?.destination ?? new Int32Array(0);
    this.layout = buildLayout(this.groupCount, this.airportCount, this.hasAirports, this.mixture);
    this.dim = this.layout.dim;
    this.hier = [this.layout.location, this.layout.logScale];
    this.hierPriors = [this.priors.location, this.priors.logScale];
    if (this.layout.logitWeight) {
      this.hier.push(this.layout.logitWeight);
      this.hierPriors.push(this.priors.logitWeight);
    }
    const names: string[] = new Array<string>(this.dim);
    const prefixes = ['location', 'log_scale', 'logit_weight'];
    this.hier.forEach((off, k) => hierarchyNames(prefixes[k]!, off, this.groupCount, this.airportCount, this.hasAirports, names));
    if (this.mixture) {
      names[this.layout.shift] = 'disrupted_shift';
      names[this.layout.logExcess] = 'disrupted_log_excess';
    }
    this.names = names;
    this.groupValue = this.hier.map(() => new Float64Array(this.groupCount));
    this.groupGrad = this.hier.map(() => new Float64Array(this.groupCount));
    this.mixturePre = new Float64Array(this.mixture ? this.groupCount * MIX_STRIDE : 0);
    this.invScale = new Float64Array(this.groupCount);
    this.groupWeightSum = new Float64Array(this.groupCount);
    let total = 0;
    for (let i = 0; i < data.count.length; i++) total += data.count[i]!;
    this.totalCount = total;
    this.groupCounts = new Float64Array(this.groupCount);
    for (let i = 0; i < data.count.length; i++) this.groupCounts[data.group[i]!]! += data.count[i]!;
    const units = data.group.length;
    this.minibatch = {
      units,
      unitWeights: data.count,
      logDensityGradBatch: (theta, grad, batch, batchLength, scale, elementScale) => this.evaluate(theta, grad, batch, batchLength, scale, elementScale),
    };
  }

  logDensityGrad(theta: Float64Array, grad: Float64Array): number {
    return this.evaluate(theta, grad, null, this.data.group.length, 1, undefined);
  }

  /** Log density without a gradient (allocates a scratch gradient; not for hot loops). */
  logDensity(theta: Float64Array): number {
    return this.logDensityGrad(theta, new Float64Array(this.dim));
  }

  /**
   * The hierarchy's value for a group, from the parameter vector (no data needed). For groups
   * outside the data pass `group = -1` and supply the standard-normal draws that stand for the
   * unknown random effects in `fresh` (zGroup, and zOrigin / zDest where the airport index is -1).
   */
  hierarchyValue(theta: Float64Array, which: HierarchyName, group: number, origin = -1, dest = -1, fresh?: { zGroup: number; zOrigin: number; zDest: number }): number {
    const off = which === 'location' ? this.layout.location : which === 'logScale' ? this.layout.logScale : this.layout.logitWeight;
    if (!off) throw new RangeError(`this model has no ${which} hierarchy`);
    let v = theta[off.pop]!;
    const zg = group >= 0 ? theta[off.zGroup + group]! : (fresh?.zGroup ?? 0);
    v += Math.exp(theta[off.logSigmaGroup]!) * zg;
    if (this.hasAirports) {
      const o = group >= 0 ? this.origin[group]! : origin;
      const d = group >= 0 ? this.destination[group]! : dest;
      const zo = o >= 0 ? theta[off.zOrigin + o]! : (fresh?.zOrigin ?? 0);
      const zd = d >= 0 ? theta[off.zDest + d]! : (fresh?.zDest ?? 0);
      v += Math.exp(theta[off.logSigmaOrigin]!) * zo + Math.exp(theta[off.logSigmaDest]!) * zd;
    }
    return v;
  }

  /** Constrained parameters from the three hierarchy values (location, log-scale, logit-weight). */
  constrain(theta: Float64Array, location: number, logScale: number, logitWeight: number): GroupParameters {
    const scale = Math.exp(logScale);
    if (!this.mixture) return { location, scale };
    const w = 1 / (1 + Math.exp(-logitWeight));
    return {
      location,
      scale,
      disruptedWeight: w,
      disruptedLocation: location + theta[this.layout.shift]!,
      disruptedScale: scale * (1 + Math.exp(theta[this.layout.logExcess]!)),
    };
  }

  /** Constrained parameters of a group in the data. */
  groupParameters(theta: Float64Array, group: number): GroupParameters {
    if (!(group >= 0 && group < this.groupCount)) throw new RangeError(`group ${group} is outside [0, ${this.groupCount})`);
    return this.constrain(
      theta,
      this.hierarchyValue(theta, 'location', group),
      this.hierarchyValue(theta, 'logScale', group),
      this.mixture ? this.hierarchyValue(theta, 'logitWeight', group) : 0,
    );
  }

  /**
   * Approximate diagonal of -∇² log p: per-group expected Fisher information of each
   * hierarchy's value, pushed through the non-centred maps, plus the priors' curvature.
   * Per observation: Gumbel location 1/b², log-scale π²/6 + (1 - γ)² ≈ 1.8237 (from the
   * Gumbel Fisher information matrix), logit weight w(1 - w) (the value for fully separated
   * components, an upper bound); mixture components contribute in proportion to their weight.
   */
  curvatureDiagonal(theta: Float64Array, out: Float64Array): void {
    out.fill(0);
    const G = this.groupCount;
    const n = this.groupCounts;
    const info = this.groupGrad.map(() => new Float64Array(G));
    const ratio = this.mixture ? 1 + Math.exp(theta[this.layout.logExcess]!) : 1;
    let infoShift = 0;
    let infoExcess = 0;
    const sc = this.mixture ? 1 / (1 + Math.exp(-theta[this.layout.logExcess]!)) : 0;
    for (let g = 0; g < G; g++) {
      const b = Math.exp(this.hierarchyValue(theta, 'logScale', g));
      const w = this.mixture ? 1 / (1 + Math.exp(-this.hierarchyValue(theta, 'logitWeight', g))) : 0;
      const ng = n[g]!;
      info[0]![g] = ng * ((1 - w) / (b * b) + w / (b * b * ratio * ratio));
      info[1]![g] = ng * 1.8237;
      if (this.mixture) {
        info[2]![g] = ng * w * (1 - w);
        infoShift += (ng * w) / (b * b * ratio * ratio);
        infoExcess += ng * w * 1.8237 * sc * sc;
      }
    }
    for (let k = 0; k < this.hier.length; k++) {
      const off = this.hier[k]!;
      const pr = this.hierPriors[k]!;
      const inf = info[k]!;
      const sg = Math.exp(theta[off.logSigmaGroup]!);
      let total = 0;
      let sigmaGroupCurv = 0;
      for (let g = 0; g < G; g++) {
        total += inf[g]!;
        const zg = theta[off.zGroup + g]!;
        out[off.zGroup + g] = 1 + sg * sg * inf[g]!;
        sigmaGroupCurv += sg * sg * zg * zg * inf[g]!;
      }
      out[off.pop] = 1 / (pr.popSd * pr.popSd) + total;
      // Prior on log sigma: -e^{2u}/(2 s^2) + u has curvature e^{2u}/s^2 · 2.
      out[off.logSigmaGroup] = sigmaGroupCurv + (2 * sg * sg) / (pr.sigmaScale * pr.sigmaScale) + 1e-3;
      if (this.hasAirports) {
        const so = Math.exp(theta[off.logSigmaOrigin]!);
        const sd = Math.exp(theta[off.logSigmaDest]!);
        let cO = 0;
        let cD = 0;
        for (let a = 0; a < this.airportCount; a++) {
          out[off.zOrigin + a] = 1;
          out[off.zDest + a] = 1;
        }
        for (let g = 0; g < G; g++) {
          const io = off.zOrigin + this.origin[g]!;
          const id = off.zDest + this.destination[g]!;
          out[io]! += so * so * inf[g]!;
          out[id]! += sd * sd * inf[g]!;
          cO += (so * theta[io]!) ** 2 * inf[g]!;
          cD += (sd * theta[id]!) ** 2 * inf[g]!;
        }
        out[off.logSigmaOrigin] = cO + (2 * so * so) / (pr.sigmaScale * pr.sigmaScale) + 1e-3;
        out[off.logSigmaDest] = cD + (2 * sd * sd) / (pr.sigmaScale * pr.sigmaScale) + 1e-3;
      }
    }
    if (this.mixture) {
      const mp = this.priors.mixture;
      out[this.layout.shift] = 1 / (mp.shiftSd * mp.shiftSd) + infoShift;
      out[this.layout.logExcess] = 1 / (mp.logExcessSd * mp.logExcessSd) + infoExcess;
    }
  }

  /** A good starting point: robust per-group Gumbel fits from weighted quartiles, random effects in zGroup. */
  initialPoint(out: Float64Array): void {
    out.fill(0);
    const { group, value, count } = this.data;
    const G = this.groupCount;
    const order = Array.from({ length: group.length }, (_, i) => i);
    order.sort((a, b) => group[a]! - group[b]! || value[a]! - value[b]!);
    const q1 = new Float64Array(G).fill(NaN);
    const q2 = new Float64Array(G).fill(NaN);
    const q3 = new Float64Array(G).fill(NaN);
    const tot = new Float64Array(G);
    for (let i = 0; i < group.length; i++) tot[group[i]!]! += count[i]!;
    const cum = new Float64Array(G);
    for (const i of order) {
      const g = group[i]!;
      const before = cum[g]!;
      cum[g] = before + count[i]!;
      const t = tot[g]!;
      if (before < 0.25 * t && cum[g]! >= 0.25 * t) q1[g] = value[i]!;
      if (before < 0.5 * t && cum[g]! >= 0.5 * t) q2[g] = value[i]!;
      if (before < 0.75 * t && cum[g]! >= 0.75 * t) q3[g] = value[i]!;
    }
    // Gumbel quartile spread is 1.5725 beta and its median mu + 0.3665 beta (from the quantile function).
    const loc = new Float64Array(G).fill(NaN);
    const ls = new Float64Array(G).fill(NaN);
    for (let g = 0; g < G; g++) {
      if (!(tot[g]! > 0) || Number.isNaN(q1[g]!)) continue;
      const beta = Math.max((q3[g]! - q1[g]!) / 1.5725, 1 + this.intervalHalfWidth);
      ls[g] = Math.log(beta);
      loc[g] = q2[g]! - 0.3665 * beta;
    }
    const setHierarchy = (off: HierarchyOffsets, vals: Float64Array, fallback: number, sigma0: number): void => {
      let s = 0;
      let n = 0;
      for (let g = 0; g < G; g++) if (Number.isFinite(vals[g]!)) { s += vals[g]!; n++; }
      const pop = n > 0 ? s / n : fallback;
      let ss = 0;
      for (let g = 0; g < G; g++) if (Number.isFinite(vals[g]!)) ss += (vals[g]! - pop) ** 2;
      const sigma = n > 1 ? Math.max(Math.sqrt(ss / (n - 1)), sigma0 * 0.05) : sigma0;
      out[off.pop] = pop;
      out[off.logSigmaGroup] = Math.log(sigma);
      if (this.hasAirports) {
        out[off.logSigmaOrigin] = Math.log(sigma * 0.5);
        out[off.logSigmaDest] = Math.log(sigma * 0.5);
      }
      for (let g = 0; g < G; g++) {
        const z = Number.isFinite(vals[g]!) ? (vals[g]! - pop) / sigma : 0;
        out[off.zGroup + g] = Math.max(-4, Math.min(4, z));
      }
    };
    setHierarchy(this.layout.location, loc, this.priors.location.popMean, this.priors.location.sigmaScale);
    setHierarchy(this.layout.logScale, ls, this.priors.logScale.popMean, this.priors.logScale.sigmaScale);
    if (this.layout.logitWeight) {
      const w = new Float64Array(G).fill(this.priors.logitWeight.popMean);
      setHierarchy(this.layout.logitWeight, w, this.priors.logitWeight.popMean, this.priors.logitWeight.sigmaScale);
      out[this.layout.shift] = this.priors.mixture.shiftMean;
      out[this.layout.logExcess] = this.priors.mixture.logExcessMean;
    }
  }

  /**
   * Log density and gradient. `batch === null` means every unit with weight `count`;
   * otherwise units batch[0..batchLength), each weighted `scale * count`, or
   * `elementScale[k]` (count not applied) when elementScale is given.
   */
  private evaluate(theta: Float64Array, grad: Float64Array, batch: Int32Array | null, batchLength: number, scale: number, elementScale: Float64Array | undefined): number {
    grad.fill(0);
    let lp = this.priorsAndGroupValues(theta, grad);
    if (!Number.isFinite(lp)) return lp;
    let group = this.data.group;
    let value = this.data.value;
    let weight = this.data.count;
    let n = group.length;
    if (batch !== null) {
      // Gather the batch into contiguous scratch arrays so the kernels stay monomorphic.
      if (this.batchGroup.length < batchLength) {
        this.batchGroup = new Int32Array(batchLength);
        this.batchValue = new Float64Array(batchLength);
        this.batchWeight = new Float64Array(batchLength);
      }
      const cnt = this.data.count;
      for (let k = 0; k < batchLength; k++) {
        const i = batch[k]!;
        this.batchGroup[k] = this.data.group[i]!;
        this.batchValue[k] = this.data.value[i]!;
        this.batchWeight[k] = elementScale ? elementScale[k]! : scale * cnt[i]!;
      }
      group = this.batchGroup;
      value = this.batchValue;
      weight = this.batchWeight;
      n = batchLength;
    }
    lp += this.mixture ? this.mixtureLikelihood(theta, n, group, value, weight) : this.plainLikelihood(n, group, value, weight);
    this.backpropagate(theta, grad);
    return lp;
  }

  /** Prior terms (with log-Jacobians), per-group hierarchy values, and zeroed per-group gradients. */
  private priorsAndGroupValues(theta: Float64Array, grad: Float64Array): number {
    let lp = 0;
    const G = this.groupCount;
    for (let k = 0; k < this.hier.length; k++) {
      const off = this.hier[k]!;
      const pr = this.hierPriors[k]!;
      const pop = theta[off.pop]!;
      const dz = (pop - pr.popMean) / pr.popSd;
      lp -= 0.5 * dz * dz;
      grad[off.pop]! -= dz / pr.popSd;
      const sigmaIdx = this.hasAirports ? [off.logSigmaGroup, off.logSigmaOrigin, off.logSigmaDest] : [off.logSigmaGroup];
      for (let j = 0; j < sigmaIdx.length; j++) {
        const u = theta[sigmaIdx[j]!]!;
        const s = Math.exp(u);
        this.sigma[k * 3 + j] = s;
        // Half-normal on sigma plus the log-Jacobian u of sigma = e^u.
        const t = s / pr.sigmaScale;
        lp += -0.5 * t * t + u;
        grad[sigmaIdx[j]!]! += -t * t + 1;
      }
      const zEnd = off.zGroup + G;
      for (let i = off.zOrigin; i < zEnd; i++) {
        const z = theta[i]!;
        lp -= 0.5 * z * z;
        grad[i]! -= z;
      }
      const vals = this.groupValue[k]!;
      const sg = this.sigma[k * 3]!;
      if (this.hasAirports) {
        const so = this.sigma[k * 3 + 1]!;
        const sd = this.sigma[k * 3 + 2]!;
        for (let g = 0; g < G; g++) {
          vals[g] = pop + sg * theta[off.zGroup + g]! + so * theta[off.zOrigin + this.origin[g]!]! + sd * theta[off.zDest + this.destination[g]!]!;
        }
      } else {
        for (let g = 0; g < G; g++) vals[g] = pop + sg * theta[off.zGroup + g]!;
      }
      this.groupGrad[k]!.fill(0);
    }
    if (this.mixture) {
      const mp = this.priors.mixture;
      const a = (theta[this.layout.shift]! - mp.shiftMean) / mp.shiftSd;
      const c = (theta[this.layout.logExcess]! - mp.logExcessMean) / mp.logExcessSd;
      lp -= 0.5 * (a * a + c * c);
      grad[this.layout.shift]! -= a / mp.shiftSd;
      grad[this.layout.logExcess]! -= c / mp.logExcessSd;
    }
    return lp;
  }

  private plainLikelihood(n: number, group: Int32Array, value: Float64Array, weight: Float64Array): number {
    const loc = this.groupValue[0]!;
    const logScale = this.groupValue[1]!;
    const inv = this.invScale;
    for (let g = 0; g < this.groupCount; g++) inv[g] = Math.exp(-logScale[g]!);
    const h = this.intervalHalfWidth;
    return h > 0
      ? plainIntervalKernel(n, group, value, weight, h, loc, inv, this.groupGrad[0]!, this.groupGrad[1]!)
      : plainPointKernel(n, group, value, weight, loc, inv, logScale, this.groupGrad[0]!, this.groupGrad[1]!);
  }

  private mixtureLikelihood(theta: Float64Array, n: number, group: Int32Array, value: Float64Array, weight: Float64Array): number {
    const G = this.groupCount;
    const loc = this.groupValue[0]!;
    const logScale = this.groupValue[1]!;
    const logitW = this.groupValue[2]!;
    const shift = theta[this.layout.shift]!;
    const c = theta[this.layout.logExcess]!;
    // log(1 + e^c), computed without overflow, and its derivative sigmoid(c).
    const logRatio = c > 0 ? c + Math.log1p(Math.exp(-c)) : Math.log1p(Math.exp(c));
    const dLogRatio = 1 / (1 + Math.exp(-c));
    const pre = this.mixturePre;
    for (let g = 0; g < G; g++) {
      const ls = logScale[g]!;
      const eta = logitW[g]!;
      // log w and log(1 - w) for w = sigmoid(eta), stable for large |eta|.
      const logW = eta >= 0 ? -Math.log1p(Math.exp(-eta)) : eta - Math.log1p(Math.exp(eta));
      const o = g * MIX_STRIDE;
      pre[o] = loc[g]!;
      pre[o + 1] = Math.exp(-ls);
      pre[o + 2] = ls;
      pre[o + 3] = loc[g]! + shift;
      pre[o + 4] = Math.exp(-(ls + logRatio));
      pre[o + 5] = ls + logRatio;
      pre[o + 6] = logW;
      pre[o + 7] = logW - eta;
    }
    const h = this.intervalHalfWidth;
    const gEta = this.groupGrad[2]!;
    const out = this.mixtureScalars;
    const lp = h > 0
      ? mixtureIntervalKernel(n, group, value, weight, h, pre, this.groupGrad[0]!, this.groupGrad[1]!, gEta, out)
      : mixturePointKernel(n, group, value, weight, pre, this.groupGrad[0]!, this.groupGrad[1]!, gEta, out);
    // The kernels accumulate sum(weight * r2); d/d(eta) of log(1-w) and log w adds -sum(weight) * w.
    const wsum = this.groupWeightSum;
    wsum.fill(0);
    for (let i = 0; i < n; i++) wsum[group[i]!]! += weight[i]!;
    for (let g = 0; g < G; g++) gEta[g]! -= wsum[g]! * Math.exp(pre[g * MIX_STRIDE + 6]!);
    this.gradShift = out[0]!;
    this.gradLogExcess = out[1]! * dLogRatio;
    return lp;
  }

  /** Chain rule from per-group gradients to the hierarchy's coordinates. */
  private backpropagate(theta: Float64Array, grad: Float64Array): void {
    const G = this.groupCount;
    for (let k = 0; k < this.hier.length; k++) {
      const off = this.hier[k]!;
      const gv = this.groupGrad[k]!;
      const sg = this.sigma[k * 3]!;
      let gPop = 0;
      let gSg = 0;
      let gSo = 0;
      let gSd = 0;
      const so = this.sigma[k * 3 + 1]!;
      const sd = this.sigma[k * 3 + 2]!;
      for (let g = 0; g < G; g++) {
        const d = gv[g]!;
        if (d === 0) continue;
        gPop += d;
        const zg = theta[off.zGroup + g]!;
        gSg += d * zg;
        grad[off.zGroup + g]! += d * sg;
        if (this.hasAirports) {
          const io = off.zOrigin + this.origin[g]!;
          const id = off.zDest + this.destination[g]!;
          gSo += d * theta[io]!;
          gSd += d * theta[id]!;
          grad[io]! += d * so;
          grad[id]! += d * sd;
        }
      }
      grad[off.pop]! += gPop;
      // d/d(log sigma) = sigma * d/d sigma.
      grad[off.logSigmaGroup]! += gSg * sg;
      if (this.hasAirports) {
        grad[off.logSigmaOrigin]! += gSo * so;
        grad[off.logSigmaDest]! += gSd * sd;
      }
    }
    if (this.mixture) {
      grad[this.layout.shift]! += this.gradShift;
      grad[this.layout.logExcess]! += this.gradLogExcess;
    }
  }
}
