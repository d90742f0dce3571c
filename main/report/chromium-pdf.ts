// Prints a report's standalone HTML to PDF with a headless Chromium the user already has,
// driven by playwright-core with executablePath (playwright-core downloads no browser).
//
// Used by the CLI. The desktop app prints through Electron instead (electron-pdf.ts).
import { existsSync } from 'node:fs';
import { EMPTY_HEADER_TEMPLATE, PRINT_MARGINS_MM, pageFooterTemplate, type PaperSize } from '../../shared/report/print-layout';

/** No Chromium, or no playwright-core: the message names what is missing and how to fix it. */
export class PdfPrinterMissingError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PdfPrinterMissingError';
  }
}

/** Where Chromium-family browsers are usually installed, per platform (common practice, no source). */
export function chromiumCandidates(platform: NodeJS.Platform, env: NodeJS.ProcessEnv): string[] {
  if (platform === 'darwin') {
    return [
      '/Applications/Chromium.app/Contents/MacOS/Chromium',
      '/Applications/Google Chrome.app/Contents/MacOS/Google Chrome',
      '/Applications/Microsoft Edge.app/Contents/MacOS/Microsoft Edge',
    ];
  }
  if (platform === 'win32') {
    const roots = [env.PROGRAMFILES, env['PROGRAMFILES(X86)'], env.LOCALAPPDATA].filter((r): r is string => Boolean(r));
    return roots.flatMap((root) => [`${root}\\Google\\Chrome\\Application\\chrome.exe`, `${root}\\Chromium\\Application\\chrome.exe`, `${root}\\Microsoft\\Edge\\Application\\msedge.exe`]);
  }
  return ['/usr/bin/chromium', '/usr/bin/chromium-browser', '/usr/bin/google-chrome', '/usr/bin/google-chrome-stable', '/usr/bin/microsoft-edge', '/snap/bin/chromium'];
}

export interface ChromiumLookup {
  /** An explicit path (the CLI's --chromium); it must exist. */
  readonly explicitPath?: string;
  readonly env?: NodeJS.ProcessEnv;
  readonly platform?: NodeJS.Platform;
  readonly exists?: (path: string) => boolean;
}

/**
 * The Chromium to print with: an explicit path, else $LAYLINE_CHROMIUM, else the first
 * usual install location that exists. Throws PdfPrinterMissingError naming every place tried.
 */
export function findChromium(lookup: ChromiumLookup = {}): string {
  const env = lookup.env ?? process.env;
  const exists = lookup.exists ?? existsSync;
  const named = lookup.explicitPath ?? env.LAYLINE_CHROMIUM;
  if (named) {
    if (exists(named)) return named;
    const from = lookup.explicitPath ? '--chromium' : 'LAYLINE_CHROMIUM';
    throw new PdfPrinterMissingError(`PDF output needs Chromium, but ${from} points to ${named}, which does not exist.`);
  }
  const candidates = chromiumCandidates(lookup.platform ?? process.platform, env);
  const found = candidates.find((c) => exists(c));
  if (found) return found;
  throw new PdfPrinterMissingError(
    'PDF output needs a Chromium-family browser (Chromium, Google Chrome or Microsoft Edge), and none was found. ' +
      `Looked in: ${candidates.join(', ')}. Install one (on Debian: apt-get install chromium), or pass --chromium <path> ` +
      'or set LAYLINE_CHROMIUM. HTML output (--out report.html) works without it.',
  );
}

type Playwright = typeof import('playwright-core');

async function loadPlaywright(): Promise<Playwright> {
  try {
    return await import('playwright-core');
  } catch (err) {
    throw new PdfPrinterMissingError(
      `PDF output needs the playwright-core package, which could not be loaded (${err instanceof Error ? err.message : String(err)}). ` +
        'Run npm install in the Layline folder, or write HTML instead (--out report.html).',
    );
  }
}

/** Chromium flags for printing a local document with nothing reaching the network. */
const PRINT_ARGS = ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export interface PrintOptions {
  readonly paper: PaperSize;
  /** The report's title, printed in the footer of every page. */
  readonly title: string;
  /** From findChromium. */
  readonly executablePath: string;
}

/**
 * Prints self-contained HTML to PDF bytes.
 *
 * JavaScript is off and every request is refused: a report needs neither, and the HTML
 * carries pasted traveler data.
 */
export async function printHtmlToPdf(html: string, options: PrintOptions): Promise<Buffer> {
  const { chromium } = await loadPlaywright();
  let browser;
  try {
    browser = await chromium.launch({ executablePath: options.executablePath, headless: true, args: PRINT_ARGS });
  } catch (err) {
    throw new PdfPrinterMissingError(`Chromium at ${options.executablePath} could not be started: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`);
  }
  try {
    const context = await browser.newContext({ javaScriptEnabled: false });
    await context.route('**/*', (route) => route.abort());
    const page = await context.newPage();
    await page.setContent(html, { waitUntil: 'load' });
    const mm = (n: number) => `${n}mm`;
    return await page.pdf({
      format: options.paper,
      printBackground: true,
      displayHeaderFooter: true,
      headerTemplate: EMPTY_HEADER_TEMPLATE,
      footerTemplate: pageFooterTemplate(options.title),
      margin: { top: mm(PRINT_MARGINS_MM.top), right: mm(PRINT_MARGINS_MM.right), bottom: mm(PRINT_MARGINS_MM.bottom), left: mm(PRINT_MARGINS_MM.left) },
      tagged: true,
      outline: true,
    });
  } finally {
    await browser.close();
  }
}

/**
 * The CLI's PDF printer (write-report.ts PdfPrinter): a Chromium the user has, looked up now,
 * so a missing browser fails before any scoring with PdfPrinterMissingError.
 */
export function chromiumPrinter(lookup: ChromiumLookup = {}): (html: string, paper: PaperSize, title: string) => Promise<Buffer> {
  const executablePath = findChromium(lookup);
  return (html, paper, title) => printHtmlToPdf(html, { paper, title, executablePath });
}
