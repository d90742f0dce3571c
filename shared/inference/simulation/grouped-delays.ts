// Synthetic grouped delay data with known per-group Gumbel parameters, for recovery tests,
// simulation-based calibration and benchmarks.
//
// Draws are rounded to whole minutes, as recorded delays are, and collapsed straight into
// weighted (group, value, count) triples, so a million draws never become a million rows.
import { gumbelSample } from '../../delay/gumbel';
import type { WeightedData } from '../model';
import type { Rng } from '../rng';

export interface GumbelGroup {
  readonly location: number;
  readonly scale: number;
}

/**
 * `perGroup[g]` (or `perGroup` for every group) Gumbel draws per group, rounded to the
 * minute. Throws RangeError for invalid parameters or counts.
 */
export function simulateGroupedDelays(groups: readonly GumbelGroup[], perGroup: number | readonly number[], rng: Rng): WeightedData {
  const G = groups.length;
  if (G < 1) throw new RangeError('need at least one group');
  const counts = typeof perGroup === 'number' ? groups.map(() => perGroup) : perGroup;
  if (counts.length !== G) throw new RangeError(`perGroup has ${counts.length} entries for ${G} groups`);
  const tallies: Map<number, number>[] = [];
  for (let g = 0; g < G; g++) {
    const { location, scale } = groups[g]!;
    const n = counts[g]!;
    if (!Number.isFinite(location) || !(scale > 0) || !Number.isFinite(scale)) throw new RangeError(`group ${g} has invalid parameters (${location}, ${scale})`);
    if (!Number.isInteger(n) || n < 0) throw new RangeError(`group ${g} needs a whole number of draws, got ${n}`);
    const tally = new Map<number, number>();
    for (let i = 0; i < n; i++) {
      const v = Math.round(gumbelSample(rng, location, scale));
      tally.set(v, (tally.get(v) ?? 0) + 1);
    }
    tallies.push(tally);
  }
  const units = tallies.reduce((s, t) => s + t.size, 0);
  const group = new Int32Array(units);
  const value = new Float64Array(units);
  const count = new Float64Array(units);
  let k = 0;
  tallies.forEach((tally, g) => {
    for (const [v, c] of [...tally].sort((a, b) => a[0] - b[0])) {
      group[k] = g;
      value[k] = v;
      count[k] = c;
      k++;
    }
  });
  return { groupCount: G, group, value, count };
}

/** What a grouped predictive simulator needs: each group's delay distribution under theta. */
export interface GroupDistributions {
  readonly groupCount: number;
  sampleGroup(theta: Float64Array, group: number, rng: Rng): number;
}

/**
 * A posterior predictive Simulator for grouped data: `perGroup[g]` draws for group g, groups
 * one after another (the layout of the output row), rounded to the minute when `round`.
 */
export function groupedSimulator(groups: GroupDistributions, perGroup: readonly number[], round: boolean): (theta: Float64Array, rng: Rng, out: Float64Array) => void {
  if (perGroup.length !== groups.groupCount) throw new RangeError(`perGroup has ${perGroup.length} entries for ${groups.groupCount} groups`);
  return (theta, rng, out) => {
    let k = 0;
    for (let g = 0; g < perGroup.length; g++) {
      for (let i = 0; i < perGroup[g]!; i++) {
        const v = groups.sampleGroup(theta, g, rng);
        out[k++] = round ? Math.round(v) : v;
      }
    }
  };
}
