import { describe, expect, it } from 'vitest';
import { scoreBundle } from '../../../main/pipeline/held-out';
import { methodsMarkdown, replaceMethodsSection } from '../../../main/pipeline/methods-report';
import { createBundleSource } from '../../../shared/delay/bundle/posterior-source';
import { syntheticBundle, syntheticFlights } from '../../shared/delay/bundle/synthetic-bundle';

describe('scoreBundle', () => {
  it('scores every test flight, with observed exceedance counted from the flights themselves', async () => {
    const bundle = await syntheticBundle();
    const flights = syntheticFlights(9);
    const test = new Uint8Array(flights.length).fill(1);
    const source = createBundleSource(bundle, { drawCount: 8 });
    for (const monthsSeen of [true, false]) {
      const report = scoreBundle(source, flights, test, monthsSeen, 'gumbel-mixture', monthsSeen ? 'held-out days' : 'future month');
      expect(report.flights).toBe(flights.length);
      expect(Number.isFinite(report.natsPerFlight)).toBe(true);
      const above60 = Array.from(flights.delayMinutes).filter((d) => d > 60).length / flights.length;
      expect(report.pooled.find((r) => r.minutes === 60)!.observed).toBeCloseTo(above60, 12);
      expect(report.routeMedianAbsRelativeError).toHaveLength(5);
      expect(report.qq!.length).toBeGreaterThan(5);
    }
  });

  it('fits its synthetic truth: pooled P(> 60) within 25% on fresh flights from the same process', async () => {
    const source = createBundleSource(await syntheticBundle(), { drawCount: 8 });
    const flights = syntheticFlights(10);
    const report = scoreBundle(source, flights, new Uint8Array(flights.length).fill(1), true, 'gumbel-mixture', 'held-out days');
    expect(Math.abs(report.pooled.find((r) => r.minutes === 60)!.relativeError!)).toBeLessThan(0.25);
  });
});

describe('the README Methods section', () => {
  it('lists each candidate of each split and replaces only its own part of the README', async () => {
    const bundle = await syntheticBundle();
    const source = createBundleSource(bundle, { drawCount: 8 });
    const flights = syntheticFlights(9);
    const report = scoreBundle(source, flights, new Uint8Array(flights.length).fill(1), true, 'gumbel-mixture', 'held-out days');
    const withComparison = { ...bundle, metadata: { ...bundle.metadata, comparison: [report] } };
    const md = methodsMarkdown(withComparison);
    expect(md).toMatch(/\| gumbel-mixture \| -?\d+\.\d{4} \|/);
    const readme = '# Title\n\nIntro.\n';
    const once = replaceMethodsSection(readme, md);
    expect(once.startsWith(readme.trimEnd())).toBe(true);
    expect(replaceMethodsSection(once, md)).toBe(once);
  });
});
