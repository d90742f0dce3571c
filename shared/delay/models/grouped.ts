// The `grouped` delay model: each group's Gumbel location and log-scale (and, for the mixture
// variant, the logit of its disrupted weight) partially pooled toward population values.
//
// Layout of the unconstrained vector θ (offsets in model.layout; names in model.names):
//   location:    [pop, logSigmaGroup, zGroup[0..G)]      location[g] = pop + e^logSigmaGroup * zGroup[g]
//   logScale:    [pop, logSigmaGroup, zGroup[0..G)]      scale[g] = exp(logScale[g])
//   logitWeight: [pop, logSigmaGroup, zGroup[0..G)]      mixture only; disrupted weight = sigmoid(.)
//   mixture only: [disrupted_shift, disrupted_log_excess]
//       disrupted location = location[g] + shift, disrupted scale = scale[g] * (1 + e^c)
// Constrained values: model.groupParameters(θ, g). Predictive for group g under one posterior
// draw θ: groupPredictive(model, θ, g); for a new group: groupPredictive(model, θ, -1, rng),
// which draws the group's random effects from the hierarchy.
import type { WeightedData } from '../../inference/model';
import type { Rng } from '../../inference/rng';
import type { DelayDistribution } from '../predictive';
import { HierarchicalDelayModel, type DelayModelOptions } from './hierarchical-delay';
import { parametersDistribution } from './predictive-parameters';

export type GroupedModelOptions = DelayModelOptions;

/** A single Gumbel per group, pooled. Throws a RangeError on malformed data. */
export function createGroupedModel(data: WeightedData, options: Omit<GroupedModelOptions, 'mixture'> = {}): HierarchicalDelayModel {
  return new HierarchicalDelayModel(data, null, { ...options, mixture: false });
}

/** Typical Gumbel plus a wider disrupted Gumbel per group, the weight pooled. */
export function createGroupedMixtureModel(data: WeightedData, options: Omit<GroupedModelOptions, 'mixture'> = {}): HierarchicalDelayModel {
  return new HierarchicalDelayModel(data, null, { ...options, mixture: true });
}

/**
 * The delay distribution of group g (or of a new group, g = -1, which needs `rng`) under θ.
 */
export function groupPredictive(model: HierarchicalDelayModel, theta: Float64Array, group: number, rng?: Rng): DelayDistribution {
  if (group >= 0) return parametersDistribution(model.groupParameters(theta, group));
  if (!rng) throw new RangeError('a new group needs an rng to draw its random effects');
  const fresh = (): { zGroup: number; zOrigin: number; zDest: number } => ({ zGroup: rng.normal(), zOrigin: 0, zDest: 0 });
  const loc = model.hierarchyValue(theta, 'location', -1, -1, -1, fresh());
  const ls = model.hierarchyValue(theta, 'logScale', -1, -1, -1, fresh());
  const lw = model.mixture ? model.hierarchyValue(theta, 'logitWeight', -1, -1, -1, fresh()) : 0;
  return parametersDistribution(model.constrain(theta, loc, ls, lw));
}
