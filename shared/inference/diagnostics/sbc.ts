// Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman, "Validating
// Bayesian inference algorithms with simulation-based calibration", arXiv:1804.06788, 2018):
// the rank of a prior draw among posterior draws given data simulated from it is uniform
// when the sampler is correct.

/** The SBC rank statistic: how many of the posterior draws fall below the true value (0..L). */
export function sbcRank(trueValue: number, posteriorDraws: Float64Array): number {
  if (Number.isNaN(trueValue)) return NaN;
  let rank = 0;
  for (let i = 0; i < posteriorDraws.length; i++) if (posteriorDraws[i]! < trueValue) rank++;
  return rank;
}

export interface UniformityTest {
  /** Pearson's chi-square statistic over the bins. */
  readonly statistic: number;
  readonly degreesOfFreedom: number;
  readonly counts: Int32Array;
}

/**
 * Pearson's chi-square test of uniform ranks in 0..maxRank, pooled into `bins` equal-width
 * bins (Talts et al. 2018, section 4.1). maxRank + 1 must divide evenly into the bins, so each
 * bin spans the same number of possible ranks. Throws RangeError otherwise or for a rank out
 * of range.
 */
export function rankUniformity(ranks: ArrayLike<number>, maxRank: number, bins: number): UniformityTest {
  const values = maxRank + 1;
  if (!Number.isInteger(bins) || bins < 2 || values % bins !== 0) throw new RangeError(`${values} possible ranks do not split into ${bins} equal bins`);
  const per = values / bins;
  const counts = new Int32Array(bins);
  for (let i = 0; i < ranks.length; i++) {
    const r = ranks[i]!;
    if (!Number.isInteger(r) || r < 0 || r > maxRank) throw new RangeError(`rank ${r} is outside 0..${maxRank}`);
    counts[Math.floor(r / per)]!++;
  }
  const expected = ranks.length / bins;
  let statistic = 0;
  for (let b = 0; b < bins; b++) statistic += (counts[b]! - expected) ** 2 / expected;
  return { statistic, degreesOfFreedom: bins - 1, counts };
}
