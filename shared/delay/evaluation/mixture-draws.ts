// Mixtures of predictive draw sets: e.g. a route's predictive over the months of a held-out
// set, weighted by how many of its held-out flights fell in each month.
import type { Rng } from '../../inference/rng';
import type { DelayDistribution } from '../predictive';
import type { DrawSet } from './scores';

class MixtureDistribution implements DelayDistribution {
  constructor(
    private readonly parts: readonly DelayDistribution[],
    private readonly weights: Float64Array,
  ) {}
  cdf(x: number): number {
    let s = 0;
    for (let i = 0; i < this.parts.length; i++) s += this.weights[i]! * this.parts[i]!.cdf(x);
    return s;
  }
  survival(x: number): number {
    let s = 0;
    for (let i = 0; i < this.parts.length; i++) s += this.weights[i]! * this.parts[i]!.survival(x);
    return s;
  }
  pdf(x: number): number {
    let s = 0;
    for (let i = 0; i < this.parts.length; i++) s += this.weights[i]! * this.parts[i]!.pdf(x);
    return s;
  }
  logPdf(x: number): number {
    const logs = this.parts.map((d, i) => Math.log(this.weights[i]!) + (d.logPdf ? d.logPdf(x) : Math.log(d.pdf(x))));
    const top = Math.max(...logs);
    if (top === -Infinity) return -Infinity;
    return top + Math.log(logs.reduce((a, l) => a + Math.exp(l - top), 0));
  }
  sample(rng: Rng): number {
    let u = rng.uniform();
    for (let i = 0; i < this.parts.length - 1; i++) {
      u -= this.weights[i]!;
      if (u < 0) return this.parts[i]!.sample(rng);
    }
    return this.parts[this.parts.length - 1]!.sample(rng);
  }
}

/**
 * Draw s of the mixture is the weighted mixture of draw s of each set. Weights must be
 * non-negative with a positive sum (they are normalised); every set needs the same draw count.
 */
export function mixDrawSets(sets: readonly DrawSet[], weights: readonly number[]): DrawSet {
  if (sets.length === 0 || sets.length !== weights.length) throw new RangeError('mixDrawSets needs one weight per draw set, and at least one set');
  const total = weights.reduce((a, w) => a + w, 0);
  if (!(total > 0) || weights.some((w) => !(w >= 0))) throw new RangeError('mixture weights must be non-negative with a positive sum');
  const drawCount = sets[0]!.drawCount;
  if (sets.some((s) => s.drawCount !== drawCount)) throw new RangeError('every draw set in a mixture must have the same number of draws');
  if (sets.length === 1) return sets[0]!;
  const w = Float64Array.from(weights, (x) => x / total);
  return { drawCount, draw: (s) => new MixtureDistribution(sets.map((set) => set.draw(s)), w) };
}
