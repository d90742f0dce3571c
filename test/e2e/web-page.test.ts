// The built renderer, as a plain page in Chromium, with its in-page API worker.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pageErrors, startHarness, type Harness } from './harness';

let harness: Harness;
beforeAll(async () => {
  harness = await startHarness();
});
afterAll(async () => {
  await harness?.close();
});

describe('the renderer as a plain web page', () => {
  it('loads, reaches the in-page engine worker and shows its answer', async () => {
    const page = await harness.newPage();
    await page.goto(harness.server.url);
    await expect(page.getByRole('heading', { name: 'Layline' }).isVisible()).resolves.toBe(true);
    const info = page.getByTestId('app-info');
    await info.waitFor();
    expect(await info.textContent()).toMatch(/Layline \d+\.\d+\.\d+, engine running in the page worker/);
    await harness.screenshot(page, 'foundation-home');
    expect(pageErrors(page)).toEqual([]);
  });

  it('is served with a restrictive Content-Security-Policy', async () => {
    const page = await harness.newPage();
    await page.goto(harness.server.url);
    const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).not.toContain('unsafe-eval');
  });
});
