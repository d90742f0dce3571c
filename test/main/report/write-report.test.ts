import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { reportFormatFor, writeReport } from '../../../main/report/write-report';
import { sampleScoredTrips } from '../../fixtures/report/scored-sample';

const dir = mkdtempSync(path.join(tmpdir(), 'layline-write-report-'));
const report = { generatedAt: '2026-04-01T09:30:00Z' };

describe('writeReport', () => {
  it('picks the format from the extension', () => {
    expect(reportFormatFor('/x/Report.PDF')).toBe('pdf');
    expect(reportFormatFor('r.htm')).toBe('html');
    expect(reportFormatFor('c.csv')).toBe('csv');
    expect(reportFormatFor('r.docx')).toBeNull();
  });

  it('prints PDF through the printer it is given (the app passes printReportInElectron)', async () => {
    const calls: { paper: string; title: string; html: string }[] = [];
    const out = path.join(dir, 'briefings.pdf');
    const result = await writeReport(sampleScoredTrips(), out, {
      kind: 'briefings',
      paper: 'Letter',
      report,
      printPdf: async (html, paper, title) => {
        calls.push({ html, paper, title });
        return new TextEncoder().encode('%PDF-1.7 test');
      },
    });
    expect(result).toEqual({ format: 'pdf', bytes: 13 });
    expect(calls).toHaveLength(1);
    expect(calls[0]).toMatchObject({ paper: 'Letter', title: 'Travel briefings' });
    expect(calls[0]?.html).toContain('<section class="briefing"');
    expect(readFileSync(out, 'utf8')).toBe('%PDF-1.7 test');
  });

  it('replaces an old report whole and leaves no temporary file, even when printing fails', async () => {
    const out = path.join(dir, 'kept.pdf');
    writeFileSync(out, 'old report');
    await expect(writeReport(sampleScoredTrips(), out, { kind: 'manager', paper: 'A4', report, printPdf: async () => Promise.reject(new Error('printer jammed')) })).rejects.toThrow('printer jammed');
    expect(readFileSync(out, 'utf8')).toBe('old report');
    await writeReport(sampleScoredTrips(), path.join(dir, 'kept.html'), { kind: 'manager', paper: 'A4', report });
    expect(readFileSync(path.join(dir, 'kept.html'), 'utf8')).toMatch(/^<!doctype html>/);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('needs a printer for PDF', async () => {
    await expect(writeReport(sampleScoredTrips(), path.join(dir, 'r.pdf'), { kind: 'manager', paper: 'A4', report })).rejects.toThrow(/no PDF printer was given/);
  });

  it('refuses an extension it does not write', async () => {
    await expect(writeReport(sampleScoredTrips(), path.join(dir, 'r.txt'), { kind: 'manager', paper: 'A4', report })).rejects.toThrow(/name it \.pdf, \.html or \.csv/);
  });
});
