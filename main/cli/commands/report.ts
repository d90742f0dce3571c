// `layline report <trips-file> --out FILE`: scores the trips as `layline score` does and
// writes the manager report or the per-traveler briefings as PDF or standalone HTML, or the
// connections as CSV. The format follows the extension of --out.
import path from 'node:path';
import { REPORT_KINDS, type ReportKind } from '../../../shared/report/build-report';
import { parsePaperSize } from '../../../shared/report/print-layout';
import { bundleDetailsOf } from '../../../shared/report/bundle-details';
import { RISK_CAUTION } from '../../../shared/risk/types';
import { PdfPrinterMissingError, chromiumPrinter } from '../../report/chromium-pdf';
import { reportFormatFor, writeReport, type PdfPrinter } from '../../report/write-report';
import { parseFlags, type CliCommand } from '../command';
import { CliFailure, UsageError, type CliIo } from '../io';
import { SCORING_FLAGS, SCORING_FLAGS_USAGE, scoreInputWithFlags } from './score';
import { loadPosteriorSource } from './score-source';
import type { PosteriorSource } from '../../../shared/delay/predictive';

const USAGE = `Usage: layline report <file|-> --out FILE [options]

Scores the planned trips in <file> exactly as 'layline score' does (the same options give the
same numbers) and writes a report a manager or a traveler can read.

  --out FILE            report.pdf, report.html or connections.csv: the extension picks the format
                          .pdf   printed with a Chromium-family browser already installed
                          .html  one self-contained file (inline styles and charts), always works
                          .csv   one row per connection, the fields of 'layline score --format json'
  --kind K              manager (default): summary, recommended changes, trip table, charts,
                          group outlook, assumptions, data provenance, cautions
                        briefings: one page per traveler's trip, in plain words
  --paper P             a4 (default) or letter, for PDF
  --title TEXT          the report's title
  --organisation TEXT   shown under the title (e.g. the workspace or event)
  --chromium PATH       the browser to print PDF with (else $LAYLINE_CHROMIUM, else the usual places)

Scoring options, the same as for 'layline score':
${SCORING_FLAGS_USAGE}
The report's date is now, or $SOURCE_DATE_EPOCH (seconds) when set, for reproducible files.
Exit code: 0 when the report was written, 1 when the input or the PDF printer is missing or bad,
2 for usage errors.
${RISK_CAUTION}
`;

/** When the report was made: SOURCE_DATE_EPOCH (reproducible-builds.org) when set, else now. */
export function reportDate(env: NodeJS.ProcessEnv, nowMs: number): string {
  const epoch = env.SOURCE_DATE_EPOCH;
  if (epoch !== undefined && epoch !== '') {
    const seconds = Number(epoch);
    if (!Number.isInteger(seconds) || seconds < 0) throw new UsageError(`report: SOURCE_DATE_EPOCH must be whole seconds since 1970, got '${epoch}'`);
    return new Date(seconds * 1000).toISOString().replace(/\.000Z$/, 'Z');
  }
  return new Date(nowMs).toISOString().replace(/\.\d{3}Z$/, 'Z');
}

export function createReportCommand(loadSource: (bundlePath: string | undefined, io: CliIo) => Promise<PosteriorSource> = loadPosteriorSource): CliCommand {
  return {
    name: 'report',
    summary: 'Write the manager report or traveler briefings (PDF, HTML) or the connections CSV',
    usage: USAGE,
    run: async (argv, io) => {
      const { values, positionals } = parseFlags(
        argv,
        {
          ...SCORING_FLAGS,
          out: { type: 'string' },
          kind: { type: 'string' },
          paper: { type: 'string' },
          title: { type: 'string' },
          organisation: { type: 'string' },
          chromium: { type: 'string' },
        },
        'report',
      );
      if (positionals.length !== 1) throw new UsageError(positionals.length === 0 ? 'report: give a trips file, or - for standard input' : `report: one input at a time, got ${positionals.length}`);
      if (!values.out) throw new UsageError('report: give the output file with --out (report.pdf, report.html or connections.csv)');
      const out = path.resolve(io.cwd, values.out);
      const format = reportFormatFor(out);
      if (format === null) throw new UsageError(`report: --out must end in .pdf, .html or .csv, got '${values.out}'`);
      const kind = (values.kind ?? 'manager') as ReportKind;
      if (!REPORT_KINDS.includes(kind)) throw new UsageError(`report: --kind must be manager or briefings, got '${values.kind}'`);
      if (format === 'csv' && values.kind !== undefined) throw new UsageError('report: --kind does not apply to CSV, which always lists every connection');
      const paper = parsePaperSize(values.paper ?? 'a4');
      if (paper === null) throw new UsageError(`report: --paper must be a4 or letter, got '${values.paper}'`);
      const generatedAt = reportDate(process.env, Date.now());
      // Find the printer before scoring, so a missing browser fails at once with its own message.
      let printPdf: PdfPrinter | undefined;
      try {
        if (format === 'pdf') printPdf = chromiumPrinter({ explicitPath: values.chromium });
      } catch (err) {
        if (err instanceof PdfPrinterMissingError) throw new CliFailure(err.message);
        throw err;
      }

      let source: PosteriorSource | undefined;
      const scored = await scoreInputWithFlags('report', positionals[0] ?? '-', values, io, async (bundlePath, cliIo) => (source = await loadSource(bundlePath, cliIo)));
      if (format === 'pdf') io.stderr(`printing ${path.basename(out)} with Chromium…\n`);
      try {
        const written = await writeReport(scored, out, {
          kind,
          paper,
          printPdf,
          report: { generatedAt, title: values.title, organisation: values.organisation, bundleDetails: source ? bundleDetailsOf(source) : undefined },
        });
        io.stderr(`wrote ${values.out} (${written.format.toUpperCase()}, ${written.bytes.toLocaleString('en-US')} bytes)\n${RISK_CAUTION}\n`);
      } catch (err) {
        if (err instanceof PdfPrinterMissingError) throw new CliFailure(err.message);
        throw new CliFailure(`cannot write ${values.out}: ${err instanceof Error ? err.message : String(err)}`);
      }
      return 0;
    },
  };
}

export const reportCommand: CliCommand = createReportCommand();
