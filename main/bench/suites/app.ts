// The app in Chromium: pasting 500 trips until the scored table is on screen, and how long
// keystrokes wait for a frame while that scoring runs (it runs in the page's Web Worker).
//
// Drives the built page (dist/renderer) in Debian's Chromium through playwright-core.
import path from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { startStaticServer } from '../../web/static-server';
import { pasteIntoIntake, waitForScores } from '../page-actions';
import type { BenchRow, BenchSuite } from '../suite';

const TRIPS = 500;
const RUNS = 5;

/** `count` trips: the demo's trips repeated with numbered travelers (about 1.9 legs a trip). */
export function manyTrips(count: number): string {
  const [header, ...rows] = DEMO_TRIPS_TEXT.trim().split('\n');
  const tripOf = (row: string) => row.split(',').slice(0, 3).join(',');
  const keys = [...new Set(rows.map(tripOf))];
  const out = [header];
  for (let copy = 0; copy * keys.length < count; copy++) {
    for (const row of rows) {
      if (copy * keys.length + keys.indexOf(tripOf(row)) >= count) continue;
      const cells = row.split(',');
      cells[0] = `${cells[0]} ${copy + 1}`;
      out.push(cells.join(','));
    }
  }
  return out.join('\n') + '\n';
}

/** Pastes `text`, shows the Trips screen at once, and resolves with ms until the scored table of `trips` trips is on screen. */
function pasteAndTime(page: Page, text: string, trips: number): Promise<{ totalMs: number; arrivedMs: number }> {
  return page.evaluate(
    ({ text, trips }) =>
      new Promise<{ totalMs: number; arrivedMs: number }>((resolve, reject) => {
        const area = document.querySelector<HTMLTextAreaElement>('textarea[aria-label="Trips text"]');
        if (!area) return reject(new Error('no trips textarea'));
        performance.clearMarks('layline:analysis-arrived');
        const start = performance.now();
        area.value = text;
        area.dispatchEvent(new InputEvent('input', { bubbles: true, inputType: 'insertFromPaste', data: text }));
        document.querySelector<HTMLButtonElement>('#tab-trips')?.click();
        const check = () => {
          const rows = document.querySelectorAll('table.trip-table > tbody').length;
          const state = document.querySelector('[data-testid="engine-state"]')?.textContent ?? '';
          const count = document.querySelector('[data-testid="shown-count"]')?.textContent ?? '';
          // The table draws its first screens of trips at once and the rest as it scrolls.
          if (rows > 0 && count.startsWith(`${trips} of ${trips} trips`) && state.startsWith('Scored in') && document.querySelector('.risk-meets, .risk-near, .risk-below')) {
            const arrived = performance.getEntriesByName('layline:analysis-arrived').at(-1)?.startTime ?? NaN;
            resolve({ totalMs: performance.now() - start, arrivedMs: arrived - start });
          }
          else if (performance.now() - start > 60_000) reject(new Error(`timed out with ${rows} rows, state "${state}"`));
          else requestAnimationFrame(check);
        };
        requestAnimationFrame(check);
      }),
    { text, trips },
  );
}

async function toIntake(page: Page, text: string): Promise<void> {
  await page.locator('#tab-intake').click();
  await pasteIntoIntake(page, text);
  await waitForScores(page);
}

/** Keystroke-to-frame delays (ms) while a 500-trip analysis runs in the worker. */
async function typingDelays(page: Page, text: string): Promise<number[]> {
  await toIntake(page, 'traveler,trip,flight,from,depart,to,arrive\n');
  await page.evaluate(() => {
    const w = window as unknown as { laylineDelays: number[] };
    w.laylineDelays = [];
    document.querySelector('textarea')?.addEventListener('keydown', (e) => {
      const at = e.timeStamp;
      requestAnimationFrame(() => w.laylineDelays.push(performance.now() - at));
    });
  });
  await pasteIntoIntake(page, text);
  await page.locator('textarea').press('End');
  await page.keyboard.type('Typing while the engine scores 500 trips', { delay: 25 });
  return page.evaluate(() => (window as unknown as { laylineDelays: number[] }).laylineDelays);
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] ?? NaN;
}

export const appSuite: BenchSuite = {
  name: 'app',
  run: async (log) => {
    const rendererDir = path.join(__dirname, '..', 'renderer');
    const server = await startStaticServer(rendererDir, 0);
    const browser = await chromium.launch({
      executablePath: process.env.LAYLINE_CHROMIUM ?? '/usr/bin/chromium',
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-quic'],
    });
    try {
      const page = await browser.newPage({ viewport: { width: 1280, height: 860 } });
      await page.goto(server.url);
      await page.getByTestId('app-info').waitFor();
      const text = manyTrips(TRIPS);
      const times: number[] = [];
      const arrivals: number[] = [];
      for (let run = 0; run <= RUNS; run++) {
        await toIntake(page, 'traveler,trip,flight,from,depart,to,arrive\n');
        const { totalMs, arrivedMs } = await pasteAndTime(page, text, TRIPS);
        if (run > 0) {
          // The first run warms the worker and loads the bundle.
          times.push(totalMs);
          arrivals.push(arrivedMs);
        }
        log(`paste ${TRIPS} trips → scores back from the worker ${arrivedMs.toFixed(0)} ms → table drawn ${totalMs.toFixed(0)} ms${run === 0 ? ' (warm-up)' : ''}`);
      }
      const engineMs = await page.getByTestId('engine-state').textContent();
      const delays = await typingDelays(page, text);
      const rows: BenchRow[] = [
        { name: `paste ${TRIPS} trips until the scored table is rendered`, ms: median(times), targetMs: 500, notes: `median of ${RUNS}; last run's engine: "${engineMs}"` },
        { name: `… of which until the scores are back from the worker`, ms: median(arrivals), notes: 'parse + score + both contract checks + transfer' },
        { name: 'keystroke to next frame while scoring 500 trips (median)', ms: median(delays), notes: `${delays.length} keystrokes, worst ${Math.max(...delays).toFixed(0)} ms` },
      ];
      return rows;
    } finally {
      await browser.close();
      await server.close();
    }
  },
};
