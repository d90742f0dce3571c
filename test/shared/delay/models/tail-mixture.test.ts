import { describe, expect, it } from 'vitest';
import { createRng } from '../../../../shared/inference/rng';
import { createTailMixtureModel, flightLogDensity, type TailFamily } from '../../../../shared/delay/models/tail-mixture';
import { gumbelLogPdf } from '../../../../shared/delay/gumbel';
import type { PeriodWeightedData } from '../../../../shared/delay/evaluation/weighted-delays';
import { TailMixtureDistribution } from '../../../../shared/delay/bundle/mixture-distribution';
import { studentTLogPdf } from '../../../../shared/delay/models/student-t';

function syntheticData(): PeriodWeightedData {
  const rng = createRng(3);
  const group: number[] = [];
  const period: number[] = [];
  const value: number[] = [];
  const count: number[] = [];
  for (let r = 0; r < 3; r++)
    for (let p = 0; p < 2; p++)
      for (let i = 0; i < 20; i++) {
        group.push(r);
        period.push(p);
        value.push(Math.round(rng.normal() * 20 + (i % 5 === 0 ? 60 : 0)));
        count.push(1 + (i % 3));
      }
  return {
    groupCount: 3,
    group: Int32Array.from(group),
    period: Int32Array.from(period),
    value: Float64Array.from(value),
    count: Float64Array.from(count),
    periodCount: 2,
    periodLabels: ['2001-01', '2001-02'],
    flights: count.reduce((a, b) => a + b, 0),
  };
}

const families: TailFamily[] = ['gumbel', 'gumbel-gumbel', 'gumbel-t', 'gumbel-lomax', 'gumbel-gumbel-lomax'];
const input = { data: syntheticData(), airportCount: 3, originOf: Int32Array.from([0, 1, 2]), destinationOf: Int32Array.from([1, 2, 0]) };

describe.each(families)('the %s route model', (family) => {
  const model = createTailMixtureModel(family, input, family === 'gumbel' ? [0] : [0, 4]);
  const rng = createRng(17);
  const theta = new Float64Array(model.dim);
  model.initialPoint!(theta);
  for (let i = 0; i < theta.length; i++) theta[i]! += 0.3 * rng.normal();

  it('has a gradient that matches central finite differences', () => {
    const grad = new Float64Array(model.dim);
    model.logDensityGrad(theta, grad);
    const scratch = new Float64Array(model.dim);
    for (let i = 0; i < model.dim; i++) {
      const h = 1e-5;
      const a = theta.slice();
      const b = theta.slice();
      a[i]! += h;
      b[i]! -= h;
      const fd = (model.logDensityGrad(a, scratch) - model.logDensityGrad(b, scratch)) / (2 * h);
      const err = Math.abs(fd - grad[i]!) / Math.max(1, Math.abs(fd));
      if (err > 1e-5) throw new Error(`${model.names[i]}: finite difference ${fd}, gradient ${grad[i]}, relative error ${err}`);
    }
  });

  it('has a route-block gradient that matches finite differences and the full gradient', () => {
    const natural = model.toNatural(theta);
    const k = model.layout.k;
    const phi = natural.slice(0, k);
    const g = new Float64Array(k);
    model.routeBlockLogDensityGrad(natural, 0, phi, g);
    const full = new Float64Array(model.dim);
    model.naturalLogDensityGrad(natural, full);
    const scratch = new Float64Array(k);
    for (let j = 0; j < k; j++) {
      const a = phi.slice();
      const b = phi.slice();
      a[j]! += 1e-5;
      b[j]! -= 1e-5;
      const fd = (model.routeBlockLogDensityGrad(natural, 0, a, scratch) - model.routeBlockLogDensityGrad(natural, 0, b, scratch)) / 2e-5;
      expect(Math.abs(fd - g[j]!) / Math.max(1, Math.abs(fd))).toBeLessThan(1e-5);
      expect(g[j]!).toBeCloseTo(full[j]!, 6);
    }
  });

  it('has a likelihood equal to the sum of per-flight densities of the predictive distribution', () => {
    const lomax = family === 'gumbel-lomax';
    const values = [-3, Math.log(10), lomax ? Math.log(30) : 40, lomax ? Math.log(2.5) : Math.log(30), -1.5, Math.log(60), Math.log(3), -1];
    const eta = Float64Array.from({ length: model.layout.k }, (_, j) => values[j]!);
    const dist = new TailMixtureDistribution(family, eta, 3);
    const g = new Float64Array(8);
    const gd = new Float64Array(1);
    for (const x of [-30, 0, 12, 75, 400]) expect(flightLogDensity(family, x, eta, 3, g, gd)).toBeCloseTo(Math.log(dist.pdf(x)), 10);
  });
});

describe('component densities', () => {
  it('the gumbel family is exactly the Gumbel log density (shared/delay/gumbel)', () => {
    const g = new Float64Array(2);
    expect(flightLogDensity('gumbel', 7, Float64Array.from([2, Math.log(9)]), 0, g, new Float64Array(1))).toBeCloseTo(gumbelLogPdf(7, 2, 9), 12);
  });

  it('a mixture with weight near one is its disrupted component (Student-t log density)', () => {
    const eta = Float64Array.from([0, 0, 30, Math.log(20), 30]);
    expect(flightLogDensity('gumbel-t', 55, eta, 3, new Float64Array(5), new Float64Array(1))).toBeCloseTo(studentTLogPdf(55, 30, 20, 3), 8);
  });

  it('the Lomax component has the Pareto II survival (1 + x / lambda)^-alpha and no mass below its start, -0.5 min', () => {
    const eta = Float64Array.from([-200, 0, Math.log(30), Math.log(2.5), 40]);
    const d = new TailMixtureDistribution('gumbel-lomax', eta, NaN);
    expect(d.survival(60)).toBeCloseTo((1 + 60.5 / 30) ** -2.5, 10);
    expect(d.cdf(-0.6)).toBeLessThan(1e-12);
    const rng = createRng(2);
    let above = 0;
    for (let i = 0; i < 20_000; i++) if (d.sample(rng) > 60) above++;
    expect(Math.abs(above / 20_000 - (1 + 60.5 / 30) ** -2.5)).toBeLessThan(0.01);
  });
});

describe('TailMixtureDistribution.logPdf', () => {
  const eta = Float64Array.from([-5, Math.log(8), 20, Math.log(35), -1.4, Math.log(60), Math.log(3), -1.5]);
  const d = new TailMixtureDistribution('gumbel-gumbel-lomax', eta, NaN);

  it('equals log(pdf) where the density is representable', () => {
    for (const x of [-20, 0, 30, 240]) expect(d.logPdf(x)).toBeCloseTo(Math.log(d.pdf(x)), 10);
  });

  it('stays finite far in the left tail, where pdf underflows to 0', () => {
    expect(d.pdf(-400)).toBe(0);
    expect(d.logPdf(-400)).toBeLessThan(-1000);
    expect(Number.isFinite(d.logPdf(-400))).toBe(true);
    expect(d.logPdf(NaN)).toBeNaN();
  });
});
