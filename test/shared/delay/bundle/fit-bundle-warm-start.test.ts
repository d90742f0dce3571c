// fitBundle's warmFrom: a refit on more data that starts from an earlier fit, matched by route,
// airport and month. Synthetic flights drawn here (a simulation, no outside source); the check
// is against the same model fitted from a cold start.
import { describe, expect, it } from 'vitest';
import { fitBundle, type Candidate } from '../../../../shared/delay/bundle/fit-bundle';
import type { FlightColumns } from '../../../../shared/delay/evaluation/flight-columns';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import { createRng } from '../../../../shared/inference/rng';

const CANDIDATE: Candidate = { name: 'test-mixture', family: 'gumbel-gumbel', monthEffects: [], description: 'test mixture' };
const metadata = { id: 't', title: '', source: 'synthetic', license: 'test data', dateRange: { first: '2001-01-01', last: '2001-03-31' }, createdAt: '' };

/** 30 routes on 8 airports over three months; one route appears only in the last month. */
function flights(): FlightColumns {
  const rng = createRng(17);
  const airports = Array.from({ length: 8 }, (_, i) => `B${String.fromCharCode(65 + i)}`);
  const origin: number[] = [];
  const destination: number[] = [];
  const day: number[] = [];
  const delay: number[] = [];
  const jan1 = Math.floor(Date.UTC(2001, 0, 1) / 86_400_000);
  for (let r = 0; r <= 30; r++) {
    const o = r % 8;
    const d = (o + 1 + Math.floor(r / 8)) % 8;
    const mu = -6 + 4 * rng.normal();
    const late = r === 30;
    for (let i = 0; i < 400; i++) {
      origin.push(o);
      destination.push(d);
      day.push(jan1 + (late ? 60 + (i % 30) : i % 90));
      const x = rng.uniform() < 0.2 ? gumbelSample(rng, mu + 30, 30) : gumbelSample(rng, mu, 9);
      delay.push(Math.max(-120, Math.min(1379, Math.round(x))));
    }
  }
  return { length: delay.length, airports, origin: Uint16Array.from(origin), destination: Uint16Array.from(destination), day: Int32Array.from(day), delayMinutes: Float64Array.from(delay) };
}

describe('fitBundle warmFrom', () => {
  it('refits on all months from a fit on the first two: at least as high a log posterior as a cold start', async () => {
    const f = flights();
    const jan1 = Math.floor(Date.UTC(2001, 0, 1) / 86_400_000);
    const early = Uint8Array.from(f.day, (d) => (d < jan1 + 59 ? 1 : 0));
    const all = new Uint8Array(f.length).fill(1);
    const first = await fitBundle(f, early, CANDIDATE, { seed: 1, metadata });
    const cold = await fitBundle(f, all, CANDIDATE, { seed: 1, metadata });
    const warm = await fitBundle(f, all, CANDIDATE, { seed: 1, metadata, warmFrom: first });
    expect(warm.bundle.routes.rows).toHaveLength(31);
    const lp = (b: typeof warm) => Number(b.bundle.metadata.diagnostics.logPosterior);
    // The route sds' EM updates settle further from the earlier fit's values than from the
    // prior's, so the warm refit ends at least as high (here about 125 nats higher).
    expect(lp(warm)).toBeGreaterThanOrEqual(lp(cold) - 1);
    // The route seen only in the last month started from the sweeps and was fitted like the rest.
    const late = warm.bundle.routes.rows.find((row) => row[2] === 400 && warm.index.routes[warm.bundle.routes.rows.indexOf(row)]!.origin === 'BG');
    expect(late).toBeDefined();
    expect(late!.every((v) => Number.isFinite(v))).toBe(true);
    // Started from a fit of the same flights, the coordinates match one to one: it is at the mode already.
    // (Plain joint MAP here, routeSdEmRounds 0: the EM updates of the route sds go on raising
    // the log posterior from any start, so they would not show it.)
    const joint = await fitBundle(f, all, CANDIDATE, { seed: 1, metadata, routeSdEmRounds: 0 });
    const again = await fitBundle(f, all, CANDIDATE, { seed: 1, metadata, routeSdEmRounds: 0, warmFrom: joint, warmStartSweeps: 0 });
    expect(Math.abs(lp(again) - lp(joint))).toBeLessThan(1);
    expect(Number(again.bundle.metadata.diagnostics.iterations)).toBeLessThan(Number(joint.bundle.metadata.diagnostics.iterations) / 2);
  }, 60_000);
});
