/**
 * The Cell page in a real browser: opens the example study's cell, switches both electrodes to
 * kinetics fitted from the example's datasets, runs the sweep, and checks the design-point
 * table, the drawn charts and the console. Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Cell page in a browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('fits kinetics from the datasets, computes the cell and draws its charts', async () => {
    const { page } = h;
    await page.goto(`${h.baseUrl}/`);
    await page.getByRole('link', { name: 'Cell', exact: true }).click();
    await page.waitForURL(/\/cell/);
    // Opens computed from the example's saved cell.
    await page.locator('#design-table').waitFor({ state: 'visible' });

    await page.locator('input[name="anode.source"][value="dataset"]').check();
    await page.locator('select[name="anode.dataset"]').selectOption('anode-a-88c');
    await page.locator('input[name="cathode.source"][value="dataset"]').check();
    await page.locator('select[name="cathode.dataset"]').selectOption('cathode-c-88c');
    await Promise.all([page.waitForURL(/\/cell/), page.getByRole('button', { name: 'Compute', exact: true }).click()]);

    await page.locator('#design-table').waitFor({ state: 'visible' });
    await expect(page.locator('#input-problems').count()).resolves.toBe(0);
    const kinetics = await page.locator('#kinetics-table').innerText();
    expect(kinetics).toContain('Tafel fit of dataset "Anode coating A, 88 °C"');
    expect(kinetics).toContain('Tafel fit of dataset "Cathode C (activated Ni), 88 °C"');
    const voltageRow = await page.locator('#design-table tr').first().innerText();
    const u = Number(/([\d.]+)\s*V/.exec(voltageRow)?.[1]);
    // check-values.md §9a (from memory, low confidence): ≈ 2.9–3.2 V at 5–6 kA/m².
    expect(u).toBeGreaterThan(2.9);
    expect(u).toBeLessThan(3.2);
    await expect(page.locator('#kfactor-table').isVisible()).resolves.toBe(true);

    // Charts: Chart.js drew each canvas (charts.js marks it) and the canvas is not blank.
    await page.waitForFunction(() => document.documentElement.getAttribute('data-charts-ready') !== null);
    for (const id of ['#chart-voltage', '#chart-efficiency']) {
      await page.waitForSelector(`${id}[data-drawn="true"]`);
      const { painted, total } = await paintedPixels(page, id);
      expect(total, id).toBeGreaterThan(10_000);
      expect(painted / total, id).toBeGreaterThan(0.02);
    }

    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]); // CSP violations and script errors would show here
    await page.screenshot({ path: screenshotPath('cell-page'), fullPage: true });
  });
});
