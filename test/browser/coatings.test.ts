/**
 * Coatings page in a real browser (Debian chromium via playwright-core): the side-by-side
 * table and both charts are drawn, and the page logs no console errors.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, screenshotPath, startHarness, type Harness } from './harness.js';

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

describe.skipIf(!browserAvailable())('Coatings page in the browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
    // The app serves no favicon; answer the browser's automatic request so it logs no 404.
    await h.page.route('**/favicon.ico', (route) => route.fulfill({ status: 204, body: '' }));
  });
  afterAll(async () => {
    await h?.close();
  });

  it('draws the comparison table, the NPV chart and the voltage chart', async () => {
    await h.page.goto(`${h.baseUrl}/coatings?study=example-brackwater-pilot`);
    await h.page.waitForSelector('#npv-chart[data-drawn="true"]');
    await h.page.waitForSelector('#voltage-chart[data-drawn="true"]');
    expect(await paintedPixels(h, 'npv-chart')).toBeGreaterThan(2000);
    expect(await paintedPixels(h, 'voltage-chart')).toBeGreaterThan(2000);
    const rows = await h.page.locator('#coatings-table tbody tr').count();
    expect(rows).toBeGreaterThanOrEqual(2);
    expect(await h.page.locator('#coatings-table tbody tr.baseline').count()).toBe(1);
    await h.page.screenshot({ path: screenshotPath('coatings-page'), fullPage: true });
    expect(h.consoleErrors).toEqual([]);
  });

  it('adds an option column and compares again', async () => {
    await h.page.selectOption('select[name="resize"]', '3');
    await Promise.all([h.page.waitForNavigation(), h.page.click('button[value="resize"]')]);
    await h.page.fill('input[name="opt2_name"]', 'Third option');
    await Promise.all([h.page.waitForNavigation(), h.page.click('button[value="compute"]')]);
    await h.page.waitForSelector('#npv-chart[data-drawn="true"]');
    expect(await h.page.locator('#coatings-table tbody tr').count()).toBe(3);
    expect(await h.page.textContent('#coatings-table')).toContain('Third option');
    expect(h.consoleErrors).toEqual([]);
  });
});
