// One entry point for every export: scored trips in, the finished file's text out, for the
// CLI, the Electron main process and the page's worker alike.
import type { ScoredTrips } from '../risk/types';
import { buildBriefings } from './briefings';
import { connectionsCsv } from './connections-csv';
import { buildManagerReport } from './manager-report';
import type { Report, ReportOptions } from './report-model';
import { renderReportHtml } from './render-html';

export type ReportKind = 'manager' | 'briefings';

export const REPORT_KINDS: readonly ReportKind[] = ['manager', 'briefings'];

/** The report model of one kind. */
export function buildReport(scored: ScoredTrips, kind: ReportKind, options: ReportOptions): Report {
  return kind === 'manager' ? buildManagerReport(scored, options) : buildBriefings(scored, options);
}

/** A finished export: its text and what to call it. */
export interface ReportDocument {
  readonly title: string;
  readonly html: string;
}

/** The report of one kind as standalone HTML, with the title the PDF footer prints. */
export function reportDocument(scored: ScoredTrips, kind: ReportKind, options: ReportOptions): ReportDocument {
  const report = buildReport(scored, kind, options);
  return { title: report.title, html: renderReportHtml(report) };
}

/** The connections CSV (the same fields as `layline score --format json`). */
export { connectionsCsv };
