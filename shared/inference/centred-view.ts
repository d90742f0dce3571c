// A centred view of a model written in non-centred form, for samplers.
//
// A non-centred block q[g] = pop + e^logSigma * z[g] samples well when each group has little
// data; with many observations per group (delay data: thousands of flights per route) the
// posterior of (logSigma, z) becomes a narrow curved ridge and NUTS needs tiny steps. The
// centred coordinates c[g] = pop + e^logSigma * z[g] turn that ridge into a near-Gaussian
// (Papaspiliopoulos, Roberts & Sköld, "A general framework for the parametrization of
// hierarchical models", Statistical Science 22, 2007; Betancourt & Girolami, "Hamiltonian
// Monte Carlo for hierarchical models", 2015).
//
// Density change of variables: z = (c - pop) e^-logSigma, so
//   log p_c(pop, logSigma, c) = log p(pop, logSigma, z(c)) - K * logSigma
// for K centred z's in the block.
import type { Model } from './model';

/**
 * One non-centred block: coordinates of pop and logSigma, and the z coordinates to centre.
 * Centring only some of a hierarchy's z's (the data-rich groups) is allowed: the rest keep
 * the non-centred form that suits weakly informed groups.
 */
export interface NonCentredBlock {
  readonly pop: number;
  readonly logSigma: number;
  readonly z: readonly number[];
}

export interface CentredView {
  /** The same posterior over centred coordinates (same dim; names with `_centred` on the block entries). */
  readonly model: Model;
  /** Centred coordinates to the original model's (may be the same array). */
  toOriginal(centred: Float64Array, out: Float64Array): void;
  /** Original coordinates to centred ones. */
  toCentred(original: Float64Array, out: Float64Array): void;
}

function checkBlocks(model: Model, blocks: readonly NonCentredBlock[]): void {
  const used = new Set<number>();
  const claim = (i: number) => {
    if (!(Number.isInteger(i) && i >= 0 && i < model.dim) || used.has(i)) throw new RangeError(`centred view: coordinate ${i} is outside the model or used twice`);
    used.add(i);
  };
  for (const b of blocks) {
    if (b.z.length === 0) throw new RangeError('centred view: a block needs at least one z coordinate');
    claim(b.pop);
    claim(b.logSigma);
    for (const i of b.z) claim(i);
  }
}

/**
 * Wraps `model` so that every listed block is sampled in centred coordinates. Throws
 * RangeError when blocks overlap or leave the model's coordinates.
 */
export function centredView(model: Model, blocks: readonly NonCentredBlock[]): CentredView {
  checkBlocks(model, blocks);
  const dim = model.dim;
  const original = new Float64Array(dim);
  const grad = new Float64Array(dim);
  const names = model.names.slice();
  for (const b of blocks) for (const i of b.z) names[i] = `${names[i]}_centred`;

  const toOriginal = (c: Float64Array, out: Float64Array) => {
    if (out !== c) out.set(c);
    for (const b of blocks) {
      const inv = Math.exp(-c[b.logSigma]!);
      const pop = c[b.pop]!;
      for (const i of b.z) out[i] = (c[i]! - pop) * inv;
    }
  };
  const toCentred = (t: Float64Array, out: Float64Array) => {
    if (out !== t) out.set(t);
    for (const b of blocks) {
      const sigma = Math.exp(t[b.logSigma]!);
      const pop = t[b.pop]!;
      for (const i of b.z) out[i] = pop + sigma * t[i]!;
    }
  };

  const logDensityGrad = (c: Float64Array, out: Float64Array): number => {
    toOriginal(c, original);
    let lp = model.logDensityGrad(original, grad);
    out.set(grad);
    for (const b of blocks) {
      const logSigma = c[b.logSigma]!;
      const inv = Math.exp(-logSigma);
      let popGrad = 0;
      let sigmaGrad = -b.z.length;
      for (const i of b.z) {
        const gz = grad[i]!;
        out[i] = gz * inv;
        popGrad -= gz * inv;
        sigmaGrad -= gz * original[i]!;
      }
      out[b.pop] = out[b.pop]! + popGrad;
      out[b.logSigma] = out[b.logSigma]! + sigmaGrad;
      lp -= b.z.length * logSigma;
    }
    return lp;
  };
  const start = model.initialPoint?.bind(model);
  const view: Model = start
    ? {
        dim,
        names,
        logDensityGrad,
        initialPoint(out: Float64Array) {
          start(original);
          toCentred(original, out);
        },
      }
    : { dim, names, logDensityGrad };
  return { model: view, toOriginal, toCentred };
}

/** The blocks of a hierarchical model whose per-group terms hang off the population value alone. */
export interface GroupHierarchyOffsets {
  readonly pop: number;
  readonly logSigmaGroup: number;
  /** -1 when the block has airport terms between pop and the group (the route model). */
  readonly logSigmaOrigin: number;
  readonly zGroup: number;
}

/**
 * Blocks of the grouped delay model's layout (location, log-scale, logit-weight hierarchies)
 * for a centred view: all of them when every group has at least `minObservations`
 * observations (`observations[g]`), none otherwise. Centring only the data-rich groups of a
 * mixed data set sampled worse than either pure form in our trials, so it is all or nothing.
 * Route-model hierarchies, whose groups also hang off airport effects, are skipped: their
 * centre is not a single coordinate.
 */
export function groupHierarchyBlocks(hierarchies: readonly (GroupHierarchyOffsets | undefined)[], observations: ArrayLike<number>, minObservations = CENTRE_MIN_OBSERVATIONS): NonCentredBlock[] {
  const groups = observations.length;
  for (let g = 0; g < groups; g++) if (!(observations[g]! >= minObservations)) return [];
  const blocks: NonCentredBlock[] = [];
  for (const h of hierarchies) {
    if (h && h.logSigmaOrigin === -1 && groups > 0) blocks.push({ pop: h.pop, logSigma: h.logSigmaGroup, z: Array.from({ length: groups }, (_, g) => h.zGroup + g) });
  }
  return blocks;
}

/**
 * Observations from which a group's own data outweighs the hierarchy, so centring pays
 * (our threshold, from trials on the grouped Gumbel model: more divergences below it when
 * centred, far smaller steps above it when left non-centred; no source).
 */
export const CENTRE_MIN_OBSERVATIONS = 20;

/** Observations per group of weighted data (the sum of counts). */
export function observationsPerGroup(data: { readonly groupCount: number; readonly group: Int32Array; readonly count: Float64Array }): Float64Array {
  const n = new Float64Array(data.groupCount);
  for (let i = 0; i < data.group.length; i++) n[data.group[i]!] = n[data.group[i]!]! + data.count[i]!;
  return n;
}
