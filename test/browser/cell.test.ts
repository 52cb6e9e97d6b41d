/**
 * The Cell page in a real browser: opens the example study's cell, switches both electrodes to
 * kinetics fitted from the example's datasets, runs the sweep, and checks the design-point
 * table, the drawn charts and the console. Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, screenshotPath, startHarness, type Harness } from './harness.js';

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

    expect(failed).toEqual([]);
    expect(consoleErrors).toEqual([]); // CSP violations and script errors would show here
    await page.screenshot({ path: screenshotPath('cell-page'), fullPage: true });
  });
});
