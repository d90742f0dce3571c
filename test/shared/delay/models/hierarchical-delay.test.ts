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

describe('hierarchical delay model, other behaviour', () => {
  const { data, airports } = syntheticRoutes(2);

  it('the finite-difference check catches a gradient that is off by 0.1%', () => {
    const model = new HierarchicalDelayModel(data, airports, { mixture: true });
    const wrong = {
      dim: model.dim,
      names: model.names,
      logDensityGrad(t: Float64Array, g: Float64Array) {
        const lp = model.logDensityGrad(t, g);
        g[3] = g[3]! * 1.001;
        return lp;
      },
    };
    const theta = new Float64Array(model.dim);
    model.initialPoint(theta);
    const bad = finiteDifferenceMismatches(wrong, theta, 1e-5, 1e-6);
    expect(bad.map((b) => b.index)).toEqual([3]);
  });

  it('a minibatch of every unit with scale 1 equals the full log density and gradient', () => {
    for (const h of [0, 0.5]) {
      const model = new HierarchicalDelayModel(data, airports, { mixture: true, intervalHalfWidth: h });
      const theta = randomTheta(model.dim, 3, (() => { const t = new Float64Array(model.dim); model.initialPoint(t); return t; })());
      const g1 = new Float64Array(model.dim);
      const g2 = new Float64Array(model.dim);
      const full = model.logDensityGrad(theta, g1);
      const all = Int32Array.from({ length: model.minibatch.units }, (_, i) => i);
      const batch = model.minibatch.logDensityGradBatch(theta, g2, all, all.length, 1);
      expect(batch).toBeCloseTo(full, 8);
      for (let i = 0; i < model.dim; i++) expect(g2[i]).toBeCloseTo(g1[i]!, 8);
    }
  });

  it('weighted triples give the same log density as the rows they stand for', () => {
    const rows = collapseWeighted([0, 0, 0, 1], [3, 3, 3, -2], 2);
    const unit = { groupCount: 2, group: Int32Array.of(0, 0, 0, 1), value: Float64Array.of(3, 3, 3, -2), count: Float64Array.of(1, 1, 1, 1) };
    const a = new HierarchicalDelayModel(rows, null, { mixture: true });
    const b = new HierarchicalDelayModel(unit, null, { mixture: true });
    const theta = new Float64Array(a.dim);
    a.initialPoint(theta);
    expect(a.logDensity(theta)).toBeCloseTo(b.logDensity(theta), 10);
  });

  it('the interval likelihood of a wide scale approaches the point density times the interval width', () => {
    const one = { groupCount: 1, group: Int32Array.of(0), value: Float64Array.of(4), count: Float64Array.of(1) };
    const point = new HierarchicalDelayModel(one, null);
    const interval = new HierarchicalDelayModel(one, null, { intervalHalfWidth: 0.5 });
    const theta = new Float64Array(point.dim);
    point.initialPoint(theta);
    theta[point.layout.logScale.pop] = Math.log(200);
    theta[point.layout.logScale.zGroup] = 0;
    // log P(3.5 < X <= 4.5) = log f(4) + log 1 + O((h / b)^2).
    expect(interval.logDensity(theta)).toBeCloseTo(point.logDensity(theta), 4);
  });

  it('its curvature diagonal is positive and near the finite-difference Hessian diagonal at the mode', async () => {
    const model = new HierarchicalDelayModel(data, airports, { mixture: false });
    const { fitMap } = await import('../../../../shared/inference/map');
    const fit = await fitMap(model, { rng: createRng(1) });
    const c = new Float64Array(model.dim);
    model.curvatureDiagonal(fit.mean, c);
    const g1 = new Float64Array(model.dim);
    const g2 = new Float64Array(model.dim);
    const t = Float64Array.from(fit.mean);
    // The data-rich coordinates: route effects of location and log-scale.
    for (const off of [model.layout.location, model.layout.logScale]) {
      for (let r = 0; r < model.groupCount; r++) {
        const i = off.zGroup + r;
        const h = 1e-4;
        t[i] = fit.mean[i]! + h;
        model.logDensityGrad(t, g1);
        t[i] = fit.mean[i]! - h;
        model.logDensityGrad(t, g2);
        t[i] = fit.mean[i]!;
        const fd = -(g1[i]! - g2[i]!) / (2 * h);
        expect(c[i]!).toBeGreaterThan(0);
        expect(c[i]! / fd, `${model.names[i]}: ${c[i]} vs ${fd}`).toBeGreaterThan(0.6);
        expect(c[i]! / fd, `${model.names[i]}: ${c[i]} vs ${fd}`).toBeLessThan(1.6);
      }
    }
  });

  it('rejects malformed data with a RangeError naming the problem', () => {
    const ok = { groupCount: 1, group: Int32Array.of(0), value: Float64Array.of(1), count: Float64Array.of(1) };
    expect(() => new HierarchicalDelayModel({ ...ok, group: Int32Array.of(2) }, null)).toThrow(/group 2/);
    expect(() => new HierarchicalDelayModel({ ...ok, value: Float64Array.of(NaN) }, null)).toThrow(/non-finite value/);
    expect(() => new HierarchicalDelayModel({ ...ok, count: Float64Array.of(-1) }, null)).toThrow(/invalid count/);
    expect(() => new HierarchicalDelayModel(ok, null, { intervalHalfWidth: -1 })).toThrow(/intervalHalfWidth/);
    expect(() => new HierarchicalDelayModel(ok, { airportCount: 2, origin: Int32Array.of(5), destination: Int32Array.of(0) })).toThrow(/airport index/);
  });

  it('names every coordinate', () => {
    const model = new HierarchicalDelayModel(data, airports, { mixture: true });
    expect(model.names.length).toBe(model.dim);
    expect(model.names.every((n) => typeof n === 'string' && n.length > 0)).toBe(true);
    expect(model.names[model.layout.location.pop]).toBe('location_pop');
    expect(model.names[model.layout.shift]).toBe('disrupted_shift');
  });
});
