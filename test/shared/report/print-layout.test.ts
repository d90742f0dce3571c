import { describe, expect, it } from 'vitest';
import { PAPER_DIMENSIONS_MM, pageFooterTemplate, parsePaperSize } from '../../../shared/report/print-layout';

describe('paper sizes', () => {
  it('reads the names people type for A4 and US Letter', () => {
    expect(parsePaperSize('a4')).toBe('A4');
    expect(parsePaperSize('Letter')).toBe('Letter');
    expect(parsePaperSize('us-letter')).toBe('Letter');
    expect(parsePaperSize('legal')).toBeNull();
  });

  it('has the ISO 216 and ANSI Letter dimensions', () => {
    // ISO 216: A4 is 210 × 297 mm; ANSI/ASME Y14.1: Letter is 8.5 × 11 in (215.9 × 279.4 mm).
    expect(PAPER_DIMENSIONS_MM.A4).toEqual({ widthMm: 210, heightMm: 297 });
    expect(PAPER_DIMENSIONS_MM.Letter.widthMm).toBeCloseTo(8.5 * 25.4, 6);
    expect(PAPER_DIMENSIONS_MM.Letter.heightMm).toBeCloseTo(11 * 25.4, 6);
  });

  it('puts the page number and count in the footer, with the title escaped', () => {
    const footer = pageFooterTemplate('A & B');
    expect(footer).toContain('<span class="pageNumber"></span> of <span class="totalPages"></span>');
    expect(footer).toContain('A &amp; B');
    expect(footer).toMatch(/font-size:8px/);
  });
});
