// Minibatch gradients for the route tail-mixture model, so stochastic VI can fit it.
//
// The model's log density is log prior + sum over triples of count * log-likelihood. A
// minibatch estimate is the same model over the drawn triples with their counts replaced by
// the estimator's weights (scale * count, or the per-element scale of row sampling), which is
// exactly "log prior + scaled batch log-likelihood" as MinibatchModel asks.
import type { PeriodWeightedData } from '../delay/evaluation/weighted-delays';
import { createTailMixtureModel, type TailFamily, type TailMixtureData, type TailMixtureModel } from '../delay/models/tail-mixture';
import type { Model } from '../inference/model';

/** The model with a `minibatch` member added; the full-data members are the model's own. */
export function withTailMixtureMinibatch(model: TailMixtureModel, family: TailFamily, input: TailMixtureData, monthEffects: readonly number[]): Model {
  const data = input.data;
  let capacity = 0;
  let order = new Int32Array(0);
  let group = new Int32Array(0);
  let period = new Int32Array(0);
  let value = new Float64Array(0);
  let count = new Float64Array(0);
  return {
    dim: model.dim,
    names: model.names,
    logDensityGrad: (theta, grad) => model.logDensityGrad(theta, grad),
    initialPoint: (out) => model.initialPoint?.(out),
    minibatch: {
      units: data.group.length,
      unitWeights: data.count,
      logDensityGradBatch(theta, grad, batch, batchLength, scale, elementScale) {
        if (batchLength > capacity) {
          capacity = batchLength;
          order = new Int32Array(capacity);
          group = new Int32Array(capacity);
          period = new Int32Array(capacity);
          value = new Float64Array(capacity);
          count = new Float64Array(capacity);
        }
        // The model wants triples sorted by route; the data are, so sorting positions sorts routes.
        for (let k = 0; k < batchLength; k++) order[k] = k;
        const view = order.subarray(0, batchLength);
        view.sort((a, b) => batch[a]! - batch[b]!);
        for (let j = 0; j < batchLength; j++) {
          const k = view[j]!;
          const i = batch[k]!;
          group[j] = data.group[i]!;
          period[j] = data.period[i]!;
          value[j] = data.value[i]!;
          count[j] = elementScale ? elementScale[k]! : scale * data.count[i]!;
        }
        const sub: PeriodWeightedData = {
          groupCount: data.groupCount,
          group: group.subarray(0, batchLength),
          value: value.subarray(0, batchLength),
          count: count.subarray(0, batchLength),
          periodCount: data.periodCount,
          period: period.subarray(0, batchLength),
          periodLabels: data.periodLabels,
          flights: data.flights,
        };
        return createTailMixtureModel(family, { ...input, data: sub }, monthEffects).logDensityGrad(theta, grad);
      },
    },
  };
}
