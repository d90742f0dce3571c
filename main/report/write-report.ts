// Writes a report file: HTML or CSV as text, PDF through a headless Chromium. The format
// follows the file's extension. Writes go to a temporary file renamed into place, so an
// interrupted export never leaves half a report where the old one was.
import { rename, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { connectionsCsv, reportDocument, type ReportKind } from '../../shared/report/build-report';
import type { PaperSize } from '../../shared/report/print-layout';
import type { ReportOptions } from '../../shared/report/report-model';
import type { ScoredTrips } from '../../shared/risk/types';
import { findChromium, printHtmlToPdf } from './chromium-pdf';

export type ReportFileFormat = 'pdf' | 'html' | 'csv';

/** The format for an output path, from its extension; null when the extension is not one we write. */
export function reportFormatFor(outPath: string): ReportFileFormat | null {
  const ext = path.extname(outPath).toLowerCase();
  if (ext === '.pdf') return 'pdf';
  if (ext === '.html' || ext === '.htm') return 'html';
  if (ext === '.csv') return 'csv';
  return null;
}

export interface WriteReportOptions {
  readonly kind: ReportKind;
  readonly paper: PaperSize;
  /** An explicit Chromium for PDF output (--chromium); else found by findChromium. */
  readonly chromiumPath?: string;
  readonly report: ReportOptions;
}

async function writeAtomically(outPath: string, data: string | Uint8Array): Promise<void> {
  const tmp = path.join(path.dirname(outPath), `.${path.basename(outPath)}.${process.pid}.tmp`);
  try {
    await writeFile(tmp, data);
    await rename(tmp, outPath);
  } catch (err) {
    await rm(tmp, { force: true });
    throw err;
  }
}

/** Writes the report and resolves with its format and size in bytes. */
export async function writeReport(scored: ScoredTrips, outPath: string, options: WriteReportOptions): Promise<{ format: ReportFileFormat; bytes: number }> {
  const format = reportFormatFor(outPath);
  if (format === null) throw new Error(`cannot tell the format of ${outPath}: name it .pdf, .html or .csv`);
  if (format === 'csv') {
    const csv = connectionsCsv(scored);
    await writeAtomically(outPath, csv);
    return { format, bytes: Buffer.byteLength(csv) };
  }
  const doc = reportDocument(scored, options.kind, options.report);
  if (format === 'html') {
    await writeAtomically(outPath, doc.html);
    return { format, bytes: Buffer.byteLength(doc.html) };
  }
  // Find the browser before any work, so a missing one fails fast with its own message.
  const executablePath = findChromium({ explicitPath: options.chromiumPath });
  const pdf = await printHtmlToPdf(doc.html, { paper: options.paper, title: doc.title, executablePath });
  await writeAtomically(outPath, pdf);
  return { format, bytes: pdf.byteLength };
}
