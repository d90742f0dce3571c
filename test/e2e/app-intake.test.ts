// The intake screen in Chromium: pasting the demo shows every trip, problems are listed by
// line and select that line, and edits can be undone.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_TRIPS_TEXT, DEMO_TRAVELER_COUNT } from '../../shared/demo/demo-workspace';
import { pageErrors, startHarness, type Harness } from './harness';
import { openApp, pasteTrips, showTrips, waitForEngine } from './app-helpers';

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
    await expect.poll(() => page.getByTestId('intake-summary').textContent()).toMatch(new RegExp(`^${demoTripKeys.size} trips, `));
    await harness.screenshot(page, 'app-intake-demo');
    await showTrips(page);
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
    await page.waitForFunction(() => /^1 trip, 2 legs/.test(document.querySelector('[data-testid="intake-summary"]')?.textContent ?? ''));
    await page.keyboard.press('ControlOrMeta+Z');
    await waitForEngine(page);
    await expect.poll(() => area.inputValue()).toBe(base);
    await page.waitForFunction(() => /^1 trip, 1 leg /.test(document.querySelector('[data-testid="intake-summary"]')?.textContent ?? ''));
    await page.keyboard.press('ControlOrMeta+Shift+Z');
    await expect.poll(() => area.inputValue()).toContain('UA 1137');
  });
});

describe('intake of e-mail text', () => {
  it('reads legs from itinerary lines and lists the other lines as ignored, by line', async () => {
    const page = await openApp(harness);
    const text = ['Your trip to Boston', 'Sunday, 8 March 2026', 'UA 1184 DFW 15:10 ORD 17:35', 'UA 1137 ORD 18:20 BOS 21:40', 'Seat 14C, meal included'].join('\n');
    await pasteTrips(page, text);
    await page.getByTestId('intake-summary').filter({ hasText: /^1 trip, 2 legs read \(text\)/ }).waitFor();
    await page.getByRole('button', { name: /^Line 1, warning/ }).waitFor();
    await page.getByRole('button', { name: /^Line 5, warning/ }).waitFor();
    await harness.screenshot(page, 'app-intake-email');
  });
});

describe('intake from files', () => {
  const csv = 'traveler,trip,flight,from,depart,to,arrive\nAda Quill,Offsite,UA 1184,DFW,2026-03-08 15:10,ORD,17:35\nAda Quill,Offsite,UA 1137,ORD,2026-03-08 18:20,BOS,21:40\n';

  it('reads a CSV file dropped on the text area', async () => {
    const page = await openApp(harness);
    await page.getByRole('tab', { name: /^Intake/ }).click();
    await page.evaluate((text) => {
      const transfer = new DataTransfer();
      transfer.items.add(new File([text], 'offsite.csv', { type: 'text/csv' }));
      document.querySelector('.editor')?.dispatchEvent(new DragEvent('drop', { bubbles: true, cancelable: true, dataTransfer: transfer }));
    }, csv);
    await page.getByRole('status').filter({ hasText: 'Imported offsite.csv' }).waitFor();
    await page.getByTestId('intake-summary').filter({ hasText: /^1 trip, 2 legs read \(csv\)/ }).waitFor();
    await expect.poll(() => page.getByRole('textbox', { name: 'Trips text' }).inputValue()).toBe(csv);
  });

  it('imports an iCalendar file through the import dialog', async () => {
    const page = await openApp(harness);
    await page.getByRole('tab', { name: /^Intake/ }).click();
    // RFC 5545 VEVENTs with TZID start and end times; summary carries the flight and airports.
    const ics = [
      'BEGIN:VCALENDAR',
      'VERSION:2.0',
      'PRODID:-//Invented//Layline e2e//EN',
      'BEGIN:VEVENT',
      'UID:leg1@example.invalid',
      'DTSTAMP:20260201T000000Z',
      'SUMMARY:UA 1184 DFW to ORD',
      'DTSTART;TZID=America/Chicago:20260308T151000',
      'DTEND;TZID=America/Chicago:20260308T173500',
      'END:VEVENT',
      'END:VCALENDAR',
      '',
    ].join('\r\n');
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import file…' }).click()]);
    await chooser.setFiles({ name: 'trip.ics', mimeType: 'text/calendar', buffer: Buffer.from(ics) });
    await page.getByTestId('intake-summary').filter({ hasText: /^1 trip, 1 leg read \(ics\)/ }).waitFor();
  });
});
