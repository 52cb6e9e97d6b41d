/**
 * The Plant page in a real browser: the example's plant opens sized, the shunt-current charts
 * are drawn (not blank), a recompute from the form works, and the console stays clean.
 * Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

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
      const { painted, total } = await paintedPixels(page, id);
      expect(total, id).toBeGreaterThan(10_000);
      expect(painted / total, id).toBeGreaterThan(0.02);
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

    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]); // CSP violations and script errors would show here
  });
});
