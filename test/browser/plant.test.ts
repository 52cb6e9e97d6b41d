/**
 * The Plant page in a real browser: the example's plant opens sized, the shunt-current charts
 * are drawn (not blank), a recompute from the form works, and the console stays clean.
 * Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Plant page in a browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('shows the sizing table and draws the shunt-current charts', async () => {
    const { page } = h;
    const failed: string[] = [];
    page.on('response', (r) => {
      if (r.status() >= 400 && !r.url().endsWith('/favicon.ico')) failed.push(`${r.status()} ${r.url()}`);
    });
    // The browser's own /favicon.ico probe (the app serves none) is not a page error.
    const consoleErrors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error' && !m.location().url.endsWith('/favicon.ico')) consoleErrors.push(`${m.text()} @ ${m.location().url}`);
    });
    page.on('pageerror', (e) => consoleErrors.push(String(e)));

    await page.goto(`${h.baseUrl}/`);
    await page.getByRole('link', { name: 'Plant', exact: true }).click();
    await page.waitForURL(/\/plant/);
    await page.locator('#sizing-table').waitFor({ state: 'visible' });
    const sizing = await page.locator('#sizing-table').innerText();
    expect(sizing).toMatch(/Cells\s+663\s+cells/); // 300 t/d Cl2 at 5.5 kA/m², 2.7 m², CE 96 % (hand: 662.9 → 663)
    await expect(page.locator('#design-basis').inputValue()).resolves.toMatch(/Target: 300 t\/d chlorine/);
    await expect(page.locator('#shunt-summary').isVisible()).resolves.toBe(true);

    await page.waitForFunction(() => document.documentElement.getAttribute('data-charts-ready') !== null);
    for (const id of ['#shunt-chart', '#bypass-chart']) {
      await page.waitForSelector(`${id}[data-drawn="true"]`);
      const inked = await page.locator(id).evaluate((el) => {
        const c = el as HTMLCanvasElement;
        const data = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 3; i < data.length; i += 4) if (data[i] > 0) n++;
        return { n, total: c.width * c.height };
      });
      expect(inked.total, id).toBeGreaterThan(10_000);
      expect(inked.n / inked.total, id).toBeGreaterThan(0.02);
    }
    // One line per electrolyte circuit.
    const series = await page.locator('#shunt-chart').evaluate((el) => (el as HTMLCanvasElement & { chartInstance?: { data: { datasets: unknown[] } } }).chartInstance?.data.datasets.length);
    expect(series).toBe(4);

    await page.screenshot({ path: screenshotPath('plant-page'), fullPage: true });

    // Recompute from the form: half the target → 332 cells (hand: 331.45 → 332).
    await page.locator('input[name="productionRate"]').fill('150');
    await Promise.all([page.waitForURL(/\/plant/), page.getByRole('button', { name: 'Compute', exact: true }).click()]);
    await page.locator('#sizing-table').waitFor({ state: 'visible' });
    expect(await page.locator('#sizing-table').innerText()).toMatch(/Cells\s+332\s+cells/);
    await page.waitForSelector('#shunt-chart[data-drawn="true"]');

    expect(failed).toEqual([]);
    expect(consoleErrors).toEqual([]); // CSP violations and script errors would show here
  });
});
