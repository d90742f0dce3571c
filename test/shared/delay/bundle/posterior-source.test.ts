import { beforeAll, describe, expect, it } from 'vitest';
import { BundleFormatError, type PosteriorBundle } from '../../../../shared/delay/bundle/bundle-schema';
import { exceedance } from '../../../../shared/delay/bundle/exceedance';
import { createBundleSource, parsePosteriorBundle, unseenAirportSd } from '../../../../shared/delay/bundle/posterior-source';
import { findAirport } from '../../../../shared/time/airports';
import { syntheticBundle } from './synthetic-bundle';

let bundle: PosteriorBundle;
let text: string;
beforeAll(async () => {
  bundle = await syntheticBundle();
  text = JSON.stringify(bundle);
});

function mutated(change: (b: Record<string, unknown> & PosteriorBundle) => void): string {
  const copy = JSON.parse(text) as Record<string, unknown> & PosteriorBundle;
  change(copy);
  return JSON.stringify(copy);
}

describe('parsePosteriorBundle rejects what is not a valid bundle, with a clear error', () => {
  it.each([
    ['text that is not JSON', '{"format": "layline.route-posteriors", ', /not JSON/],
    ['a foreign JSON file (GeoJSON)', '{"type":"FeatureCollection","features":[]}', /format is null.*is this a Layline bundle/],
    ['a JSON array', '[1, 2, 3]', /expected a JSON object/],
  ])('%s', (_what, input, message) => {
    expect(() => parsePosteriorBundle(input)).toThrow(BundleFormatError);
    expect(() => parsePosteriorBundle(input)).toThrow(message);
  });

  it('a newer format version', () => {
    expect(() => parsePosteriorBundle(mutated((b) => ((b as { version: number }).version = 2)))).toThrow(/version 2 is not supported/);
  });

  it('a missing section, naming where', () => {
    expect(() => parsePosteriorBundle(mutated((b) => delete (b as Partial<PosteriorBundle>).population))).toThrow(/population/);
  });

  it('a truncated route row', () => {
    expect(() => parsePosteriorBundle(mutated((b) => b.routes.rows[0]!.pop()))).toThrow(/routes\.rows\[0\] has \d+ entries/);
  });

  it('an airport index out of range', () => {
    expect(() => parsePosteriorBundle(mutated((b) => (b.routes.rows[1]![0] = 99)))).toThrow(/airport index out of range/);
  });

  it('a Cholesky factor with a non-positive diagonal', () => {
    expect(() => parsePosteriorBundle(mutated((b) => (b.routes.rows[0]![3 + 5] = -1)))).toThrow(/Cholesky diagonal/);
  });

  it('a wrong-typed field', () => {
    expect(() => parsePosteriorBundle(mutated((b) => ((b.metadata as { flights: unknown }).flights = 'many')))).toThrow(/metadata\.flights/);
  });

  it('accepts the valid file it was made from', () => {
    expect(parsePosteriorBundle(text).info).toEqual({ id: 'synthetic-test', model: bundle.metadata.model, source: bundle.metadata.source });
  });
});

describe('route posteriors from a bundle', () => {
  it('serves a fitted route from its own posterior, with the flights it was fitted on', () => {
    const source = createBundleSource(bundle);
    const post = source.route('ORD', 'ATL', 'arrival');
    expect(post).toMatchObject({ origin: 'ORD', destination: 'ATL', kind: 'arrival', pooling: 'route', flights: 1500, derived: false, drawCount: 100 });
    // The synthetic delays are 85% Gumbel(-4, 9) + 15% Gumbel(30, 40): P(> 60) is about 0.15 * 0.49 = 0.074.
    // In a fitted month, so the spread of a new month's effect (only two months were fitted) does not enter.
    const [p60] = exceedance(source.routeInMonth('ORD', 'ATL', 'arrival', '2001-01'), [60]);
    expect(p60!.p).toBeGreaterThan(0.05);
    expect(p60!.p).toBeLessThan(0.1);
  });

  it('gives the same draws whatever order routes are asked in', () => {
    const a = createBundleSource(bundle);
    const b = createBundleSource(bundle);
    b.route('DEN', 'ATL', 'arrival');
    expect(Array.from(a.route('ORD', 'ATL', 'arrival').parameters(7))).toEqual(Array.from(b.route('ORD', 'ATL', 'arrival').parameters(7)));
  });

  it('pools an unseen route between seen airports, with a wider interval than a fitted route', () => {
    const source = createBundleSource(bundle);
    expect(source.route('DEN', 'ORD', 'arrival')).toMatchObject({ pooling: 'airports', flights: 0 });
    // Compared within a fitted month, so only route-level uncertainty differs.
    const pooled = source.routeInMonth('DEN', 'ORD', 'arrival', '2001-01');
    const fitted = source.routeInMonth('ORD', 'ATL', 'arrival', '2001-01');
    const width = (p: typeof pooled) => {
      const [e] = exceedance(p, [30]);
      return e!.interval[1] - e!.interval[0];
    };
    expect(width(pooled)).toBeGreaterThan(width(fitted));
    for (let s = 0; s < pooled.drawCount; s++) expect(Number.isFinite(pooled.draw(s).survival(30))).toBe(true);
  });

  it('gives the population predictive when an airport is not in the data', () => {
    expect(findAirport('ZRH')).toBeDefined();
    const post = createBundleSource(bundle).route('ORD', 'ZRH', 'arrival');
    expect(post.pooling).toBe('population');
  });

  it('draws an unseen airport\'s effect with the spread of the fitted airports\' effects, not the MAP hyper-sd', () => {
    // The EM estimate of a normal variance component (Dempster, Laird & Rubin 1977): the mean of
    // m^2 + s^2 over the effects, here by hand: (0.3^2 + 0.1^2 + 0.1^2 + 0.1^2 + 0.5^2 + 0.1^2) / 3.
    const means = [[0.3, 5], [-0.1, 5], [0.5, 5]];
    const sds = [[0.1, 1], [0.1, 1], [0.1, 1]];
    const [a, b] = unseenAirportSd(means, sds, [2, 3]);
    expect(a).toBeCloseTo(Math.sqrt((0.09 + 0.01 + 0.01 + 0.01 + 0.25 + 0.01) / 3), 12);
    // Capped at the fit's own sd; fewer than three airports keep it.
    expect(b).toBe(3);
    expect(unseenAirportSd(means.slice(0, 2), sds.slice(0, 2), [2, 3])).toEqual([2, 3]);

    // An inflated hyper-sd in the file (as a MAP in non-centred coordinates leaves it) no longer
    // widens the population predictive: the draws' variance of a parameter without month effects
    // is the known origin's posterior variance + the new destination's + the route sd's.
    const inflated = JSON.parse(text) as PosteriorBundle;
    const j = inflated.model.parameters.findIndex((_, i) => !inflated.model.monthEffects.includes(i));
    inflated.population.destinationSd = inflated.population.destinationSd.map((v) => 50 * v + 5);
    const source = createBundleSource(inflated, { drawCount: 4000 });
    const post = source.route('ORD', 'ZRH', 'arrival');
    expect(post.pooling).toBe('population');
    const values = Array.from({ length: 4000 }, (_, s) => post.parameters(s)[j]!);
    const mean = values.reduce((x, y) => x + y, 0) / values.length;
    const variance = values.reduce((x, y) => x + (y - mean) ** 2, 0) / (values.length - 1);
    const o = inflated.airports.codes.indexOf('ORD');
    const newSd = unseenAirportSd(inflated.airports.destinationMean, inflated.airports.destinationSd, inflated.population.destinationSd)[j]!;
    expect(newSd).toBeLessThan(inflated.population.destinationSd[j]!);
    const expected = inflated.airports.originSd[o]![j]! ** 2 + newSd ** 2 + inflated.population.routeSd[j]! ** 2;
    // 4,000 draws: the variance's own sampling error is about 2.2%.
    expect(variance / expected).toBeGreaterThan(0.9);
    expect(variance / expected).toBeLessThan(1.1);
  });

  it('names an unknown airport code in its error', () => {
    expect(findAirport('QJQ')).toBeUndefined();
    expect(() => createBundleSource(bundle).route('QJQ', 'ATL', 'arrival')).toThrow(/QJQ/);
  });

  it('derives departures by the 6.1-minute en-route recovery shift and marks them derived', () => {
    const source = createBundleSource(bundle);
    const arrival = source.route('ATL', 'ORD', 'arrival');
    const departure = source.route('ATL', 'ORD', 'departure');
    expect(departure.derived).toBe(true);
    for (const x of [-10, 15, 60, 180]) expect(departure.draw(3).survival(x + 6.1)).toBeCloseTo(arrival.draw(3).survival(x), 12);
  });

  it('uses a fitted month effect for a month the fit saw, and rejects one it did not', () => {
    const source = createBundleSource(bundle);
    expect(source.routeInMonth('ORD', 'ATL', 'arrival', '2001-02').pooling).toBe('route');
    expect(() => source.routeInMonth('ORD', 'ATL', 'arrival', '2001-06')).toThrow(/no fitted month 2001-06/);
  });

  it('rejects a draw index outside the draws', () => {
    const post = createBundleSource(bundle, { drawCount: 10 }).route('ORD', 'ATL', 'arrival');
    expect(() => post.draw(10)).toThrow(/outside 0\.\.9/);
  });
});
