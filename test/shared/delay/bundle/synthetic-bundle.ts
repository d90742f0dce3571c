// A small real bundle for tests: fitted by fitBundle to synthetic flights with known delays.
import { fitBundle, type Candidate } from '../../../../shared/delay/bundle/fit-bundle';
import type { PosteriorBundle } from '../../../../shared/delay/bundle/bundle-schema';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import type { FlightColumns } from '../../../../shared/delay/evaluation/flight-columns';
import { createRng } from '../../../../shared/inference/rng';

/** Routes as [origin, destination, flights, typical mu]; every route has a 15% disrupted share. */
export const SYNTHETIC_ROUTES: readonly [string, string, number, number][] = [
  ['ORD', 'ATL', 1500, -4],
  ['ATL', 'ORD', 1200, 0],
  ['ORD', 'DEN', 800, 2],
  ['DEN', 'ATL', 600, -2],
  ['ATL', 'DEN', 400, 4],
];

export function syntheticFlights(seed = 5): FlightColumns {
  const rng = createRng(seed);
  const airports = ['ATL', 'DEN', 'ORD'];
  const origin: number[] = [];
  const destination: number[] = [];
  const day: number[] = [];
  const delay: number[] = [];
  const jan1 = Math.floor(Date.UTC(2001, 0, 1) / 86_400_000);
  for (const [o, d, n, mu] of SYNTHETIC_ROUTES) {
    for (let i = 0; i < n; i++) {
      origin.push(airports.indexOf(o));
      destination.push(airports.indexOf(d));
      day.push(jan1 + (i % 59));
      const x = rng.uniform() < 0.15 ? gumbelSample(rng, 30, 40) : gumbelSample(rng, mu, 9);
      delay.push(Math.max(-120, Math.min(1379, Math.round(x))));
    }
  }
  return {
    length: delay.length,
    airports,
    origin: Uint16Array.from(origin),
    destination: Uint16Array.from(destination),
    day: Int32Array.from(day),
    delayMinutes: Float64Array.from(delay),
  };
}

export const MIXTURE_CANDIDATE: Candidate = { name: 'gumbel-mixture', family: 'gumbel-gumbel', monthEffects: [0, 4], description: 'test mixture' };

let cached: Promise<PosteriorBundle> | null = null;

/** The synthetic bundle (fitted once per test file). */
export function syntheticBundle(): Promise<PosteriorBundle> {
  cached ??= (async () => {
    const flights = syntheticFlights();
    const keep = new Uint8Array(flights.length).fill(1);
    const fitted = await fitBundle(flights, keep, MIXTURE_CANDIDATE, {
      seed: 3,
      maxIterations: 300,
      drawCount: 100,
      metadata: {
        id: 'synthetic-test',
        title: 'Synthetic test bundle',
        source: 'synthetic Gumbel-mixture flights generated in the test',
        license: 'test data',
        dateRange: { first: '2001-01-01', last: '2001-02-28' },
        createdAt: '2001-03-01T00:00:00Z',
      },
    });
    return fitted.bundle;
  })();
  return cached;
}
