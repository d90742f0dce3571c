// Shared set-up for end-to-end tests: the built renderer served on loopback, driven in
// Debian's Chromium through playwright-core. A missing Chromium fails loudly.
import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { startStaticServer, type RunningServer } from '../../main/web/static-server';

export const repoRoot = path.resolve(__dirname, '..', '..');
export const artifactsDir = path.join(repoRoot, 'artifacts', 'e2e');
const chromiumPath = process.env.LAYLINE_CHROMIUM ?? '/usr/bin/chromium';

/** Flags without which Chromium misbehaves on a closed network. */
export const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-quic'];

export interface Harness {
  readonly browser: Browser;
  readonly server: RunningServer;
  readonly newPage: () => Promise<Page>;
  readonly screenshot: (page: Page, name: string) => Promise<string>;
  readonly close: () => Promise<void>;
}

const errorsByPage = new WeakMap<Page, string[]>();

export async function startHarness(): Promise<Harness> {
  if (!existsSync(chromiumPath)) {
    throw new Error(`Chromium not found at ${chromiumPath}. Install it (apt-get install chromium) or set LAYLINE_CHROMIUM. E2E tests never skip.`);
  }
  const rendererDir = path.join(repoRoot, 'dist', 'renderer');
  if (!existsSync(path.join(rendererDir, 'index.html'))) {
    throw new Error('dist/renderer is missing: run `npm run build` first (npm run test:e2e does).');
  }
  mkdirSync(artifactsDir, { recursive: true });
  const server = await startStaticServer(rendererDir, 0);
  const browser = await chromium.launch({ executablePath: chromiumPath, headless: true, args: CHROMIUM_ARGS });
  const pages: Page[] = [];
  return {
    browser,
    server,
    newPage: async () => {
      const page = await browser.newPage({ viewport: { width: 1280, height: 860 } });
      const errors: string[] = [];
      page.on('pageerror', (err) => errors.push(err.message));
      page.on('console', (msg) => {
        if (msg.type() === 'error') errors.push(msg.text());
      });
      errorsByPage.set(page, errors);
      pages.push(page);
      return page;
    },
    screenshot: async (page, name) => {
      const file = path.join(artifactsDir, `${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      return file;
    },
    close: async () => {
      await browser.close();
      await server.close();
    },
  };
}

/** Errors the page logged (uncaught exceptions and console.error), for asserting a clean run. */
export function pageErrors(page: Page): string[] {
  return errorsByPage.get(page) ?? [];
}
