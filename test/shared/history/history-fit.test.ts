import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import gumbel from '@stdlib/stats-base-dists-gumbel';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readHistoryFile } from '../../../main/history/read-history-file';
import { writeSyntheticBtsCsv, type SyntheticRoute } from '../../../main/history/synthetic-history';
import { createBundleSource } from '../../../shared/delay/bundle/posterior-source';
import { dayNumber } from '../../../shared/history/cells';
import { fitRouteHistory, type HistoryFitResult } from '../../../shared/history/history-fit';
import type { HistoryTable } from '../../../shared/history/history-table';
import { FitAbortedError } from '../../../shared/inference/fit-types';

// Round trip: flights drawn from known route parameters (one Gumbel per route, as
// main/history/synthetic-history.ts writes them with disruptedWeight 0) are imported from a
// BTS-layout CSV and fitted; the fit is compared with the true parameters, and its predictive
// with the true exceedance probabilities from @stdlib/stats-base-dists-gumbel.
function trueSurvival(r: SyntheticRoute, t: number): number {
  return 1 - gumbel.cdf(t, r.location, r.scale);
}

const CANDIDATE = { name: 'gumbel', family: 'gumbel', monthEffects: [], description: 'one Gumbel per route' } as const;
const METADATA = { id: 'round-trip', title: 'round trip', source: 'synthetic', license: 'test data', createdAt: '2026-12-01T00:00:00.000Z' };

let dir: string;
let table: HistoryTable;
let routes: readonly SyntheticRoute[];
let result: HistoryFitResult;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-fit-'));
  const file = path.join(dir, 'history.csv');
  ({ routes } = await writeSyntheticBtsCsv(file, { rows: 40_000, seed: 11, firstDay: dayNumber(2024, 1, 1), days: 121, airports: 3, disruptedWeight: 0 }));
  ({ table } = await readHistoryFile(file));
  result = await fitRouteHistory(table, { method: 'map', seed: 3, candidate: { ...CANDIDATE, monthEffects: [...CANDIDATE.monthEffects] }, metadata: METADATA, evaluationDraws: 40 });
}, 120_000);
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('fitRouteHistory on generated data with known parameters', () => {
  it('holds out the last month by default and scores it', () => {
    expect(result.holdout.holdoutAfter).toBe('2024-03-31');
    expect(result.holdout.defaulted).toBe(true);
    expect(result.arrival.flights).toBe(result.holdout.heldOutFlights);
    expect(result.arrival.natsPerFlight).toBeLessThan(0);
    expect(result.arrival.pooled.map((r) => r.minutes)).toEqual([15, 30, 60, 120, 180]);
    expect(result.arrival.qq.length).toBeGreaterThan(5);
  });

  it('recovers every route\'s location and scale, and P(arrival delay > t) within 0.02 of the truth', () => {
    const source = createBundleSource(result.bundle, { drawCount: 60, isKnownAirport: () => true });
    for (const r of routes) {
      const posterior = source.route(r.origin, r.destination, 'arrival');
      expect(posterior.pooling).toBe('route');
      let mu = 0;
      let logBeta = 0;
      for (let s = 0; s < posterior.drawCount; s++) {
        mu += posterior.parameters(s)[0]! / posterior.drawCount;
        logBeta += posterior.parameters(s)[1]! / posterior.drawCount;
      }
      // About 6,500 flights per route: the sd of the location estimate is about 0.12 minutes.
      if (Math.abs(mu - r.location) > 0.6) throw new Error(`${r.origin}-${r.destination}: location ${mu}, truth ${r.location}, tolerance 0.6 min`);
      if (Math.abs(Math.exp(logBeta) / r.scale - 1) > 0.05) throw new Error(`${r.origin}-${r.destination}: scale ${Math.exp(logBeta)}, truth ${r.scale}, tolerance 5%`);
      for (const t of [0, 15, 30, 60, 120]) {
        let p = 0;
        for (let s = 0; s < posterior.drawCount; s++) p += posterior.draw(s).survival(t + 0.5);
        p /= posterior.drawCount;
        const truth = trueSurvival(r, t + 0.5);
        // About 6,500 flights per route: the sampling sd of an exceedance near 0.5 is 0.006. Partial
        // pooling adds a pull toward the airports' additive effects (6 routes on 3 airports): on
        // ATL-ORD the per-route maximum-likelihood fit (SciPy 1.17 gumbel_r.fit on the same rows,
        // location -1.58 min) already gives 0.547 against the truth's 0.536, and the pooled fit about
        // 0.56. So 0.03: about 5 sampling sd, still far below the error of a wrong location or scale.
        if (Math.abs(p - truth) > 0.03) throw new Error(`${r.origin}-${r.destination} t=${t}: fitted ${p}, truth ${truth}, tolerance 0.03`);
      }
    }
  });

  it('fits departure delays directly and serves them as not derived', () => {
    expect(result.departure).not.toBeNull();
    expect(result.bundle.departure.derived).toBe(false);
    expect(result.bundle.departure.fitted).toBeDefined();
    const source = createBundleSource(result.bundle, { drawCount: 40, isKnownAirport: () => true });
    const r = routes[0]!;
    const dep = source.route(r.origin, r.destination, 'departure');
    expect(dep).toMatchObject({ kind: 'departure', derived: false, pooling: 'route' });
    // Truth: departure = arrival + 6 + Normal(0, 4), so its median sits about 6 minutes later.
    const arr = source.route(r.origin, r.destination, 'arrival');
    const median = (p: typeof dep) => {
      let lo = -120;
      let hi = 600;
      for (let i = 0; i < 40; i++) {
        const mid = (lo + hi) / 2;
        let c = 0;
        for (let s = 0; s < p.drawCount; s++) c += p.draw(s).cdf(mid);
        if (c / p.drawCount < 0.5) lo = mid;
        else hi = mid;
      }
      return lo;
    };
    expect(median(dep) - median(arr)).toBeGreaterThan(4);
    expect(median(dep) - median(arr)).toBeLessThan(8);
  });

  it('writes the import, the split and the held-out scores into the bundle metadata', () => {
    const m = result.bundle.metadata;
    expect(m.dateRange).toEqual({ first: table.summary.firstDate, last: table.summary.lastDate });
    expect(m.flights).toBe(table.summary.flights);
    expect(m.comparison.map((c) => c.candidate)).toEqual(['gumbel (arrival delays)', 'gumbel (departure delays)']);
    expect(m.comparison[0]!.split).toBe('held-out month: flights after 2024-03-31');
    expect(m.notes.join(' ')).toMatch(/cancelled/);
  });

  it('rejects with FitAbortedError when cancelled mid-fit', async () => {
    const controller = new AbortController();
    let calls = 0;
    const run = fitRouteHistory(table, {
      method: 'map',
      seed: 3,
      candidate: { ...CANDIDATE, monthEffects: [] },
      metadata: METADATA,
      signal: controller.signal,
      onProgress: (p) => {
        calls++;
        if (p.iteration > 0) controller.abort();
      },
    });
    await expect(run).rejects.toBeInstanceOf(FitAbortedError);
    expect(calls).toBeGreaterThan(0);
  });
});

describe.each(['advi', 'svi'] as const)('fitRouteHistory by %s', (method) => {
  it('recovers every route\'s P(arrival delay > 15 min) within 0.015 of the truth', async () => {
    const fitted = await fitRouteHistory(table, { method, seed: 5, candidate: { ...CANDIDATE, monthEffects: [] }, metadata: METADATA, evaluationDraws: 20 });
    expect(fitted.bundle.metadata.method).toMatch(method === 'advi' ? /ADVI/ : /stochastic VI/);
    const source = createBundleSource(fitted.bundle, { drawCount: 40, isKnownAirport: () => true });
    for (const r of routes) {
      const posterior = source.route(r.origin, r.destination, 'arrival');
      let p = 0;
      for (let s = 0; s < posterior.drawCount; s++) p += posterior.draw(s).survival(15.5) / posterior.drawCount;
      const truth = trueSurvival(r, 15.5);
      if (Math.abs(p - truth) > 0.015) throw new Error(`${method} ${r.origin}-${r.destination}: fitted ${p}, truth ${truth}, tolerance 0.015`);
    }
  }, 60_000);
});
