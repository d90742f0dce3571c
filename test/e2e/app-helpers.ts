// Steps the app's end-to-end tests share: open the page, put trips in, wait for scores,
// and check that a chart's canvas has something drawn on it.
import type { Page } from 'playwright-core';
import { pasteIntoIntake, waitForScores } from '../../main/bench/page-actions';
import type { Harness } from './harness';

/** Opens the app on a fresh profile and waits for the engine's first answer. */
export async function openApp(harness: Harness): Promise<Page> {
  const page = await harness.newPage();
  await page.goto(harness.server.url);
  await page.getByTestId('app-info').waitFor();
  await waitForEngine(page);
  return page;
}

/** Waits until no analysis is pending. */
export const waitForEngine = waitForScores;

/** Replaces the trips text as a paste would, and waits for the scores. */
export async function pasteTrips(page: Page, text: string): Promise<void> {
  await page.getByRole('tab', { name: /^Intake/ }).click();
  const area = page.getByRole('textbox', { name: 'Trips text' });
  await area.focus();
  await page.keyboard.press('ControlOrMeta+A');
  await page.keyboard.press('Delete');
  await pasteIntoIntake(page, text);
  await waitForEngine(page);
}

/**
 * Number of canvas pixels that are not fully transparent, once the chart has drawn: the
 * canvas is mounted first and chart.js draws on it in an effect just after.
 */
export async function paintedPixels(page: Page, testId: string): Promise<number> {
  await page.getByTestId(testId).first().waitFor();
  const handle = await page.waitForFunction((id) => {
    const canvas = document.querySelector<HTMLCanvasElement>(`[data-testid="${id}"]`);
    const ctx = canvas?.getContext('2d');
    if (!canvas || !ctx || canvas.width === 0 || canvas.height === 0) return 0;
    const data = ctx.getImageData(0, 0, canvas.width, canvas.height).data;
    let painted = 0;
    for (let i = 3; i < data.length; i += 4) if ((data[i] ?? 0) > 0) painted++;
    return painted > 0 ? painted : 0;
  }, testId);
  return (await handle.jsonValue()) as number;
}

/** Opens the Trips screen and waits until its table has rows. */
export async function showTrips(page: Page): Promise<void> {
  await page.getByRole('tab', { name: /^Trips/ }).click();
  await page.locator('table.trip-table > tbody').first().waitFor();
}
