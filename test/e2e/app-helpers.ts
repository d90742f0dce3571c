// Steps the app's end-to-end tests share: open the page, put trips in, wait for scores,
// and check that a chart's canvas has something drawn on it.
import type { Page } from 'playwright-core';
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
export async function waitForEngine(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const state = document.querySelector('[data-testid="engine-state"]')?.textContent ?? '';
    return state.startsWith('Scored in');
  });
}

/** Replaces the trips text as a paste would, and waits for the scores. */
export async function pasteTrips(page: Page, text: string): Promise<void> {
  await page.getByRole('tab', { name: /^Intake/ }).click();
  const area = page.getByRole('textbox', { name: 'Trips text' });
  await area.focus();
  await page.keyboard.press('ControlOrMeta+A');
  await page.keyboard.press('Delete');
  await page.evaluate((t) => {
    const el = document.querySelector<HTMLTextAreaElement>('textarea[aria-label="Trips text"]');
    if (!el) throw new Error('no trips textarea');
    el.value = t;
    el.dispatchEvent(new InputEvent('input', { bubbles: true, inputType: 'insertFromPaste', data: t }));
  }, text);
  await waitForEngine(page);
}

/** Number of canvas pixels that are not fully transparent. */
export async function paintedPixels(page: Page, testId: string): Promise<number> {
  await page.getByTestId(testId).first().waitFor();
  return page.evaluate((id) => {
    const canvas = document.querySelector<HTMLCanvasElement>(`[data-testid="${id}"]`);
    const ctx = canvas?.getContext('2d');
    if (!canvas || !ctx || canvas.width === 0 || canvas.height === 0) return 0;
    const data = ctx.getImageData(0, 0, canvas.width, canvas.height).data;
    let painted = 0;
    for (let i = 3; i < data.length; i += 4) if ((data[i] ?? 0) > 0) painted++;
    return painted;
  }, testId);
}
