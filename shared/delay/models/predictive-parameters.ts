// Turning one group's constrained parameters into a DelayDistribution.
import { gumbelDistribution } from '../gumbel';
import { mixtureDistribution } from '../mixture';
import type { DelayDistribution } from '../predictive';
import type { GroupParameters } from './hierarchical-delay';

/** A Gumbel, or the typical-plus-disrupted Gumbel mixture when the parameters carry a weight. */
export function parametersDistribution(p: GroupParameters): DelayDistribution {
  const typical = gumbelDistribution(p.location, p.scale);
  if (p.disruptedWeight === undefined || p.disruptedLocation === undefined || p.disruptedScale === undefined) return typical;
  const w = p.disruptedWeight;
  return mixtureDistribution([typical, gumbelDistribution(p.disruptedLocation, p.disruptedScale)], [1 - w, w]);
}
