// The delay-history screen in Chromium with the in-page API: pick a generated file in the
// public on-time (BTS) column layout, with cancelled and diverted rows; check the detected
// mapping; fit it in the page's worker with progress and the live objective chart; read the
// held-out diagnostics; use the new bundle; switch back. And a fit cancelled midway.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeSyntheticBtsCsv } from '../../main/history/synthetic-history';
import { dayNumber } from '../../shared/history/cells';
import { openApp, paintedPixels, pasteTrips, waitForEngine } from './app-helpers';
import { pageErrors, startHarness, type Harness } from './harness';

let harness: Harness;
let dir: string;
let history: string;
let big: string;
beforeAll(async () => {
  harness = await startHarness();
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-e2e-history-'));
  history = path.join(dir, 'ontime-2024.csv');
  big = path.join(dir, 'ontime-big.csv');
  await writeSyntheticBtsCsv(history, { rows: 8000, seed: 5, firstDay: dayNumber(2024, 3, 1), days: 61, airports: 4, cancelledShare: 0.02, divertedShare: 0.01 });
  await writeSyntheticBtsCsv(big, { rows: 300_000, seed: 6, firstDay: dayNumber(2024, 1, 1), days: 120 });
});
afterAll(async () => {
  await harness?.close();
  await rm(dir, { recursive: true, force: true });
});

// The generator's first airports are ORD, ATL, DFW and DEN (main/history/synthetic-history.ts).
const TRIPS = 'traveler,trip,flight,from,depart,to,arrive\nIrene Vasquez,Offsite,XA 10,ORD,2026-03-08 15:10,ATL,18:05\nIrene Vasquez,Offsite,XA 11,ATL,2026-03-08 19:10,DFW,20:40\n';

async function chooseFile(page: Awaited<ReturnType<typeof openApp>>, file: string): Promise<void> {
  await page.getByRole('tab', { name: 'Delay history' }).click();
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Choose a delay history file…' }).click()]);
  await chooser.setFiles(file);
  await page.getByRole('table', { name: 'Column mapping' }).waitFor();
}

describe('fitting delay history in the page', () => {
  it('imports, fits with progress, shows diagnostics and switches bundles both ways', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, TRIPS);
    await chooseFile(page, history);
    await expect.poll(() => page.getByText('Recognised the U.S. BTS on-time performance layout', { exact: false }).count()).toBe(1);
    await expect.poll(() => page.getByLabel('Column for arrival delay (minutes)').inputValue()).toBe('ArrDelay');
    await expect.poll(() => page.getByLabel('Column for cancelled flag').inputValue()).toBe('Cancelled');
    await harness.screenshot(page, 'app-history-mapping');

    await page.getByRole('button', { name: 'Fit and check' }).click();
    await page.getByRole('progressbar', { name: 'Fit progress' }).waitFor();
    await page.getByText(/^Done after /).waitFor({ timeout: 120_000 });
    expect(await paintedPixels(page, 'objective-chart')).toBeGreaterThan(100);
    expect(await paintedPixels(page, 'arrival-qq')).toBeGreaterThan(100);
    const calibration = page.getByRole('table', { name: 'arrival tail calibration, pooled' });
    await expect.poll(() => calibration.locator('tbody tr').count()).toBe(5);
    await expect.poll(() => page.getByTestId('arrival-score').textContent()).toMatch(/nats per flight .* against .* for the bundle in use/);
    await expect.poll(() => page.getByText(/cancelled flights? and \d+ diverted flights?/).count()).toBe(1);
    await page.getByTestId('departure-score').waitFor();
    await harness.screenshot(page, 'app-history-diagnostics');

    await page.getByRole('button', { name: 'Use this bundle' }).click();
    await page.getByText(/^Now scoring with history-ontime-2024/).waitFor();
    await waitForEngine(page);
    const bundles = page.getByRole('table', { name: 'Bundles' });
    await expect.poll(() => bundles.getByText('In use', { exact: true }).count()).toBe(1);
    await expect.poll(() => bundles.getByRole('button', { name: 'Use the bundled default' }).count()).toBe(1);
    await page.getByRole('tab', { name: 'Settings' }).click();
    await expect.poll(() => page.getByText(/history-ontime-2024/).count()).toBeGreaterThan(0);
    await harness.screenshot(page, 'app-history-in-use');

    // The page keeps the bundle and the choice (IndexedDB) across a reload.
    await page.reload();
    await page.getByTestId('app-info').waitFor();
    await page.getByRole('tab', { name: 'Delay history' }).click();
    await expect.poll(() => bundles.getByText('In use', { exact: true }).count()).toBe(1);
    await expect.poll(() => bundles.getByRole('button', { name: 'Use the bundled default' }).count()).toBe(1);
    await bundles.getByRole('button', { name: 'Use the bundled default' }).click();
    await page.getByText('Now scoring with the bundle that ships with Layline.').waitFor();
    await expect.poll(() => bundles.getByRole('button', { name: /^Use history-ontime-2024/ }).count()).toBe(1);
    expect(pageErrors(page)).toEqual([]);
  }, 240_000);

  it('cancels a running fit and keeps the bundle in use', async () => {
    const page = await openApp(harness);
    await chooseFile(page, big);
    await page.getByRole('button', { name: 'Fit and check' }).click();
    await page.getByRole('button', { name: 'Cancel the fit' }).click();
    await page.getByText('The fit was cancelled. Nothing was saved; the bundle in use is unchanged.').waitFor({ timeout: 60_000 });
    await expect.poll(() => page.getByRole('table', { name: 'Bundles' }).getByText('In use', { exact: true }).count()).toBe(1);
    await expect.poll(() => page.getByRole('table', { name: 'Bundles' }).locator('tbody tr').count()).toBe(1);
    expect(pageErrors(page)).toEqual([]);
  }, 120_000);

  it('says clearly why hostile files cannot be used (binary, one huge line, wrong columns) and imports nothing', async () => {
    const page = await openApp(harness);
    const bad = path.join(dir, 'binary.csv');
    await writeFile(bad, Buffer.from([0x50, 0x4b, 0x03, 0x04, 0, 0, 1, 2, 3]));
    await page.getByRole('tab', { name: 'Delay history' }).click();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Choose a delay history file…' }).click()]);
    await chooser.setFiles(bad);
    await page.getByRole('alert').filter({ hasText: 'The file could not be read' }).waitFor();
    expect(await page.getByRole('table', { name: 'Column mapping' }).count()).toBe(0);
    await harness.screenshot(page, 'app-history-bad-file');

    // One line of 3 MB and no line break: no header can be found in the preview window.
    const huge = path.join(dir, 'one-line.csv');
    await writeFile(huge, 'x'.repeat(3_000_000));
    const [again] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Choose a delay history file…' }).click()]);
    await again.setFiles(huge);
    await page.getByRole('alert').filter({ hasText: /no complete header line/ }).waitFor();

    // Columns that hold none of the required fields: the fit cannot start until they are chosen.
    const wrong = path.join(dir, 'wrong-columns.csv');
    await writeFile(wrong, 'name,age,city\nAda,36,Oslo\nBen,41,Lima\n');
    const [third] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Choose a delay history file…' }).click()]);
    await third.setFiles(wrong);
    await page.getByRole('table', { name: 'Column mapping' }).waitFor();
    await page.getByText(/Choose a column for: flight date, origin airport, destination airport, arrival delay/).waitFor();
    expect(await page.getByRole('button', { name: 'Fit and check' }).isDisabled()).toBe(true);
    // Forcing nonsense columns gets the reader's own message, as a failed fit that saves nothing.
    await page.getByLabel('Column for flight date').selectOption('name');
    await page.getByLabel('Column for origin airport').selectOption('age');
    await page.getByLabel('Column for destination airport').selectOption('city');
    await page.getByLabel('Column for arrival delay (minutes)').selectOption('age');
    await page.getByText(/Each column can hold one field; used twice: age/).waitFor();
    expect(await page.getByRole('button', { name: 'Fit and check' }).isDisabled()).toBe(true);
    expect(await page.getByRole('table', { name: 'Bundles' }).locator('tbody tr').count()).toBe(1);
  }, 60_000);
});
