// The route sds of fitBundle: Laplace-EM against the joint MAP, on synthetic flights whose
// route-level spread is known because the test draws it (no outside source: a simulation).
import { describe, expect, it } from 'vitest';
import { fitBundle, type Candidate } from '../../../../shared/delay/bundle/fit-bundle';
import type { FlightColumns } from '../../../../shared/delay/evaluation/flight-columns';
import { gumbelSample } from '../../../../shared/delay/gumbel';
import { createRng } from '../../../../shared/inference/rng';

const CANDIDATE: Candidate = { name: 'test-mixture', family: 'gumbel-gumbel', monthEffects: [], description: 'test mixture' };
/** True sd over routes of the logit disrupted weight: weakly identified by 150 flights a route. */
const TRUE_LOGIT_W_SD = 0.8;
const ROUTES = 60;

function spreadFlights(seed: number): FlightColumns {
  const rng = createRng(seed);
  const airports = Array.from({ length: 12 }, (_, i) => `A${String.fromCharCode(65 + i)}`);
  const origin: number[] = [];
  const destination: number[] = [];
  const day: number[] = [];
  const delay: number[] = [];
  const jan1 = Math.floor(Date.UTC(2001, 0, 1) / 86_400_000);
  for (let r = 0; r < ROUTES; r++) {
    const o = r % 12;
    const d = (o + 1 + Math.floor(r / 12)) % 12;
    const logitW = -1.4 + TRUE_LOGIT_W_SD * rng.normal();
    const w = 1 / (1 + Math.exp(-logitW));
    for (let i = 0; i < 150; i++) {
      origin.push(o);
      destination.push(d);
      day.push(jan1 + (i % 28));
      const x = rng.uniform() < w ? gumbelSample(rng, 25, 35) : gumbelSample(rng, -5, 9);
      delay.push(Math.max(-120, Math.min(1379, Math.round(x))));
    }
  }
  return { length: delay.length, airports, origin: Uint16Array.from(origin), destination: Uint16Array.from(destination), day: Int32Array.from(day), delayMinutes: Float64Array.from(delay) };
}

const metadata = { id: 't', title: '', source: 'synthetic', license: 'test data', dateRange: { first: '2001-01-01', last: '2001-01-28' }, createdAt: '' };

async function logitWeightRouteSd(rounds: number, seed: number): Promise<{ sd: number; diagnostics: Record<string, unknown> }> {
  const flights = spreadFlights(seed);
  const keep = new Uint8Array(flights.length).fill(1);
  const fitted = await fitBundle(flights, keep, CANDIDATE, { seed: 1, maxIterations: 1500, routeSdEmRounds: rounds, metadata });
  return { sd: fitted.bundle.population.routeSd[4]!, diagnostics: fitted.bundle.metadata.diagnostics };
}

describe('route sds by Laplace-EM', () => {
  it('keeps the spread of a weakly identified route parameter that the joint MAP shrinks away', async () => {
    const joint = await logitWeightRouteSd(0, 11);
    const em = await logitWeightRouteSd(3, 11);
    const msg = `true sd ${TRUE_LOGIT_W_SD}, joint MAP ${joint.sd}, EM ${em.sd}`;
    expect(em.sd, msg).toBeGreaterThan(joint.sd);
    expect(Math.abs(Math.log(em.sd / TRUE_LOGIT_W_SD)), msg).toBeLessThan(Math.abs(Math.log(joint.sd / TRUE_LOGIT_W_SD)));
    expect(em.diagnostics.routeSdEmRounds).toBe(3);
  });
});
