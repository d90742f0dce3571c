import { describe, expect, it } from 'vitest';
import { collapseRoutes, createRouteMixtureModel, createRouteModel, routeParameters, routePoolingLevel, routePredictive } from '../../../../shared/delay/models/route';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import { createRng } from '../../../../shared/inference/rng';
import { fitMap } from '../../../../shared/inference/map';
import { fitAdvi } from '../../../../shared/inference/advi';

/**
 * Invented network: 8 airports; a route's typical location is originEffect + destEffect - 2
 * minutes, its scale 12 minutes; 15% of flights are disrupted (location + 35, scale x 4).
 */
const ORIGIN_EFFECT = [0, 4, -3, 8, 1, -2, 6, 2];
const DEST_EFFECT = [1, -2, 5, 0, 3, -4, 2, 7];
function network(seed: number, flightsPerRoute: number, skip: (o: number, d: number) => boolean) {
  const rng = createRng(seed);
  const origin: string[] = [];
  const destination: string[] = [];
  const delay: number[] = [];
  for (let o = 0; o < 8; o++) {
    for (let d = 0; d < 8; d++) {
      if (o === d || skip(o, d)) continue;
      const loc = ORIGIN_EFFECT[o]! + DEST_EFFECT[d]! - 2;
      for (let i = 0; i < flightsPerRoute; i++) {
        origin.push(`A${o}`);
        destination.push(`A${d}`);
        delay.push(Math.round(rng.uniform() < 0.15 ? gumbelSample(rng, loc + 35, 48) : gumbelSample(rng, loc, 12)));
      }
    }
  }
  return collapseRoutes(origin, destination, delay);
}

describe('collapseRoutes', () => {
  it('indexes airports and routes in order of first appearance and counts flights', () => {
    const r = collapseRoutes(['ORD', 'ORD', 'ATL', 'ORD'], ['ATL', 'ATL', 'ORD', 'DEN'], [5, 5, -3, 12]);
    expect(r.airportCodes).toEqual(['ORD', 'ATL', 'DEN']);
    expect(r.routeKeys).toEqual(['ORD-ATL', 'ATL-ORD', 'ORD-DEN']);
    expect(Array.from(r.flights)).toEqual([2, 1, 1]);
    expect(Array.from(r.airports.origin)).toEqual([0, 1, 0]);
    expect(Array.from(r.airports.destination)).toEqual([1, 0, 2]);
    expect(Array.from(r.data.count)).toEqual([2, 1, 1]);
  });

  it('rejects mismatched lengths, empty codes and non-finite delays', () => {
    expect(() => collapseRoutes(['ORD'], [], [1])).toThrow(/same length/);
    expect(() => collapseRoutes([''], ['ATL'], [1])).toThrow(/empty airport code/);
    expect(() => collapseRoutes(['ORD'], ['ATL'], [NaN])).toThrow(/non-finite/);
  });
});

describe('route model', () => {
  // Hold out the A3 -> A5 route: its predictive must come from the airport effects alone.
  const held = (o: number, d: number): boolean => o === 3 && d === 5;
  const rd = network(21, 400, held);

  it('recovers route locations from origin and destination effects, by MAP (mixture, interval likelihood)', async () => {
    const model = createRouteMixtureModel(rd.data, rd.airports, { intervalHalfWidth: 0.5 });
    const fit = await fitMap(model, { rng: createRng(1) });
    expect(fit.converged).toBe(true);
    let worst = 0;
    rd.routeKeys.forEach((key, r) => {
      const [o, d] = key.split('-').map((c) => Number(c.slice(1))) as [number, number];
      const p = model.groupParameters(fit.mean, r);
      worst = Math.max(worst, Math.abs(p.location - (ORIGIN_EFFECT[o]! + DEST_EFFECT[d]! - 2)));
      expect(Math.abs(p.scale - 12), `${key} scale ${p.scale}`).toBeLessThan(2);
      expect(Math.abs(p.disruptedWeight! - 0.15), `${key} weight`).toBeLessThan(0.08);
    });
    // Typical-location standard error with 340 typical flights is about 0.7 minutes.
    expect(worst).toBeLessThan(3);
    const any = model.groupParameters(fit.mean, 0);
    expect(any.disruptedLocation! - any.location).toBeGreaterThan(25);
    expect(any.disruptedScale! / any.scale).toBeGreaterThan(2.5);
  });

  it('predicts a route absent from the data from its airports (pooling "airports") and near its true location', async () => {
    const model = createRouteModel(rd.data, rd.airports);
    const fit = await fitAdvi(model, { rng: createRng(2) });
    const o = rd.airportCodes.indexOf('A3');
    const d = rd.airportCodes.indexOf('A5');
    const ref = { route: -1, origin: o, destination: d };
    expect(routePoolingLevel(ref)).toBe('airports');
    const rng = createRng(5);
    const draws = fit.draws(rng, 200);
    let s = 0;
    for (let k = 0; k < 200; k++) s += routeParameters(model, draws.subarray(k * model.dim, (k + 1) * model.dim), ref, rng).location;
    const truth = ORIGIN_EFFECT[3]! + DEST_EFFECT[5]! - 2;
    // The single-Gumbel fit to mixture data moves every location by a common amount; compare
    // against the same shift seen on the routes that are in the data.
    let shift = 0;
    rd.routeKeys.forEach((key, r) => {
      const [oo, dd] = key.split('-').map((c) => Number(c.slice(1))) as [number, number];
      shift += model.groupParameters(fit.mean, r).location - (ORIGIN_EFFECT[oo]! + DEST_EFFECT[dd]! - 2);
    });
    shift /= rd.routeKeys.length;
    expect(Math.abs(s / 200 - shift - truth)).toBeLessThan(3);
  });

  it('gives an unseen airport the population predictive, wider than a seen route', async () => {
    const model = createRouteModel(rd.data, rd.airports);
    const fit = await fitMap(model, { rng: createRng(3) });
    const rng = createRng(8);
    const spread = (ref: { route: number; origin: number; destination: number }): number => {
      const xs: number[] = [];
      for (let k = 0; k < 400; k++) xs.push(routeParameters(model, fit.mean, ref, rng).location);
      const m = xs.reduce((a, b) => a + b) / xs.length;
      return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / xs.length);
    };
    const population = { route: -1, origin: -1, destination: rd.airportCodes.indexOf('A1') };
    expect(routePoolingLevel(population)).toBe('population');
    expect(routePoolingLevel({ route: 0, origin: 0, destination: 1 })).toBe('route');
    expect(spread(population)).toBeGreaterThan(1);
    expect(spread({ route: 0, origin: -1, destination: -1 })).toBeLessThan(1e-12);
    const dist = routePredictive(model, fit.mean, population, rng);
    expect(dist.cdf(1e6)).toBeCloseTo(1, 12);
    expect(dist.survival(-1e3)).toBeCloseTo(1, 12);
  });

  it('needs an rng for routes outside the data and rejects airport indices out of range', () => {
    const model = createRouteModel(rd.data, rd.airports);
    const theta = new Float64Array(model.dim);
    model.initialPoint(theta);
    expect(() => routeParameters(model, theta, { route: -1, origin: 0, destination: 1 })).toThrow(/needs an rng/);
    expect(() => routeParameters(model, theta, { route: -1, origin: 99, destination: 1 }, createRng(1))).toThrow(/outside/);
  });
});
