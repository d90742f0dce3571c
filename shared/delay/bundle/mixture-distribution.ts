// The predictive delay distribution of one posterior draw of a tail-mixture route model.
//
// A typical Gumbel plus, for the mixture families, a disrupted Gumbel or Student-t with
// weight w; an optional shift moves the whole distribution (departure delays derived from
// arrival delays add the en-route recovery offset).
import type { Rng } from '../../inference/rng';
import { gumbelCdf, gumbelPdf, gumbelSample, gumbelSurvival } from '../gumbel';
import type { TailFamily } from '../models/tail-mixture';
import { logGamma, studentTCdf, studentTSample, studentTSurvival } from '../models/student-t';
import type { DelayDistribution } from '../predictive';

export class TailMixtureDistribution implements DelayDistribution {
  private readonly mu: number;
  private readonly beta: number;
  private readonly w: number;
  private readonly loc2: number;
  private readonly scale2: number;
  private readonly alpha: number;
  /** log of the Student-t density's constant, computed once: pdf is the hot call in scoring. */
  private readonly tLogConstant: number;

  /** eta holds the family's unconstrained parameters (see FAMILY_PARAMETERS). */
  constructor(
    readonly family: TailFamily,
    eta: ArrayLike<number>,
    readonly df: number,
    readonly shiftMinutes = 0,
  ) {
    this.mu = eta[0]! + shiftMinutes;
    this.beta = Math.exp(eta[1]!);
    if (family === 'gumbel') {
      this.w = 0;
      this.loc2 = NaN;
      this.scale2 = NaN;
      this.alpha = NaN;
      this.tLogConstant = NaN;
    } else {
      this.w = 1 / (1 + Math.exp(-eta[4]!));
      if (family === 'gumbel-lomax') {
        // Lomax: loc2 is where its support starts (0, moved by the shift), scale2 lambda, alpha the tail index.
        this.loc2 = shiftMinutes;
        this.scale2 = Math.exp(eta[2]!);
        this.alpha = Math.exp(eta[3]!);
      } else {
        this.loc2 = eta[2]! + shiftMinutes;
        this.scale2 = Math.exp(eta[3]!);
        this.alpha = NaN;
      }
      this.tLogConstant = family === 'gumbel-t' ? logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - eta[3]! : NaN;
    }
  }

  /** The disrupted component's weight (0 for a single Gumbel). */
  get disruptedWeight(): number {
    return this.w;
  }

  cdf(x: number): number {
    const c1 = gumbelCdf(x, this.mu, this.beta);
    if (this.w === 0) return c1;
    const c2 = this.family === 'gumbel-t' ? studentTCdf(x, this.loc2, this.scale2, this.df) : this.family === 'gumbel-lomax' ? 1 - this.lomaxSurvival(x) : gumbelCdf(x, this.loc2, this.scale2);
    return (1 - this.w) * c1 + this.w * c2;
  }

  survival(x: number): number {
    const s1 = gumbelSurvival(x, this.mu, this.beta);
    if (this.w === 0) return s1;
    const s2 =
      this.family === 'gumbel-t' ? studentTSurvival(x, this.loc2, this.scale2, this.df) : this.family === 'gumbel-lomax' ? this.lomaxSurvival(x) : gumbelSurvival(x, this.loc2, this.scale2);
    return (1 - this.w) * s1 + this.w * s2;
  }

  pdf(x: number): number {
    const p1 = gumbelPdf(x, this.mu, this.beta);
    if (this.w === 0) return p1;
    let p2: number;
    if (this.family === 'gumbel-lomax') {
      if (Number.isNaN(x)) return NaN;
      const v = (x - this.loc2) / this.scale2;
      p2 = v < 0 || !Number.isFinite(v) ? 0 : (this.alpha / this.scale2) * Math.exp(-(this.alpha + 1) * Math.log1p(v));
    } else if (this.family === 'gumbel-t') {
      if (Number.isNaN(x)) return NaN;
      const u = (x - this.loc2) / this.scale2;
      p2 = Number.isFinite(x) ? Math.exp(this.tLogConstant - ((this.df + 1) / 2) * Math.log1p((u * u) / this.df)) : 0;
    } else p2 = gumbelPdf(x, this.loc2, this.scale2);
    return (1 - this.w) * p1 + this.w * p2;
  }

  sample(rng: Rng): number {
    if (this.w === 0 || rng.uniform() >= this.w) return gumbelSample(rng, this.mu, this.beta);
    if (this.family === 'gumbel-lomax') return this.loc2 + this.scale2 * Math.expm1(-Math.log(rng.uniform()) / this.alpha);
    return this.family === 'gumbel-t' ? studentTSample(rng, this.loc2, this.scale2, this.df) : gumbelSample(rng, this.loc2, this.scale2);
  }

  /** Lomax (Pareto II) survival (1 + (x - start) / lambda)^-alpha, 1 below its start. */
  private lomaxSurvival(x: number): number {
    if (Number.isNaN(x)) return NaN;
    const v = (x - this.loc2) / this.scale2;
    if (v <= 0) return 1;
    return Math.exp(-this.alpha * Math.log1p(v));
  }
}
