// The other screens in Chromium: options, group, settings (MCT overrides, theme), and the
// page's workspace handling (download, open, a corrupt file, recovery after a reload).
import { readFile, writeFile, mkdtemp } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_TRIPS_TEXT } from '../../shared/demo/demo-workspace';
import { parseWorkspace } from '../../shared/workspace/format';
import { pageErrors, startHarness, type Harness } from './harness';
import { openApp, paintedPixels, pasteTrips, showTrips, waitForEngine } from './app-helpers';

let harness: Harness;
beforeAll(async () => {
  harness = await startHarness();
});
afterAll(async () => {
  await harness?.close();
});

describe('options and group', () => {
  it('compares the options side by side with the Pareto-optimal ones marked', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await page.getByRole('tab', { name: /^Options/ }).click();
    const groups = page.getByRole('region', { name: /^Options for / });
    expect(await groups.count()).toBe(2);
    const priya = page.getByRole('region', { name: 'Options for Priya Raman, Harbor Week' });
    expect(await priya.getByRole('article').count()).toBe(2);
    expect(await priya.getByText(/^Pareto-optimal/).count()).toBeGreaterThanOrEqual(1);
    expect(await paintedPixels(page, 'options-chart')).toBeGreaterThan(1000);
    await harness.screenshot(page, 'app-options');
    expect(pageErrors(page)).toEqual([]);
  });

  it('summarises the group with the expected number misconnecting and its distribution', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await page.getByRole('tab', { name: /^Group/ }).click();
    await expect.poll(() => page.getByTestId('group-travelers').textContent()).toBe('30');
    const expected = Number(await page.getByTestId('group-expected').textContent());
    expect(expected).toBeGreaterThan(0);
    expect(expected).toBeLessThan(30);
    expect(await paintedPixels(page, 'group-chart')).toBeGreaterThan(1000);
    await expect(page.getByRole('table', { name: 'Connections that drive it' }).getByRole('row').count()).resolves.toBeGreaterThan(1);
    await harness.screenshot(page, 'app-group');
  });
});

describe('settings', () => {
  it('an MCT override changes the MCT of that airport’s connections, and the theme can be dark', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await page.getByRole('tab', { name: 'Settings' }).click();
    await page.getByRole('button', { name: 'Add an override' }).click();
    await page.getByRole('textbox', { name: 'Airport, row 1' }).fill('ORD');
    await page.getByRole('spinbutton', { name: 'Minutes, row 1' }).fill('70');
    await page.getByRole('button', { name: 'Apply overrides' }).click();
    await waitForEngine(page);
    await page.getByRole('radio', { name: 'Dark' }).check();
    await harness.screenshot(page, 'app-settings-dark');
    await showTrips(page);
    await page.getByRole('combobox', { name: 'Airport' }).selectOption('ORD');
    const row = page.getByRole('row', { name: 'Connection at ORD for Ines Calloway' });
    await expect.poll(() => row.textContent()).toContain('1 h 10 min');
    await expect(page.evaluate(() => document.documentElement.dataset.theme)).resolves.toBe('dark');
    await harness.screenshot(page, 'app-trips-dark');
  });

  it('refuses an override that is not an airport code, saying which row', async () => {
    const page = await openApp(harness);
    await page.getByRole('tab', { name: 'Settings' }).click();
    await page.getByRole('button', { name: 'Add an override' }).click();
    await page.getByRole('textbox', { name: 'Airport, row 1' }).fill('O1');
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'Row 1' }).textContent()).toMatch(/Row 1: airport/);
    await expect(page.getByRole('button', { name: 'Apply overrides' }).isDisabled()).resolves.toBe(true);
  });
});

describe('workspaces in the page', () => {
  it('saves by download and opens the file back; a corrupt file is refused with a clear message', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    const target = page.getByRole('spinbutton', { name: 'Target on-time chance (%)' }).first();
    await target.fill('95');
    await waitForEngine(page);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Save', exact: true }).click()]);
    const dir = await mkdtemp(path.join(os.tmpdir(), 'layline-e2e-'));
    const saved = path.join(dir, download.suggestedFilename());
    await download.saveAs(saved);
    const content = parseWorkspace(await readFile(saved, 'utf8')).content;
    expect(content.settings.targetProbability).toBe(0.95);
    expect(content.tripsText).toBe(DEMO_TRIPS_TEXT);

    await page.getByRole('button', { name: 'New' }).click();
    await waitForEngine(page);
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(saved);
    await page.getByRole('status').filter({ hasText: /^Opened / }).waitFor();
    await waitForEngine(page);
    await expect.poll(() => target.inputValue()).toBe('95');

    const corrupt = path.join(dir, 'damaged.layline');
    await writeFile(corrupt, '{"format":"layline-workspace","version":1,"content":{"tripsText":"abc');
    const [chooser2] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser2.setFiles(corrupt);
    await page.getByRole('alert').filter({ hasText: /damaged or is not a Layline workspace.*left as it is/ }).waitFor();
    await expect.poll(() => target.inputValue()).toBe('95');
    await harness.screenshot(page, 'app-corrupt-workspace');
  });

  it('offers unsaved work back after the page is reloaded', async () => {
    const page = await openApp(harness);
    const text = 'traveler,trip,flight,from,depart,to,arrive\nAda Quill,Offsite,UA 1184,DFW,2026-03-08 15:10,ORD,17:35\n';
    await pasteTrips(page, text);
    await page.waitForFunction(() => localStorage.getItem('layline.autosave.v1')?.includes('Ada Quill'));
    page.on('dialog', (d) => void d.accept());
    await page.reload();
    await page.getByRole('button', { name: 'Recover it' }).click();
    await waitForEngine(page);
    await page.getByRole('tab', { name: /^Intake/ }).click();
    await expect.poll(() => page.getByRole('textbox', { name: 'Trips text' }).inputValue()).toBe(text);
  });
});
