/**
 * Costs page in a real browser (Debian chromium via playwright-core): the cost curve and the
 * tornado are drawn from the embedded chart data, the optimum is in the summary table, and
 * the page logs no console errors.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Costs page in the browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('draws the cost curve and the tornado, with the optimum in the table', async () => {
    await h.page.goto(`${h.baseUrl}/costs?study=example-brackwater-pilot`);
    await h.page.waitForSelector('#cost-chart[data-drawn="true"]');
    await h.page.waitForSelector('#tornado-chart[data-drawn="true"]');
    expect((await paintedPixels(h.page, '#cost-chart')).painted).toBeGreaterThan(2000);
    expect((await paintedPixels(h.page, '#tornado-chart')).painted).toBeGreaterThan(2000);
    const optimum = await h.page.textContent('#economic-current-density td.num');
    // Example: j* = √(C·CRF/(p·K·H)) ≈ 5.286 kA/m² (worked out in test/web/costs-page.test.ts).
    expect(Number(optimum)).toBeGreaterThan(5.2);
    expect(Number(optimum)).toBeLessThan(5.4);
    expect(await h.page.locator('#tornado-table tbody tr').count()).toBe(8);
    await h.page.screenshot({ path: screenshotPath('costs-page'), fullPage: true });
    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]);
  });

  it('recomputes from the form and keeps working without console errors', async () => {
    await h.page.fill('input[name="price"]', '90');
    await Promise.all([h.page.waitForNavigation(), h.page.click('button[value="compute"]')]);
    await h.page.waitForSelector('#cost-chart[data-drawn="true"]');
    const optimum = Number(await h.page.textContent('#economic-current-density td.num'));
    // j* ∝ 1/√p: 5.286 × √(60/90) ≈ 4.316 kA/m².
    expect(optimum).toBeGreaterThan(4.25);
    expect(optimum).toBeLessThan(4.38);
    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]);
  });
});
