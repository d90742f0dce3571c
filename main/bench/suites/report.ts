// Benchmarks of the reports (issue 9, no target set): the manager report and the briefings as
// HTML, the connections CSV, and the manager report printed to PDF in headless Chromium, for
// the demo workspace repeated to about 500 trips.
//
// Scored against the risk suite's synthetic posteriors, so the figures do not depend on a fit.
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import { connectionsCsv, reportDocument } from '../../../shared/report/build-report';
import { scoreTrips } from '../../../shared/risk/score-trips';
import { findAirport } from '../../../shared/time/airports';
import { findChromium, printHtmlToPdf, PdfPrinterMissingError } from '../../report/chromium-pdf';
import { timeMedian, type BenchSuite } from '../suite';
import { benchSource } from './risk';

/** The demo's rows repeated with numbered travelers, so shared flights stay shared. */
function repeatedDemo(copies: number): string {
  const [header, ...rows] = DEMO_TRIPS_TEXT.trim().split('\n');
  const out = [header ?? ''];
  for (let k = 0; k < copies; k++) for (const r of rows) out.push(r.replace(/^([^,]+),/, `$1 ${k + 1},`));
  return out.join('\n') + '\n';
}

export const reportSuite: BenchSuite = {
  name: 'report',
  run: async (log) => {
    const scored = scoreTrips(parseTrips(repeatedDemo(17)), benchSource(), { countryOf: (c) => findAirport(c)?.country, simulations: 1000, seed: 1 });
    const options = { generatedAt: '2026-03-01T09:00:00Z', organisation: 'bench' };
    const trips = scored.trips.length;
    const rows = [];
    const manager = reportDocument(scored, 'manager', options);
    rows.push({ name: `manager report HTML, ${trips} trips`, ms: await timeMedian(() => reportDocument(scored, 'manager', options)), notes: `${(manager.html.length / 1024).toFixed(0)} KiB` });
    rows.push({ name: `briefings HTML, ${trips} trips`, ms: await timeMedian(() => reportDocument(scored, 'briefings', options)) });
    rows.push({ name: `connections CSV, ${trips} trips`, ms: await timeMedian(() => connectionsCsv(scored)) });
    try {
      const executablePath = findChromium();
      const start = performance.now();
      const pdf = await printHtmlToPdf(manager.html, { paper: 'A4', title: manager.title, executablePath });
      rows.push({ name: `manager report PDF (Chromium start included), ${trips} trips`, ms: performance.now() - start, notes: `${(pdf.byteLength / 1024).toFixed(0)} KiB` });
    } catch (err) {
      if (!(err instanceof PdfPrinterMissingError)) throw err;
      log(`report: PDF case skipped: ${err.message}`);
    }
    return rows;
  },
};
