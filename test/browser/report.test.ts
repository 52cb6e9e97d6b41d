/**
 * The Report page in a real browser: reached from the navigation, every section present, the
 * polarization chart drawn, no console errors or failed responses, and the print layout (nav
 * and screen-only hints hidden, charts kept). Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Report page in a browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('opens from the navigation, draws the polarization chart and prints without the navigation', async () => {
    const { page } = h;
    await page.goto(`${h.baseUrl}/`);
    await page.getByRole('link', { name: 'Report', exact: true }).click();
    await page.waitForURL(/\/report\?study=/);

    for (const title of ['1. Study', '2. Kinetics', '3. Cell', '4. Plant', '5. Coatings', '6. Costs', '7. Safety', '8. Assumptions and sources']) {
      await expect(page.getByRole('heading', { level: 2, name: title, exact: true }).isVisible(), title).resolves.toBe(true);
    }
    await expect(page.locator('.report-failed').count()).resolves.toBe(0);

    // The chart: Chart.js drew the canvas (charts.js marks it) and the canvas is not blank.
    await page.waitForFunction(() => document.documentElement.getAttribute('data-charts-ready') !== null);
    await page.waitForSelector('#report-chart-voltage[data-drawn="true"]');
    const { painted, total } = await paintedPixels(page, '#report-chart-voltage');
    expect(total).toBeGreaterThan(10_000);
    expect(painted / total).toBeGreaterThan(0.02);

    // Print media: the navigation and the screen-only hint go, the chart and the tables stay.
    await page.emulateMedia({ media: 'print' });
    await expect(page.locator('.topbar nav').isVisible()).resolves.toBe(false);
    await expect(page.locator('.report-screen-only').isVisible()).resolves.toBe(false);
    await expect(page.locator('#report-chart-voltage').isVisible()).resolves.toBe(true);
    await expect(page.locator('#report-design').isVisible()).resolves.toBe(true);
    const breakInside = await page.locator('#report-tornado').evaluate((el) => getComputedStyle(el).breakInside);
    expect(breakInside).toBe('avoid');
    await page.emulateMedia({ media: 'screen' });

    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]); // CSP violations and script errors would show here
    await page.screenshot({ path: screenshotPath('report-page'), fullPage: true });
  });
});
