// `layline report` in-process, on the demo workspace's trips with the risk tests' synthetic
// posterior source; the real built binary and PDF printing are in test/e2e/report-pdf.test.ts.
import { mkdtempSync, readFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { createReportCommand, reportDate } from '../../../main/cli/commands/report';
import { createScoreCommand } from '../../../main/cli/commands/score';
import type { CliIo } from '../../../main/cli/io';
import { runCli } from '../../../main/cli/run';
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { connectionFromCsvRecord } from '../../../shared/report/connections-csv';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const dir = mkdtempSync(path.join(tmpdir(), 'layline-report-test-'));
const source = async () => syntheticSource({ draws: 32, seed: 3 });
const commands = [createReportCommand(source), createScoreCommand(source)];

async function run(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdout: (t) => out.push(t),
    stderr: (t) => err.push(t),
    stderrIsTty: false,
    cwd: dir,
    readInput: async (p) => {
      if (p !== 'demo.csv') throw new Error(`no such file: ${p}`);
      return DEMO_TRIPS_TEXT;
    },
  };
  const code = await runCli(args, io, commands);
  return { code, out: out.join(''), err: err.join('') };
}

describe('layline report', () => {
  it('writes the manager report as standalone HTML with the numbers layline score gives', async () => {
    const score = await run(['score', 'demo.csv', '--format', 'json', '--seed', '5', '--simulations', '1000']);
    expect(score.code).toBe(0);
    const json = JSON.parse(score.out) as { group: { travelers: number; expectedMisconnecting: number } };
    const result = await run(['report', 'demo.csv', '--out', 'manager.html', '--seed', '5', '--simulations', '1000', '--organisation', 'Tidewater Survey Instruments']);
    expect(result.code).toBe(0);
    expect(result.err).toMatch(/wrote manager\.html \(HTML, [\d,]+ bytes\)/);
    const html = readFileSync(path.join(dir, 'manager.html'), 'utf8');
    expect(html).toContain(`Layline scored ${json.group.travelers} travelers`);
    expect(html).toContain(`about ${json.group.expectedMisconnecting.toFixed(1)} of ${json.group.travelers} travelers are expected to miss at least one connection`);
    expect(html).toContain('Tidewater Survey Instruments');
  });

  it('writes one briefing per traveler', async () => {
    const result = await run(['report', 'demo.csv', '--out', 'briefings.html', '--kind', 'briefings']);
    expect(result.code).toBe(0);
    const html = readFileSync(path.join(dir, 'briefings.html'), 'utf8');
    expect(html.match(/<section class="briefing"/g)).toHaveLength(30);
    expect(html).toContain('Sunniva Aldana');
  });

  it('writes the connections CSV, which parses back to the JSON of layline score (csv-parse, RFC 4180)', async () => {
    const score = await run(['score', 'demo.csv', '--format', 'json', '--seed', '9', '--simulations', '1000']);
    const json = JSON.parse(score.out) as { trips: { id: string; connections: Record<string, unknown>[] }[] };
    expect((await run(['report', 'demo.csv', '--out', 'connections.csv', '--seed', '9', '--simulations', '1000'])).code).toBe(0);
    const records = (parse(readFileSync(path.join(dir, 'connections.csv'), 'utf8'), { columns: true }) as Record<string, string>[]).map(connectionFromCsvRecord);
    const expected = json.trips.flatMap((t) => t.connections.map((c, i) => ({ tripId: t.id, connectionIndex: i, connection: c })));
    expect(records.map((r) => ({ tripId: r.tripId, connectionIndex: r.connectionIndex, connection: r.connection }))).toEqual(expected);
  });

  it('refuses a missing --out, an unknown extension, kind or paper (exit 2)', async () => {
    expect((await run(['report', 'demo.csv'])).err).toContain('give the output file with --out');
    expect((await run(['report', 'demo.csv', '--out', 'r.docx'])).code).toBe(2);
    expect((await run(['report', 'demo.csv', '--out', 'r.html', '--kind', 'memo'])).err).toContain('--kind must be manager or briefings');
    expect((await run(['report', 'demo.csv', '--out', 'r.pdf', '--paper', 'legal'])).err).toContain('--paper must be a4 or letter');
    expect((await run(['report', 'demo.csv', '--out', 'r.csv', '--kind', 'briefings'])).code).toBe(2);
    expect((await run(['report', 'demo.csv', '--out', 'r.html', '--target', '1.5'])).code).toBe(2);
  });

  it('names what is missing when no Chromium can print the PDF (exit 1), and writes nothing', async () => {
    const result = await run(['report', 'demo.csv', '--out', 'nothing.pdf', '--chromium', '/nonexistent/chromium']);
    expect(result.code).toBe(1);
    expect(result.err).toContain('PDF output needs Chromium, but --chromium points to /nonexistent/chromium, which does not exist.');
    expect(existsSync(path.join(dir, 'nothing.pdf'))).toBe(false);
  });

  it('fails with a clear message for an unreadable trips file', async () => {
    const result = await run(['report', 'missing.csv', '--out', 'x.html']);
    expect(result.code).toBe(1);
    expect(result.err).toContain('missing.csv');
  });
});

describe('reportDate', () => {
  it('uses SOURCE_DATE_EPOCH for reproducible files (reproducible-builds.org), else now', () => {
    expect(reportDate({ SOURCE_DATE_EPOCH: '1772000000' }, 0)).toBe('2026-02-25T06:13:20Z');
    expect(reportDate({}, Date.UTC(2026, 2, 1, 8, 30, 15, 250))).toBe('2026-03-01T08:30:15Z');
    expect(() => reportDate({ SOURCE_DATE_EPOCH: 'soon' }, 0)).toThrow(/SOURCE_DATE_EPOCH/);
  });
});
