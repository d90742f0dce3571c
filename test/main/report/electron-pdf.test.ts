// Printing inside the desktop app, with electron mocked at the module boundary.
import { existsSync, readFileSync } from 'node:fs';
import { beforeEach, describe, expect, it, vi } from 'vitest';

interface FakeWindow {
  options: unknown;
  loadedFile: string | null;
  loadedHtml: string | null;
  destroyed: boolean;
  printOptions: unknown;
}

const windows: FakeWindow[] = [];
let failPrint = false;

vi.mock('electron', () => ({
  BrowserWindow: class {
    private readonly w: FakeWindow;
    constructor(options: unknown) {
      this.w = { options, loadedFile: null, loadedHtml: null, destroyed: false, printOptions: null };
      windows.push(this.w);
    }
    async loadFile(file: string) {
      this.w.loadedFile = file;
      this.w.loadedHtml = readFileSync(file, 'utf8');
    }
    destroy() {
      this.w.destroyed = true;
    }
    isDestroyed() {
      return this.w.destroyed;
    }
    get webContents() {
      return {
        printToPDF: async (options: unknown) => {
          this.w.printOptions = options;
          if (failPrint) throw new Error('printing failed');
          return Buffer.from('%PDF-1.7 fake');
        },
      };
    }
  },
}));

const { electronPdfOptions, printReportInElectron, printWindowOptions } = await import('../../../main/report/electron-pdf');

describe('printReportInElectron', () => {
  beforeEach(() => {
    windows.length = 0;
    failPrint = false;
  });

  it('prints the HTML in a hidden, script-free, sandboxed window and returns the PDF bytes', async () => {
    const pdf = await printReportInElectron('<!doctype html><p>Report</p>', 'A4', 'Connection risk report');
    expect(pdf.toString()).toBe('%PDF-1.7 fake');
    const [w] = windows;
    expect(w?.options).toEqual(printWindowOptions());
    expect(w?.options).toMatchObject({ show: false, webPreferences: { javascript: false, sandbox: true, contextIsolation: true, nodeIntegration: false } });
    expect((w?.options as { webPreferences: object }).webPreferences).not.toHaveProperty('preload');
    expect(w?.loadedHtml).toBe('<!doctype html><p>Report</p>');
    expect(w?.printOptions).toEqual(electronPdfOptions('A4', 'Connection risk report'));
  });

  it('closes the window and deletes the temporary file, even when printing fails', async () => {
    failPrint = true;
    await expect(printReportInElectron('<p>x</p>', 'Letter', 't')).rejects.toThrow('printing failed');
    const [w] = windows;
    expect(w?.destroyed).toBe(true);
    expect(w?.loadedFile && existsSync(w.loadedFile)).toBe(false);
  });
});

describe('electronPdfOptions', () => {
  it('asks for the paper size, backgrounds, and the footer, with margins in inches', () => {
    const a4 = electronPdfOptions('A4', 'T');
    expect(a4).toMatchObject({ pageSize: 'A4', printBackground: true, preferCSSPageSize: false, displayHeaderFooter: true });
    expect(a4.margins?.bottom).toBeCloseTo(18 / 25.4, 9);
    expect(a4.footerTemplate).toContain('class="pageNumber"');
    expect(electronPdfOptions('Letter', 'T').pageSize).toBe('Letter');
  });
});
