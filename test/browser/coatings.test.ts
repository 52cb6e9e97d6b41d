/**
 * Coatings page in a real browser (Debian chromium via playwright-core): the side-by-side
 * table and both charts are drawn, and the page logs no console errors.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Coatings page in the browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('draws the comparison table, the NPV chart and the voltage chart', async () => {
    await h.page.goto(`${h.baseUrl}/coatings?study=example-brackwater-pilot`);
    await h.page.waitForSelector('#npv-chart[data-drawn="true"]');
    await h.page.waitForSelector('#voltage-chart[data-drawn="true"]');
    expect((await paintedPixels(h.page, '#npv-chart')).painted).toBeGreaterThan(2000);
    expect((await paintedPixels(h.page, '#voltage-chart')).painted).toBeGreaterThan(2000);
    const rows = await h.page.locator('#coatings-table tbody tr').count();
    expect(rows).toBeGreaterThanOrEqual(2);
    expect(await h.page.locator('#coatings-table tbody tr.baseline').count()).toBe(1);
    await h.page.screenshot({ path: screenshotPath('coatings-page'), fullPage: true });
    expect(h.failedResponses).toEqual([]);
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
    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]);
  });
});
