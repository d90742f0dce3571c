// Prints a report's standalone HTML to PDF inside the desktop app, with Electron's
// webContents.printToPDF in a hidden, locked-down window.
//
// The app's IPC handler for exporting builds the HTML with shared/report, calls
// printReportInElectron, and writes the bytes where the user chose in the save dialog.
import { BrowserWindow, type BrowserWindowConstructorOptions, type PrintToPDFOptions } from 'electron';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { mainWindowOptions } from '../electron/window-options';
import { EMPTY_HEADER_TEMPLATE, PRINT_MARGINS_MM, pageFooterTemplate, type PaperSize } from '../../shared/report/print-layout';

const MM_PER_INCH = 25.4;

/** printToPDF's options for a paper size; Electron takes margins in inches. */
export function electronPdfOptions(paper: PaperSize, title: string): PrintToPDFOptions {
  const inches = (mm: number) => mm / MM_PER_INCH;
  return {
    pageSize: paper,
    printBackground: true,
    preferCSSPageSize: false,
    displayHeaderFooter: true,
    headerTemplate: EMPTY_HEADER_TEMPLATE,
    footerTemplate: pageFooterTemplate(title),
    margins: {
      top: inches(PRINT_MARGINS_MM.top),
      right: inches(PRINT_MARGINS_MM.right),
      bottom: inches(PRINT_MARGINS_MM.bottom),
      left: inches(PRINT_MARGINS_MM.left),
    },
    generateTaggedPDF: true,
    generateDocumentOutline: true,
  };
}

/**
 * The hidden window a report is printed in: the app window's isolation settings, with no
 * preload and no script.
 *
 * The report is static HTML and SVG, so JavaScript stays off; it carries pasted traveler data.
 */
export function printWindowOptions(): BrowserWindowConstructorOptions {
  const { preload: _noPreload, ...isolation } = mainWindowOptions('').webPreferences ?? {};
  return { show: false, width: 900, height: 1200, webPreferences: { ...isolation, javascript: false } };
}

/** The part of Electron this module needs, injectable so tests can run without Electron. */
export interface ElectronPrintDeps {
  readonly createWindow: (options: BrowserWindowConstructorOptions) => Pick<BrowserWindow, 'loadFile' | 'destroy' | 'isDestroyed'> & {
    readonly webContents: Pick<BrowserWindow['webContents'], 'printToPDF'>;
  };
}

const electronDeps: ElectronPrintDeps = { createWindow: (options) => new BrowserWindow(options) };

/**
 * Loads the HTML from a private temporary file (a data: URL has a length limit a large
 * report can pass), prints it, and always closes the window and removes the file.
 */
export async function printReportInElectron(html: string, paper: PaperSize, title: string, deps: ElectronPrintDeps = electronDeps): Promise<Buffer> {
  const dir = await mkdtemp(path.join(tmpdir(), 'layline-report-'));
  const file = path.join(dir, 'report.html');
  let win: ReturnType<ElectronPrintDeps['createWindow']> | undefined;
  try {
    await writeFile(file, html, { encoding: 'utf8', mode: 0o600 });
    win = deps.createWindow(printWindowOptions());
    await win.loadFile(file);
    return await win.webContents.printToPDF(electronPdfOptions(paper, title));
  } finally {
    if (win && !win.isDestroyed()) win.destroy();
    await rm(dir, { recursive: true, force: true });
  }
}
