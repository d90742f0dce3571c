import { describe, expect, it } from 'vitest';
import { createRng } from '../../../../shared/inference/rng';
import { collapseWeighted } from '../../../../shared/inference/weighted-data';
import { HierarchicalDelayModel, type AirportStructure } from '../../../../shared/delay/models/hierarchical-delay';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import { finiteDifferenceMismatches } from './fd-check';

function syntheticRoutes(seed: number) {
  const rng = createRng(seed);
  const routes = 6;
  const airports: AirportStructure = { airportCount: 4, origin: Int32Array.of(0, 0, 1, 2, 3, 1), destination: Int32Array.of(1, 2, 0, 3, 0, 3) };
  const g: number[] = [];
  const v: number[] = [];
  for (let r = 0; r < routes; r++) {
    for (let i = 0; i < 200; i++) {
      g.push(r);
      const disrupted = rng.uniform() < 0.2;
      v.push(Math.round(disrupted ? gumbelSample(rng, 40, 50) : gumbelSample(rng, -3 + r, 10 + r)));
    }
  }
  return { data: collapseWeighted(g, v, routes), airports };
}

function randomTheta(dim: number, seed: number, base: Float64Array): Float64Array {
  const rng = createRng(seed);
  const t = Float64Array.from(base);
  for (let i = 0; i < dim; i++) t[i]! += 0.3 * rng.normal();
  return t;
}

describe('hierarchical delay model gradients (central finite differences)', () => {
  const { data, airports } = syntheticRoutes(1);
  const variants = [
    { name: 'grouped Gumbel, point density', airports: null, mixture: false, h: 0 },
    { name: 'grouped mixture, interval likelihood', airports: null, mixture: true, h: 0.5 },
    { name: 'route Gumbel, interval likelihood', airports, mixture: false, h: 0.5 },
    { name: 'route mixture, point density', airports, mixture: true, h: 0 },
    { name: 'route mixture, interval likelihood', airports, mixture: true, h: 0.5 },
  ];
  it.each(variants)('matches finite differences at every coordinate: $name', (v) => {
    const model = new HierarchicalDelayModel(data, v.airports, { mixture: v.mixture, intervalHalfWidth: v.h });
    const init = new Float64Array(model.dim);
    model.initialPoint(init);
    const theta = randomTheta(model.dim, 7, init);
    const bad = finiteDifferenceMismatches(model, theta, 1e-5, 1e-6);
    expect(bad).toEqual([]);
  });
});
