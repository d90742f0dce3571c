// `layline report` end to end on the demo workspace: the built binary scores the input with the
// bundled posteriors, prints the report to PDF in Debian's Chromium, and the PDFs are checked
// with poppler-utils (pdfinfo, pdftotext, pdftoppm), an outside PDF reader, against the numbers
// `layline score` prints for the same input and seed.
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { parse } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadDefaultPosteriorSource } from '../../shared/delay/bundle/default-bundle';
import { DEMO_ORGANISATION, DEMO_TRIPS_TEXT } from '../../shared/demo/demo-workspace';
import { connectionFromCsvRecord } from '../../shared/report/connections-csv';
import { formatPercent } from '../../shared/report/format';
import { artifactsDir, repoRoot } from './harness';

const exec = promisify(execFile);
const cli = path.join(repoRoot, 'dist', 'cli', 'layline.cjs');
const work = mkdtempSync(path.join(tmpdir(), 'layline-report-e2e-'));
const trips = path.join(work, 'demo-trips.csv');
const SEED = ['--seed', '11', '--simulations', '1000'];
const ENV = { ...process.env, SOURCE_DATE_EPOCH: '1772355600' };

async function layline(args: string[]): Promise<{ stdout: string; stderr: string }> {
  return exec(process.execPath, [cli, ...args], { cwd: work, env: ENV, maxBuffer: 64 * 1024 * 1024 });
}

async function pdfInfo(file: string): Promise<{ pages: number; size: string }> {
  const { stdout } = await exec('pdfinfo', [file]);
  return { pages: Number(/^Pages:\s+(\d+)/m.exec(stdout)?.[1]), size: /^Page size:\s+(.*)$/m.exec(stdout)?.[1] ?? '' };
}

async function pdfText(file: string, page?: number): Promise<string> {
  const range = page === undefined ? [] : ['-f', String(page), '-l', String(page)];
  return (await exec('pdftotext', ['-layout', ...range, file, '-'], { maxBuffer: 64 * 1024 * 1024 })).stdout;
}

async function firstPagePng(file: string, name: string): Promise<string> {
  mkdirSync(artifactsDir, { recursive: true });
  const prefix = path.join(artifactsDir, name);
  await exec('pdftoppm', ['-f', '1', '-l', '1', '-r', '80', '-png', '-singlefile', file, prefix]);
  return `${prefix}.png`;
}

interface ScoreJson {
  trips: { id: string; traveler: string; trip: string; optionGroup: string; optionRank: number; pAllConnections: number; connections: ({ scored: boolean; pMake: number | null } & Record<string, unknown>)[] }[];
  target: number;
  group: { travelers: number; expectedMisconnecting: number; pAtLeast: Record<string, number> };
}

let score: ScoreJson;

beforeAll(async () => {
  writeFileSync(trips, DEMO_TRIPS_TEXT);
  score = JSON.parse((await layline(['score', trips, '--format', 'json', ...SEED])).stdout) as ScoreJson;
}, 60_000);

/** The best-ranked option of each trip: what the report and the group count. */
function counted(json: ScoreJson) {
  const best = new Map<string, ScoreJson['trips'][number]>();
  for (const t of json.trips) if (!best.has(t.optionGroup) || t.optionRank < (best.get(t.optionGroup)?.optionRank ?? Infinity)) best.set(t.optionGroup, t);
  return [...best.values()];
}

describe('layline report (PDF, demo workspace)', () => {
  it('prints the manager report on A4 with the summary numbers layline score gives', async () => {
    const pdf = path.join(work, 'manager.pdf');
    const { stderr } = await layline(['report', trips, '--out', pdf, '--organisation', DEMO_ORGANISATION, ...SEED]);
    expect(stderr).toMatch(/wrote .*manager\.pdf \(PDF/);
    const info = await pdfInfo(pdf);
    expect(info.size).toMatch(/\(A4\)/);
    expect(info.pages).toBeGreaterThanOrEqual(3);
    expect(info.pages).toBeLessThanOrEqual(14);

    const text = (await pdfText(pdf)).replace(/\s+/g, ' ');
    const best = counted(score);
    const connections = best.flatMap((t) => t.connections.filter((c) => c.scored && c.pMake !== null));
    const below = connections.filter((c) => (c.pMake ?? 1) < score.target).length;
    const { travelers, expectedMisconnecting, pAtLeast } = score.group;
    expect(text).toContain(`Layline scored ${travelers} travelers on ${best.length} trips with ${connections.length} connections`);
    expect(text).toContain(`about ${expectedMisconnecting.toFixed(1)} of ${travelers} travelers are expected to miss at least one connection`);
    expect(text).toContain(`the chance that at least one traveler misses is ${formatPercent(pAtLeast['1'] ?? NaN)}`);
    expect(text).toContain(below === 0 ? 'Every connection reaches the target of 90%' : `${below} connection${below === 1 ? ' is' : 's are'} below the target of 90%`);
    for (const t of best) expect(text).toContain(t.traveler);
    expect(text).toContain('These are estimates from historical delay data, not a guarantee.');
    expect(text).toContain('Separate tickets are not protected.');
    expect(text).toMatch(/Page 1 of \d+/);
    const meta = loadDefaultPosteriorSource().bundle.metadata;
    expect(text).toContain(`Flights dated ${meta.dateRange.first} to ${meta.dateRange.last}`);

    const png = await firstPagePng(pdf, 'report-manager-page1');
    expect(readFileSync(png).subarray(1, 4).toString()).toBe('PNG');
  });

  it('never splits a table row across pages: each page continues with a whole row after the repeated header', async () => {
    const pdf = path.join(work, 'manager-letter.pdf');
    await layline(['report', trips, '--out', pdf, '--paper', 'letter', ...SEED]);
    expect((await pdfInfo(pdf)).size).toMatch(/\(letter\)/);
    const pages = (await pdfText(pdf)).split('\f');
    let continued = 0;
    for (const page of pages) {
      const lines = page.split('\n');
      const header = lines.findIndex((l) => /^\s*Connection\s+Layover\s+MCT\s+Min\. layover/.test(l));
      if (header < 0) continue;
      const next = lines.slice(header + 1).find((l) => l.trim() !== '');
      if (next === undefined) continue;
      continued++;
      // A whole row starts with a trip's heading (traveler · trip) or a connection's first line
      // (airport code, then its numbers); a split row would start with its second line (the flights).
      expect(next, `page starts mid-row:\n${page.slice(0, 600)}`).toMatch(/^\s*(?:[A-Z]{3}(?: \/ [A-Z]{3})?\s{2,}.*\d+%|(?!All connections)[^→]+ · [^→]+)$/);
    }
    expect(continued).toBeGreaterThan(0);
  });

  it('prints one briefing page per traveler on US Letter, in plain words', async () => {
    const pdf = path.join(work, 'briefings.pdf');
    await layline(['report', trips, '--out', pdf, '--kind', 'briefings', '--paper', 'letter', ...SEED]);
    const best = counted(score);
    const info = await pdfInfo(pdf);
    expect(info.size).toMatch(/\(letter\)/);
    expect(info.pages).toBe(best.length);
    for (let page = 1; page <= info.pages; page += 7) {
      const text = await pdfText(pdf, page);
      expect(text).toMatch(/Your flights/);
      expect(text).toMatch(/These chances come from how late flights like yours ran in the past/);
      expect(text).not.toMatch(/%|credible|interval/);
    }
    const all = (await pdfText(pdf)).replace(/\s+/g, ' ');
    expect(all).toContain('is on separate tickets. If you miss it, you are on your own');
    expect(all).toMatch(/America\/Chicago, UTC−0[56]:00/);
    await firstPagePng(pdf, 'report-briefings-page1');
  });

  it('writes standalone HTML and a connections CSV that parses back to the score JSON (csv-parse, RFC 4180)', async () => {
    const html = path.join(work, 'manager.html');
    await layline(['report', trips, '--out', html, ...SEED]);
    const page = readFileSync(html, 'utf8');
    expect(page).toContain(`Layline scored ${score.group.travelers} travelers`);
    expect(page).not.toMatch(/<script|<link|src=/);

    const csv = path.join(work, 'connections.csv');
    await layline(['report', trips, '--out', csv, ...SEED]);
    const rows = (parse(readFileSync(csv, 'utf8'), { columns: true }) as Record<string, string>[]).map(connectionFromCsvRecord);
    const expected = score.trips.flatMap((t) => t.connections.map((c, i) => ({ tripId: t.id, connectionIndex: i, connection: c })));
    expect(rows.map((r) => ({ tripId: r.tripId, connectionIndex: r.connectionIndex, connection: r.connection }))).toEqual(expected);
  });

  it('names what is missing when no Chromium is found, before any scoring (the built binary)', async () => {
    const env = { ...ENV, LAYLINE_CHROMIUM: '/nonexistent/chromium' };
    const failed = await exec(process.execPath, [cli, 'report', trips, '--out', path.join(work, 'x.pdf')], { cwd: work, env }).then(
      () => null,
      (err: { code: number; stderr: string }) => err,
    );
    expect(failed?.code).toBe(1);
    expect(failed?.stderr).toContain('PDF output needs Chromium, but LAYLINE_CHROMIUM points to /nonexistent/chromium, which does not exist.');
    const help = await exec(process.execPath, [cli, 'report', '--help'], { cwd: work });
    expect(help.stdout).toContain('Usage: layline report <file|-> --out FILE');
  });
});
