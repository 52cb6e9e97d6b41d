/**
 * Costs page in a real browser (Debian chromium via playwright-core): the cost curve and the
 * tornado are drawn from the embedded chart data, the optimum is in the summary table, and
 * the page logs no console errors.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, screenshotPath, startHarness, type Harness } from './harness.js';

/** Count of non-transparent pixels of a canvas (a drawn chart has thousands). */
async function paintedPixels(h: Harness, id: string): Promise<number> {
  return h.page.evaluate((canvasId) => {
    const c = document.getElementById(canvasId) as HTMLCanvasElement | null;
    if (!c) return -1;
    const ctx = c.getContext('2d');
    if (!ctx) return -1;
    const data = ctx.getImageData(0, 0, c.width, c.height).data;
    let n = 0;
    for (let i = 3; i < data.length; i += 4) if (data[i] !== 0) n++;
    return n;
  }, id);
}

describe.skipIf(!browserAvailable())('Costs page in the browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
    // The app serves no favicon; answer the browser's automatic request so it logs no 404.
    await h.page.route('**/favicon.ico', (route) => route.fulfill({ status: 204, body: '' }));
  });
  afterAll(async () => {
    await h?.close();
  });

  it('draws the cost curve and the tornado, with the optimum in the table', async () => {
    await h.page.goto(`${h.baseUrl}/costs?study=example-brackwater-pilot`);
    await h.page.waitForSelector('#cost-chart[data-drawn="true"]');
    await h.page.waitForSelector('#tornado-chart[data-drawn="true"]');
    expect(await paintedPixels(h, 'cost-chart')).toBeGreaterThan(2000);
    expect(await paintedPixels(h, 'tornado-chart')).toBeGreaterThan(2000);
    const optimum = await h.page.textContent('#economic-current-density td.num');
    // Example: j* = √(C·CRF/(p·K·H)) ≈ 5.286 kA/m² (worked out in test/web/costs-page.test.ts).
    expect(Number(optimum)).toBeGreaterThan(5.2);
    expect(Number(optimum)).toBeLessThan(5.4);
    expect(await h.page.locator('#tornado-table tbody tr').count()).toBe(8);
    await h.page.screenshot({ path: screenshotPath('costs-page'), fullPage: true });
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
    expect(h.consoleErrors).toEqual([]);
  });
});
