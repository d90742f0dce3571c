import { describe, expect, it } from 'vitest';
import { compressDelays, indexRoutes } from '../../../shared/delay/evaluation/weighted-delays';
import { createTailMixtureModel } from '../../../shared/delay/models/tail-mixture';
import { withTailMixtureMinibatch } from '../../../shared/history/tail-mixture-minibatch';
import { createRng } from '../../../shared/inference/rng';

function smallData() {
  const rng = createRng(4);
  const n = 3000;
  const airports = ['ORD', 'ATL', 'DEN'];
  const origin = new Uint16Array(n);
  const destination = new Uint16Array(n);
  const day = new Int32Array(n);
  const delayMinutes = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    origin[i] = rng.int(3);
    destination[i] = (origin[i]! + 1 + rng.int(2)) % 3;
    day[i] = 19_800 + rng.int(90);
    delayMinutes[i] = Math.round(-5 + 10 * -Math.log(-Math.log(rng.uniform())));
  }
  const flights = { length: n, airports, origin, destination, day, delayMinutes };
  const keep = new Uint8Array(n).fill(1);
  const index = indexRoutes(flights, keep);
  const data = compressDelays(flights, index, keep, { minDelay: -120, maxDelay: 1379 });
  const codeIndex = new Map(airports.map((c, i) => [c, i]));
  const input = {
    data,
    airportCount: 3,
    originOf: Int32Array.from(index.routes, (r) => codeIndex.get(r.origin)!),
    destinationOf: Int32Array.from(index.routes, (r) => codeIndex.get(r.destination)!),
  };
  return input;
}

describe('withTailMixtureMinibatch', () => {
  const input = smallData();
  const model = createTailMixtureModel('gumbel-gumbel', input, [0]);
  const batched = withTailMixtureMinibatch(model, 'gumbel-gumbel', input, [0]);
  const theta = new Float64Array(model.dim);
  model.initialPoint!(theta);
  const rng = createRng(9);
  for (let i = 0; i < theta.length; i++) theta[i]! += 0.1 * rng.normal();

  it('gives the full log density and gradient for a batch of every unit at scale 1', () => {
    const units = batched.minibatch!.units;
    const batch = new Int32Array(units);
    // Shuffled order: the adapter must sort by route itself.
    for (let i = 0; i < units; i++) batch[i] = (i * 7919) % units;
    const g1 = new Float64Array(model.dim);
    const g2 = new Float64Array(model.dim);
    const full = model.logDensityGrad(theta, g1);
    const part = batched.minibatch!.logDensityGradBatch(theta, g2, batch, units, 1);
    expect(part).toBeCloseTo(full, 6);
    for (let i = 0; i < g1.length; i++) expect(g2[i]).toBeCloseTo(g1[i]!, 6);
  });

  it('averages to the full log density over uniform batches (unbiased subsample scaling)', () => {
    const mb = batched.minibatch!;
    const g = new Float64Array(model.dim);
    const full = model.logDensityGrad(theta, g);
    const size = 64;
    const batch = new Int32Array(size);
    const draw = createRng(2);
    let sum = 0;
    const reps = 400;
    for (let r = 0; r < reps; r++) {
      for (let k = 0; k < size; k++) batch[k] = draw.int(mb.units);
      sum += mb.logDensityGradBatch(theta, g, batch, size, mb.units / size);
    }
    expect(Math.abs(sum / reps - full) / Math.abs(full)).toBeLessThan(0.02);
  });
});
