// The engine requests, with the real parser and risk engine over the risk tests' synthetic
// posterior source (the real bundle's figures are checked by its own tests).
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { createEngineHandlers, rebinMargin } from '../../../shared/api/engine-handlers';
import { realEngineDeps } from '../../../shared/api/engine-deps';
import { calendarDaysBetween, zoneAbbreviation } from '../../../shared/api/trip-views';
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const engine = () => createEngineHandlers(realEngineDeps(() => performance.now(), async () => syntheticSource({ draws: 32 })));

describe('analyzeTrips', () => {
  it('scores every connection of the demo and keeps every trip', async () => {
    const a = await engine().analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    expect(a.scoringError).toBeNull();
    expect(a.trips).toHaveLength(32);
    const connections = a.trips.flatMap((t) => t.connections);
    expect(connections.length).toBeGreaterThan(20);
    for (const c of connections) {
      expect(c.pMake).not.toBeNull();
      expect(c.pMakeLo!).toBeLessThanOrEqual(c.pMake!);
      expect(c.pMakeHi!).toBeGreaterThanOrEqual(c.pMake!);
      if (c.minLayoverMinutes !== null) expect(c.marginMinutes).toBe(c.layoverMinutes - c.minLayoverMinutes);
    }
    expect(a.group?.travelers).toBe(30);
    expect(a.group?.countDistribution.reduce((s, p) => s + p, 0)).toBeCloseTo(1, 9);
  });

  it('a higher target never lowers a minimum layover', async () => {
    const e = engine();
    const at90 = await e.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    const at98 = await e.analyzeTrips(DEMO_TRIPS_TEXT, { ...DEFAULT_ANALYSIS_SETTINGS, targetProbability: 0.98 });
    const mins = (a: typeof at90) => a.trips.flatMap((t) => t.connections.map((c) => c.minLayoverMinutes ?? Infinity));
    const low = mins(at90);
    const high = mins(at98);
    high.forEach((m, i) => expect(m).toBeGreaterThanOrEqual(low[i]!));
    expect(high.some((m, i) => m > low[i]!)).toBe(true);
  });

  it('applies an MCT override to its airport', async () => {
    const a = await engine().analyzeTrips(DEMO_TRIPS_TEXT, { ...DEFAULT_ANALYSIS_SETTINGS, mctOverrides: [{ airport: 'ORD', connectionType: 'domestic', minutes: 70 }] });
    const ord = a.trips.flatMap((t) => t.connections).filter((c) => c.airport === 'ORD');
    expect(ord.length).toBeGreaterThan(0);
    expect(ord.every((c) => c.mctMinutes === 70 && c.mctSource === 'override')).toBe(true);
  });

  it('reads the trips but reports the reason when no bundle can be loaded', async () => {
    const e = createEngineHandlers(
      realEngineDeps(
        () => 0,
        async () => {
          throw new Error('bundle file missing');
        },
      ),
    );
    const a = await e.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    expect(a.trips).toHaveLength(32);
    expect(a.scoringError).toMatch(/bundle file missing/);
    expect(a.trips.every((t) => t.connections.every((c) => c.pMake === null && c.unscoredReason))).toBe(true);
    await expect(e.getBundleInfo()).resolves.toEqual({ bundle: null, error: 'bundle file missing' });
  });

  it('gives local zone abbreviations and day changes (IANA tz database: Chicago is CDT after 8 March 2026)', async () => {
    expect(zoneAbbreviation('America/Chicago', Date.UTC(2026, 2, 8, 22))).toBe('CDT');
    expect(zoneAbbreviation('America/Chicago', Date.UTC(2026, 2, 7, 22))).toBe('CST');
    expect(zoneAbbreviation('America/Phoenix', Date.UTC(2026, 6, 1))).toBe('MST');
    expect(calendarDaysBetween('2026-03-07T23:10', '2026-03-08T06:05')).toBe(1);
    const a = await engine().analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    const redEye = a.trips.find((t) => t.traveler === 'Ezra Blackwood')?.legs[0];
    expect(redEye).toMatchObject({ departZoneAbbr: 'PST', arriveZoneAbbr: 'CDT', arriveDayOffset: 1, durationMinutes: 235 });
  });
});

describe('connectionCurve', () => {
  it('charts a connection consistently with its score', async () => {
    const e = engine();
    const a = await e.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    const trip = a.trips.find((t) => t.traveler === 'Ines Calloway')!;
    const c = trip.connections[0]!;
    const curve = await e.connectionCurve(a.analysisId, trip.id, 0);
    expect(curve.layoverMinutes).toBe(c.layoverMinutes);
    expect(curve.minLayoverMinutes).toBe(c.minLayoverMinutes);
    const ps = curve.points.map((p) => p.p);
    expect(ps).toEqual([...ps].sort((x, y) => x - y));
    const pMissFromBars = curve.margin.filter((b) => b.marginMinutes < 0).reduce((s, b) => s + b.probability, 0);
    // The bars cover the 0.1% to 99.9% quantiles, so up to 0.002 of the mass lies outside them.
    expect(Math.abs(1 - pMissFromBars - c.pMake!)).toBeLessThan(0.0021);
  });

  it('refuses an analysis it no longer keeps, and a connection that does not exist', async () => {
    const e = engine();
    const a = await e.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    await expect(e.connectionCurve('999', a.trips[0]!.id, 0)).rejects.toThrow(/no longer kept/);
    await expect(e.connectionCurve(a.analysisId, a.trips[0]!.id, 9)).rejects.toThrow(/has no connection 9/);
  });

  it('sums one-minute margin bins into wider bars without losing probability', () => {
    const bars = rebinMargin({ layoverMinutes: 45, mctMinutes: 45, marginMinutes: [-2, -1, 0, 1, 2, 3, 4, 5], probability: [0.1, 0.1, 0.2, 0.2, 0.1, 0.1, 0.1, 0.1], cdf: [], cdfLo: [], cdfHi: [], intervalLevel: 0.9, pMake: 0.8 }, 5);
    // Bars are (m, m + 5]: -2, -1 and 0 fall in (-5, 0], a miss; 1 to 5 in (0, 5].
    expect(bars.map((b) => b.marginMinutes)).toEqual([-5, 0]);
    expect(bars.map((b) => Number(b.probability.toFixed(6)))).toEqual([0.4, 0.6]);
  });
});

describe('exportReport', () => {
  it('exports the manager report, the briefings and the connections CSV of an analysis', async () => {
    const e = engine();
    const a = await e.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    const manager = await e.exportReport(a.analysisId, 'manager');
    expect(manager.mimeType).toBe('text/html');
    expect(manager.fileName).toMatch(/^layline-report-\d{4}-\d{2}-\d{2}\.html$/);
    expect(manager.text).toMatch(/^<!doctype html>/i);
    expect(manager.text).toMatch(/not a guarantee/i);
    const briefings = await e.exportReport(a.analysisId, 'briefings');
    expect(briefings.fileName).toMatch(/^layline-briefings-/);
    expect(briefings.text).not.toBe(manager.text);
    const csv = await e.exportReport(a.analysisId, 'connections');
    expect(csv.mimeType).toBe('text/csv');
    // Parsed with csv-parse (RFC 4180): one record per connection of the analysis.
    const records = parse(csv.text, { columns: true }) as Record<string, string>[];
    expect(records.length).toBe(a.trips.reduce((n, t) => n + t.connections.length, 0));
  });

  it('refuses an analysis it no longer keeps', async () => {
    await expect(engine().exportReport('999', 'manager')).rejects.toThrow(/no longer kept/);
  });
});
