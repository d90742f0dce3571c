import { describe, expect, it } from 'vitest';
import { buildBriefings } from '../../../shared/report/briefings';
import { buildManagerReport } from '../../../shared/report/manager-report';
import { renderReportHtml } from '../../../shared/report/render-html';
import { sampleScoredTrips, tomasTrip } from '../../fixtures/report/scored-sample';

const OPTIONS = { generatedAt: '2026-04-01T09:30:00Z', organisation: 'Tidewater Instruments' };

describe('renderReportHtml', () => {
  const manager = renderReportHtml(buildManagerReport(sampleScoredTrips(), OPTIONS));
  const briefings = renderReportHtml(buildBriefings(sampleScoredTrips(), OPTIONS));

  it.each([
    ['manager', manager],
    ['briefings', briefings],
  ])('makes the %s report one self-contained document: inline style, no script, nothing fetched', (_name, html) => {
    expect(html.startsWith('<!doctype html>')).toBe(true);
    expect(html).toContain('<style>');
    expect(html).not.toMatch(/<script|<link|<img|<iframe|@import|url\(/i);
    expect(html).not.toMatch(/(src|href)=/i);
    expect(html).toContain(`content="default-src 'none'; style-src 'unsafe-inline'; img-src data:"`);
  });

  it('draws the charts as inline SVG with accessible names', () => {
    expect(manager).toMatch(/<svg xmlns="http:\/\/www.w3.org\/2000\/svg" role="img" aria-label="Chance of making each connection against the 90% target"/);
    expect(manager).toMatch(/<svg [^>]*aria-label="Options for Ines Okafor · Lisbon workshop"/);
  });

  it('keeps table rows whole across pages and repeats the header', () => {
    expect(manager).toMatch(/tr \{ break-inside: avoid; page-break-inside: avoid; \}/);
    expect(manager).toMatch(/thead \{ display: table-header-group; \}/);
    expect(briefings).toMatch(/section\.briefing \+ section\.briefing \{ break-before: page;/);
  });

  it('marks rows below the target in words as well as colour', () => {
    expect(manager).toMatch(/<tr class="conn below">[\s\S]*?▲ below/);
  });

  it('starts a new page for every briefing', () => {
    expect(briefings.match(/<section class="briefing"/g)).toHaveLength(4);
  });

  it('escapes pasted text so it cannot become markup', () => {
    const scored = sampleScoredTrips();
    const evil = { ...tomasTrip, traveler: '<script>alert("x")</script> & Co' };
    const html = renderReportHtml(buildManagerReport({ ...scored, trips: scored.trips.map((t) => (t.id === 'tomas' ? evil : t)) }, OPTIONS));
    expect(html).not.toContain('<script>');
    expect(html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; Co');
  });

  it('lists the input problems and the cautions', () => {
    expect(manager).toContain("line 14, warning: column &#39;seat&#39; was ignored");
    expect(manager).toContain('Separate tickets are not protected.');
  });
});
