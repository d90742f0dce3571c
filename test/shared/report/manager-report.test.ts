import { describe, expect, it } from 'vitest';
import type { ScoredTrips } from '../../../shared/risk/types';
import { REPORT_CAUTIONS, buildManagerReport } from '../../../shared/report/manager-report';
import { sampleScoredTrips, tomasTrip } from '../../fixtures/report/scored-sample';

const OPTIONS = { generatedAt: '2026-04-01T09:30:00Z', organisation: 'Tidewater Instruments' };

describe('buildManagerReport', () => {
  const report = buildManagerReport(sampleScoredTrips(), OPTIONS);

  it('counts travelers, trips and the connections of the best-ranked option of each trip', () => {
    expect(report.summary).toMatchObject({ travelers: 4, trips: 4, tripsWithOptions: 1, connections: 5, belowTarget: 1, belowMct: 0, separateTickets: 1 });
    expect(report.summary.text).toContain('Layline scored 4 travelers on 4 trips with 5 connections');
    expect(report.summary.text).toContain('1 connection is below the target of 90%.');
    expect(report.summary.text).toContain('about 0.6 of 4 travelers are expected to miss at least one connection');
    expect(report.summary.text).toContain('46% (about 5 in 10)');
  });

  it('marks the alternative option as not counted and keeps it in the table', () => {
    const ines = report.trips.filter((t) => t.traveler === 'Ines Okafor');
    expect(ines.map((t) => [t.option, t.counted])).toEqual([
      ['B (ranked 1 of 2, not beaten)', true],
      ['A (ranked 2 of 2, not beaten)', false],
    ]);
    expect(report.trips).toHaveLength(5);
  });

  it('recommends the layover that reaches the target for a connection below it, in natural frequencies', () => {
    const first = report.recommendations[0];
    expect(first?.kind).toBe('connection');
    expect(first?.subject).toBe('Tomas Brandt · Lisbon workshop · ORD (UA 2214 → UA 958)');
    expect(first?.finding).toContain('made 78% of the time, 90% interval 69–86%: about 1 in 5 travelers on it would miss it');
    expect(first?.action).toContain('A layover of at least 1 h 12 min reaches the 90% target');
    expect(first?.action).toContain('at least 32 min later');
  });

  it('makes one recommendation for a connection that several travelers share', () => {
    const scored = sampleScoredTrips();
    const ada = { ...tomasTrip, id: 'ada', traveler: 'Ada Fenn', optionGroup: 'Ada Fenn|Lisbon workshop' };
    const r = buildManagerReport({ ...scored, trips: [...scored.trips, ada] }, OPTIONS);
    const ord = r.recommendations.filter((x) => x.kind === 'connection');
    expect(ord).toHaveLength(1);
    expect(ord[0]?.subject).toBe('Tomas Brandt, Ada Fenn (2 travelers) · Lisbon workshop · ORD (UA 2214 → UA 958)');
  });

  it('does not recommend changes to an alternative that is not counted', () => {
    expect(report.recommendations.some((r) => r.subject.includes('option A'))).toBe(false);
  });

  it('flags a deadline at risk and a separate-tickets connection', () => {
    const kinds = report.recommendations.map((r) => `${r.kind}:${r.subject}`);
    expect(kinds).toEqual([
      'connection:Tomas Brandt · Lisbon workshop · ORD (UA 2214 → UA 958)',
      'deadline:Priya Venkataraman · Lisbon workshop',
      'separate-tickets:Priya Venkataraman · Lisbon workshop · LHR (AA 100 → TP 1351)',
    ]);
    expect(report.recommendations[1]?.finding).toContain('83% of the time: about 1 in 6 would be late');
  });

  it('suggests a different routing or a night at the hub when no layover reaches the target', () => {
    const scored = sampleScoredTrips();
    const unreachable = { ...tomasTrip, connections: tomasTrip.connections.map((c, i) => (i === 0 ? { ...c, minLayoverMinutes: null, marginMinutes: null, flags: ['below-target' as const, 'target-unreachable' as const] } : c)) };
    const r = buildManagerReport({ ...scored, trips: scored.trips.map((t) => (t.id === 'tomas' ? unreachable : t)) }, OPTIONS);
    expect(r.recommendations[0]?.action).toBe('No same-day layover reaches the 90% target: choose a different routing, or a night at Chicago (ORD) before the onward flight.');
    expect(r.trips.find((t) => t.traveler === 'Tomas Brandt')?.connections[0]?.minLayover).toBe('out of reach');
  });

  it('charts each distinct connection once, lowest chance first, naming how many travelers share it', () => {
    const rows = report.connectionChart.chunks.flat();
    expect(rows.map((r) => r.label)).toEqual([
      'ORD UA 2214 → UA 958, 04-14',
      'LHR UA 958 → BA 500, 04-15 (2 travelers)',
      'LHR AA 100 → TP 1351, 04-15',
      'ORD UA 1190 → UA 958, 04-14',
    ]);
    expect(rows.map((r) => r.p)).toEqual([0.78, 0.93, 0.955, 0.995]);
  });

  it('compares the options of a trip in one sentence', () => {
    expect(report.optionComparisons).toHaveLength(1);
    expect(report.optionComparisons[0]?.sentence).toMatch(/^Option B is ranked first: on time \(within 15 minutes of schedule\) 74% of the time, versus 58% for option A/);
    expect(report.optionComparisons[0]?.bars.map((b) => b.label)).toEqual(['Option B', 'Option A']);
  });

  it('lists the assumptions: target, MCT values used, rebooking gap', () => {
    const byLabel = Object.fromEntries(report.assumptions.map((a) => [a.label, a.value]));
    expect(byLabel.Target).toBe('90% chance of making each connection');
    expect(byLabel['Minimum connection times']).toContain('ORD domestic to international: 1 h (default)');
    expect(byLabel['Minimum connection times']).toContain('LHR international transit: 1 h (default)');
    expect(byLabel.Rebooking).toBe('3 h from a missed connection to the next departure (all trips)');
  });

  it('gives the data behind each route, or says it is pooled', () => {
    const routes = Object.fromEntries(report.provenance.routes.map((r) => [r.label, r.value]));
    expect(routes['MSP → ORD, arrivals']).toBe('1,840 flights');
    expect(routes['LHR → LIS, departures']).toBe('pooled: route not in the data, estimated from its airports');
    const withDates = buildManagerReport(sampleScoredTrips(), { ...OPTIONS, bundleDetails: { dateRange: { first: '2001-01-01', last: '2001-03-31' }, flights: 231_000 } });
    expect(withDates.provenance.bundle).toContainEqual({ label: 'Flights dated', value: '2001-01-01 to 2001-03-31' });
    expect(withDates.provenance.bundle).toContainEqual({ label: 'Flights in the fit', value: '231,000' });
  });

  it('carries every caution the issue asks for, and the pooled-route caution when a route is pooled', () => {
    for (const c of REPORT_CAUTIONS) expect(report.cautions).toContain(c);
    const all = report.cautions.join(' ');
    expect(all).toMatch(/not a guarantee/);
    expect(all).toMatch(/Cancellations.*not fully represented/);
    expect(all).toMatch(/conditions of carriage/);
    expect(all).toMatch(/Separate tickets are not protected/);
    expect(all).toMatch(/pooled from similar routes/);
  });

  it("does not repeat the engine's standard caution, but keeps a different one", () => {
    expect(report.cautions).toHaveLength(REPORT_CAUTIONS.length + 1);
    const custom = buildManagerReport({ ...sampleScoredTrips(), caution: 'Scored against a test bundle.' }, OPTIONS);
    expect(custom.cautions[custom.cautions.length - 1]).toBe('Scored against a test bundle.');
  });

  it('keeps the input problems so nothing is lost', () => {
    expect(report.problems).toEqual([{ line: 14, severity: 'warning', code: 'unknown-column', message: "column 'seat' was ignored" }]);
  });

  it('gives the same report for the same input', () => {
    expect(JSON.stringify(buildManagerReport(sampleScoredTrips(), OPTIONS))).toBe(JSON.stringify(report));
  });

  it('reports an empty workspace without failing', () => {
    const empty: ScoredTrips = { ...sampleScoredTrips(), trips: [], problems: [], group: { ...sampleScoredTrips().group, travelers: 0, expectedMisconnecting: 0, pAtLeast: { '1': 0, '2': 0, '3': 0, '4': 0, '5': 0 }, countDistribution: [1], topConnections: [] } };
    const r = buildManagerReport(empty, OPTIONS);
    expect(r.summary.text).toContain('Layline scored 0 travelers on 0 trips with 0 connections.');
    expect(r.recommendations).toEqual([]);
    expect(r.connectionChart.chunks).toEqual([]);
  });
});
