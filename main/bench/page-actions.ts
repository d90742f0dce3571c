// What the app benchmark and the app's e2e tests do to the page: paste trips into the
// intake text as a real paste would (one input event with inputType insertFromPaste).
import type { Page } from 'playwright-core';

export async function pasteIntoIntake(page: Page, text: string): Promise<void> {
  await page.evaluate((t) => {
    const area = document.querySelector<HTMLTextAreaElement>('textarea[aria-label="Trips text"]');
    if (!area) throw new Error('no trips textarea: open the Intake screen first');
    area.value = t;
    area.dispatchEvent(new InputEvent('input', { bubbles: true, inputType: 'insertFromPaste', data: t }));
  }, text);
}

/** Waits until no analysis is pending (the engine state reads "Scored in … ms"). */
export async function waitForScores(page: Page): Promise<void> {
  await page.waitForFunction(() => (document.querySelector('[data-testid="engine-state"]')?.textContent ?? '').startsWith('Scored in'));
}
