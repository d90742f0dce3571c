// Exporting reports from the page: the manager report and briefings as standalone HTML, and
// the connections CSV, each handed to the browser's download with the demo's real scores.
import { readFile } from 'node:fs/promises';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_TRIPS_TEXT } from '../../shared/demo/demo-workspace';
import { pageErrors, startHarness, type Harness } from './harness';
import { openApp, pasteTrips } from './app-helpers';

let harness: Harness;
beforeAll(async () => {
  harness = await startHarness();
});
afterAll(async () => {
  await harness?.close();
});

async function download(page: Awaited<ReturnType<typeof openApp>>, button: string): Promise<{ name: string; text: string }> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: button }).click()]);
  const path = await file.path();
  return { name: file.suggestedFilename(), text: await readFile(path, 'utf8') };
}

describe('report export in the page', () => {
  it('downloads the manager report, the briefings and the connections CSV of the demo', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    const manager = await download(page, 'Manager report');
    expect(manager.name).toMatch(/^layline-report-\d{4}-\d{2}-\d{2}\.html$/);
    expect(manager.text).toMatch(/^<!doctype html>/i);
    expect(manager.text).toContain('30 travelers');
    const briefings = await download(page, 'Briefings');
    expect(briefings.name).toMatch(/^layline-briefings-.*\.html$/);
    expect(briefings.text).toMatch(/transfer desk|re-check/i);
    const csv = await download(page, 'Connections CSV');
    expect(csv.name).toMatch(/\.csv$/);
    const records = parse(csv.text, { columns: true }) as Record<string, string>[];
    expect(records.length).toBeGreaterThan(20);
    await expect.poll(() => page.getByText(/handed to the browser's download/).count()).toBeGreaterThan(0);
    await harness.screenshot(page, 'app-export');
    expect(pageErrors(page)).toEqual([]);
  });
});
