// Connections in Chromium: the detail's two charts render, a new target moves the minimum
// layovers, and filtering, sorting and undo behave as a coordinator expects.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_TRIPS_TEXT } from '../../shared/demo/demo-workspace';
import path from 'node:path';
import { artifactsDir, pageErrors, startHarness, type Harness } from './harness';
import { openApp, paintedPixels, pasteTrips, showTrips } from './app-helpers';

let harness: Harness;
beforeAll(async () => {
  harness = await startHarness();
});
afterAll(async () => {
  await harness?.close();
});

async function minLayoverTexts(page: import('playwright-core').Page): Promise<string[]> {
  return page.locator('tr.connection-row td[data-col="min-layover"]').allTextContents();
}

describe('connections', () => {
  it('opening a connection draws both charts and says in words how many would miss it', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await showTrips(page);
    await page.getByRole('row', { name: 'Connection at ORD for Ines Calloway' }).click();
    const detail = page.getByTestId('connection-detail');
    await detail.waitFor();
    await expect.poll(() => page.getByTestId('miss-sentence').textContent()).toMatch(/^(About|Fewer than|More than) [\d,]+ in [\d,]+ travelers on this connection would miss it\.$/);
    expect(await paintedPixels(page, 'make-curve-chart')).toBeGreaterThan(2000);
    expect(await paintedPixels(page, 'margin-chart')).toBeGreaterThan(2000);
    // A longer layover, read off the curve, is at least as likely to be made.
    const before = await page.getByTestId('what-if').textContent();
    const slider = page.getByRole('slider', { name: /Try another layover/ });
    await slider.focus();
    for (let i = 0; i < 30; i++) await page.keyboard.press('ArrowRight');
    await expect.poll(() => page.getByTestId('what-if').textContent()).toMatch(/^With 75 minutes/);
    const after = await page.getByTestId('what-if').textContent();
    const pct = (s: string | null) => Number(/: (\d+)% chance/.exec(s ?? '')?.[1]);
    expect(pct(after)).toBeGreaterThanOrEqual(pct(before));
    await harness.screenshot(page, 'app-connection-detail');
    await page.getByTestId('margin-chart').scrollIntoViewIfNeeded();
    await detail.screenshot({ path: path.join(artifactsDir, 'app-connection-charts.png') });
    expect(pageErrors(page)).toEqual([]);
  });

  it('shows local times with zone abbreviations, a +1 on the red-eye, and the self-transfer warning', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await showTrips(page);
    const redEye = page.getByRole('rowgroup', { name: 'Trip of Ezra Blackwood' });
    // IANA tz: Seattle is on PST before 8 March 2026 02:00, Chicago on CDT after it.
    await expect.poll(() => redEye.locator('.legs li').first().textContent()).toMatch(/SEA 23:10 PST → ORD 06:05\+1 CDT/);
    await page.getByRole('row', { name: 'Connection at LAS for Sunniva Aldana' }).click();
    const detail = page.getByTestId('connection-detail');
    await detail.getByText(/^Separate tickets: .*checked in again/).first().waitFor();
    await harness.screenshot(page, 'app-self-transfer');
  });

  it('changing the target updates the minimum layovers', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await showTrips(page);
    const before = await minLayoverTexts(page);
    const target = page.getByRole('spinbutton', { name: 'Target on-time chance (%)' }).first();
    await target.fill('98');
    await page.locator('table.trip-table[data-target="0.98"]').waitFor();
    const after = await minLayoverTexts(page);
    expect(after).toHaveLength(before.length);
    const minutes = (s: string) => {
      const h = /(\d+) h/.exec(s);
      const m = /(\d+) min/.exec(s);
      return (h ? Number(h[1]) * 60 : 0) + (m ? Number(m[1]) : 0);
    };
    // A stricter target never needs a shorter layover, and here it needs a longer one somewhere.
    const sortedBefore = before.map(minutes).sort((a, b) => a - b);
    const sortedAfter = after.map(minutes).sort((a, b) => a - b);
    expect(sortedAfter.reduce((a, b) => a + b, 0)).toBeGreaterThan(sortedBefore.reduce((a, b) => a + b, 0));
    await harness.screenshot(page, 'app-target-98');
  });

  it('filters by traveler and airport, sorts, and undoes the filter with Ctrl+Z', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await showTrips(page);
    const groups = page.locator('table.trip-table > tbody');
    const all = await groups.count();
    await page.getByRole('combobox', { name: 'Airport' }).selectOption('DTW');
    await expect.poll(() => groups.count()).toBeLessThan(all);
    expect(await groups.count()).toBeGreaterThan(0);
    for (const text of await groups.allTextContents()) expect(text).toContain('DTW');
    await page.getByRole('searchbox', { name: 'Traveler' }).fill('noor');
    await page.waitForFunction(() => document.querySelectorAll('table.trip-table > tbody').length === 1);
    await expect.poll(() => groups.first().getAttribute('aria-label')).toBe('Trip of Noor Haddad');
    await page.getByRole('combobox', { name: 'Airport' }).selectOption('');
    await page.getByRole('searchbox', { name: 'Traveler' }).fill('');
    await page.getByRole('combobox', { name: 'Sort' }).selectOption('traveler');
    await expect.poll(() => groups.count()).toBe(all);
    await expect.poll(() => groups.first().getAttribute('aria-label')).toBe('Trip of Amara Nwosu');
    const names = await page.locator('table.trip-table > tbody').evaluateAll((els) => els.map((e) => e.getAttribute('aria-label') ?? ''));
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)));
    await page.getByRole('combobox', { name: 'Sort' }).selectOption('risk');
    await expect.poll(() => groups.first().getAttribute('aria-label')).not.toBe('Trip of Amara Nwosu');
    const risks = await page.locator('tr.trip-row').evaluateAll((rows) => rows.map((r) => r.querySelector('.risk-word')?.textContent ?? 'none'));
    // Riskiest first: every scored trip sits above every trip with nothing to score.
    const firstUnscored = risks.indexOf('none');
    if (firstUnscored >= 0) expect(risks.slice(firstUnscored).every((r) => r === 'none')).toBe(true);
    await harness.screenshot(page, 'app-sorted-by-risk');
    // Undo walks back one step at a time: both sorts, the cleared traveler, the cleared airport.
    await page.locator('body').click({ position: { x: 5, y: 5 } });
    await page.keyboard.press('ControlOrMeta+Z');
    await expect.poll(() => page.getByRole('combobox', { name: 'Sort' }).inputValue()).toBe('traveler');
    await page.keyboard.press('ControlOrMeta+Z');
    await expect.poll(() => page.getByRole('combobox', { name: 'Sort' }).inputValue()).toBe('risk');
    await page.keyboard.press('ControlOrMeta+Z');
    await expect.poll(() => page.getByRole('searchbox', { name: 'Traveler' }).inputValue()).toBe('noor');
    await page.keyboard.press('ControlOrMeta+Z');
    await expect.poll(() => page.getByRole('combobox', { name: 'Airport' }).inputValue()).toBe('DTW');
    await expect.poll(() => groups.count()).toBe(1);
    await page.keyboard.press('ControlOrMeta+Shift+Z');
    await expect.poll(() => page.getByRole('combobox', { name: 'Airport' }).inputValue()).toBe('');
  });

  it('moves between rows with the arrow keys and opens a connection with Enter', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await showTrips(page);
    await page.locator('tr[data-row]').first().focus();
    await page.keyboard.press('ArrowDown');
    const focused = await page.evaluate(() => document.activeElement?.getAttribute('data-row') ?? '');
    expect(focused).toMatch(/^c:/);
    await page.keyboard.press('Enter');
    await page.getByTestId('connection-detail').waitFor();
    await page.keyboard.press('Escape');
    await page.getByTestId('connection-detail').waitFor({ state: 'detached' });
  });
});
