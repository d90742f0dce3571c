// Writes a report file: HTML or CSV as text, PDF through the printer the caller passes
// (chromiumPrinter in the CLI, printReportInElectron in the app), so the app never loads the
// CLI's browser driver. The format follows the file's extension. Writes go to a temporary file
// renamed into place, so an interrupted export never leaves half a report where the old one was.
import path from 'node:path';
import { writeFileAtomic } from '../workspace/atomic-write';
import { connectionsCsv, reportDocument, type ReportKind } from '../../shared/report/build-report';
import type { PaperSize } from '../../shared/report/print-layout';
import type { ReportOptions } from '../../shared/report/report-model';
import type { ScoredTrips } from '../../shared/risk/types';

export type ReportFileFormat = 'pdf' | 'html' | 'csv';

/** The format for an output path, from its extension; null when the extension is not one we write. */
export function reportFormatFor(outPath: string): ReportFileFormat | null {
  const ext = path.extname(outPath).toLowerCase();
  if (ext === '.pdf') return 'pdf';
  if (ext === '.html' || ext === '.htm') return 'html';
  if (ext === '.csv') return 'csv';
  return null;
}

/** Prints standalone HTML to PDF bytes: printReportInElectron in the app, Chromium in the CLI. */
export type PdfPrinter = (html: string, paper: PaperSize, title: string) => Promise<Uint8Array>;

export interface WriteReportOptions {
  readonly kind: ReportKind;
  readonly paper: PaperSize;
  /** How to print PDF; needed only for a .pdf path. */
  readonly printPdf?: PdfPrinter;
  readonly report: ReportOptions;
}

/** Writes the report and resolves with its format and size in bytes. */
export async function writeReport(scored: ScoredTrips, outPath: string, options: WriteReportOptions): Promise<{ format: ReportFileFormat; bytes: number }> {
  const format = reportFormatFor(outPath);
  if (format === null) throw new Error(`cannot tell the format of ${outPath}: name it .pdf, .html or .csv`);
  if (format === 'csv') {
    const csv = connectionsCsv(scored);
    await writeFileAtomic(outPath, csv);
    return { format, bytes: Buffer.byteLength(csv) };
  }
  const doc = reportDocument(scored, options.kind, options.report);
  if (format === 'html') {
    await writeFileAtomic(outPath, doc.html);
    return { format, bytes: Buffer.byteLength(doc.html) };
  }
  if (!options.printPdf) throw new Error(`no PDF printer was given for ${outPath}`);
  const pdf = await options.printPdf(doc.html, options.paper, doc.title);
  await writeFileAtomic(outPath, pdf);
  return { format, bytes: pdf.byteLength };
}
