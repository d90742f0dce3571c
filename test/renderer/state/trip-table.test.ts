// Sorting, filtering and risk bands of the trips table, on the demo scored by the real engine.
import { describe, expect, it } from 'vitest';
import { createEngineHandlers } from '../../../shared/api/engine-handlers';
import { realEngineDeps } from '../../../shared/api/engine-deps';
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { filterTrips, flagWords, NO_FILTER, riskBand, sortTrips } from '../../../renderer/state/trip-table';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const engine = createEngineHandlers(realEngineDeps(() => performance.now(), async () => syntheticSource({ draws: 32 })));
const analysis = await engine.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);

describe('risk bands', () => {
  it('puts a probability at or above the target in "meets", within 10 points in "near", else "below"', () => {
    expect(riskBand(0.9, 0.9)).toBe('meets');
    expect(riskBand(0.85, 0.9)).toBe('near');
    expect(riskBand(0.8, 0.9)).toBe('near');
    expect(riskBand(0.79, 0.9)).toBe('below');
    expect(riskBand(null, 0.9)).toBe('unscored');
  });
});

describe('the trips table', () => {
  it('sorts the riskiest trips first and unscored (nonstop) trips last', () => {
    const sorted = sortTrips(analysis.trips, 'risk');
    const scored = sorted.filter((t) => t.connections.length > 0).map((t) => t.pAllConnections ?? 1);
    expect(scored).toEqual([...scored].sort((a, b) => a - b));
    expect(sorted.slice(-5).every((t) => t.connections.length === 0)).toBe(true);
  });

  it('filters by traveler name, case-insensitively, and by airport', () => {
    expect(filterTrips(analysis.trips, { ...NO_FILTER, traveler: 'PRIYA' }, 0.9).map((t) => t.option)).toEqual(expect.arrayContaining(['A via DFW', 'B via ORD']));
    const viaClt = filterTrips(analysis.trips, { ...NO_FILTER, airport: 'clt' }, 0.9);
    expect(viaClt.length).toBeGreaterThan(0);
    expect(viaClt.every((t) => t.legs.some((l) => l.from === 'CLT' || l.to === 'CLT'))).toBe(true);
  });

  it('keeps only trips short of the target when asked', () => {
    const short = filterTrips(analysis.trips, { ...NO_FILTER, shortOnly: true }, 0.9);
    expect(short.every((t) => t.connections.some((c) => (c.pMake ?? 1) < 0.9))).toBe(true);
  });

  it('writes flags as words', () => {
    expect(flagWords('separate-tickets')).toMatch(/not protected/);
    expect(flagWords('some-new-flag')).toBe('some new flag');
  });
});
