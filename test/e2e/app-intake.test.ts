// The intake screen in Chromium: pasting the demo shows every trip, problems are listed by
// line and select that line, and edits can be undone.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_TRIPS_TEXT, DEMO_TRAVELER_COUNT } from '../../shared/demo/demo-workspace';
import { pageErrors, startHarness, type Harness } from './harness';
import { openApp, pasteTrips, waitForEngine } from './app-helpers';

let harness: Harness;
beforeAll(async () => {
  harness = await startHarness();
});
afterAll(async () => {
  await harness?.close();
});

const demoTravelers = [...new Set(DEMO_TRIPS_TEXT.trim().split('\n').slice(1).map((l) => l.split(',')[0] ?? ''))];
const demoTripKeys = new Set(DEMO_TRIPS_TEXT.trim().split('\n').slice(1).map((l) => l.split(',').slice(0, 3).join('|')));

describe('intake', () => {
  it('pasting the demo shows every trip of every traveler', async () => {
    const page = await openApp(harness);
    await pasteTrips(page, DEMO_TRIPS_TEXT);
    await expect(page.getByTestId('intake-summary').textContent()).resolves.toMatch(new RegExp(`^${demoTripKeys.size} trips, `));
    await harness.screenshot(page, 'app-intake-demo');
    await page.getByRole('tab', { name: /^Trips/ }).click();
    const groups = page.locator('table.trip-table > tbody');
    expect(await groups.count()).toBe(demoTripKeys.size);
    expect(demoTravelers).toHaveLength(DEMO_TRAVELER_COUNT);
    for (const traveler of demoTravelers) expect(await page.getByRole('rowgroup', { name: new RegExp(`^Trip of ${traveler}`) }).count()).toBeGreaterThan(0);
    await harness.screenshot(page, 'app-trips');
    expect(pageErrors(page)).toEqual([]);
  });

  it('lists problems by line number, and clicking one selects that line', async () => {
    const page = await openApp(harness);
    const text = 'traveler,trip,flight,from,depart,to,arrive\nAda Quill,Offsite,UA 1184,DFW,2026-03-08 15:10,ORD,17:35\nBen Ostrow,Offsite,UA 11,QQX,2026-03-08 15:10,ORD,17:35\n';
    await pasteTrips(page, text);
    const problem = page.getByRole('button', { name: /^Line 3, error/ });
    await problem.waitFor();
    await problem.click();
    const selected = await page.evaluate(() => {
      const el = document.querySelector<HTMLTextAreaElement>('textarea[aria-label="Trips text"]');
      return el ? el.value.slice(el.selectionStart, el.selectionEnd) : '';
    });
    expect(selected).toBe('Ben Ostrow,Offsite,UA 11,QQX,2026-03-08 15:10,ORD,17:35');
    await harness.screenshot(page, 'app-intake-problems');
  });

  it('re-parses as the user types, and Undo restores the previous text', async () => {
    const page = await openApp(harness);
    const base = 'traveler,trip,flight,from,depart,to,arrive\nAda Quill,Offsite,UA 1184,DFW,2026-03-08 15:10,ORD,17:35\n';
    await pasteTrips(page, base);
    const area = page.getByRole('textbox', { name: 'Trips text' });
    await area.press('ControlOrMeta+End');
    await area.pressSequentially('Ada Quill,Offsite,UA 1137,ORD,2026-03-08 18:20,BOS,21:40\n', { delay: 5 });
    await page.waitForFunction(() => /^1 trips, 2 legs/.test(document.querySelector('[data-testid="intake-summary"]')?.textContent ?? ''));
    await page.keyboard.press('ControlOrMeta+Z');
    await waitForEngine(page);
    await expect(area.inputValue()).resolves.toBe(base);
    await page.waitForFunction(() => /^1 trips, 1 legs/.test(document.querySelector('[data-testid="intake-summary"]')?.textContent ?? ''));
    await page.keyboard.press('ControlOrMeta+Shift+Z');
    await expect(area.inputValue()).resolves.toContain('UA 1137');
  });
});
