// The paper a report is printed on: the two sizes we support, the margins, and the page
// footer. One definition serves the CLI's headless Chromium and Electron's printToPDF.
//
// Paper sizes from ISO 216 (A4, 210 × 297 mm) and ANSI/ASME Y14.1 (Letter, 8.5 × 11 in).
import { escapeHtml } from './html';

export type PaperSize = 'A4' | 'Letter';

export const PAPER_SIZES: readonly PaperSize[] = ['A4', 'Letter'];

export const PAPER_DIMENSIONS_MM: Readonly<Record<PaperSize, { readonly widthMm: number; readonly heightMm: number }>> = {
  A4: { widthMm: 210, heightMm: 297 },
  Letter: { widthMm: 215.9, heightMm: 279.4 },
};

/** Page margins; the bottom one leaves room for the footer with the page number. */
export const PRINT_MARGINS_MM = { top: 14, right: 13, bottom: 18, left: 13 } as const;

/** Reads a user's paper choice ("a4", "letter", "US-Letter"), or null when it is neither. */
export function parsePaperSize(text: string): PaperSize | null {
  const t = text.trim().toLowerCase().replace(/^us[-_ ]?/, '');
  if (t === 'a4') return 'A4';
  if (t === 'letter') return 'Letter';
  return null;
}

/**
 * The footer printed on every page: the report's title and "page N of M".
 *
 * Chromium fills the pageNumber and totalPages classes; page styles do not reach the
 * template, so it carries its own (font-size must be set or the text prints at 0).
 */
export function pageFooterTemplate(title: string): string {
  return (
    '<div style="width:100%;font-family:Helvetica,Arial,sans-serif;font-size:8px;color:#555;padding:0 13mm;display:flex;justify-content:space-between;">' +
    `<span>${escapeHtml(title)}</span>` +
    '<span>Page <span class="pageNumber"></span> of <span class="totalPages"></span></span>' +
    '</div>'
  );
}

/** An empty header, so Chromium does not print its default date and URL header. */
export const EMPTY_HEADER_TEMPLATE = '<div></div>';
