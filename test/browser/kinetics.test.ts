import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FARADAY, GAS_CONSTANT } from '../../server/core/constants.js';
import { expectClose } from '../helpers/close.js';
import { browserAvailable, paintedPixels, screenshotPath, startHarness, type Harness } from './harness.js';

/**
 * Synthetic anodic Tafel data, generated here from stated parameters with the textbook Tafel
 * law η = (ln 10·RT/(αF))·log10(j/j0) (exact SI 2019 R and F from constants.ts):
 * α = 1, T = 25 °C, j0 = 0.01 mA/cm². Expected slope 59.16 mV/decade (also the
 * check-values.md §9d table entry for α = 1 at 298.15 K). A fixed ±0.3 mV zig-zag stands in
 * for measurement noise. Values are written in mA/cm² and mV, tab-separated, with a header.
 */
const T_K = 298.15;
const ALPHA = 1;
const J0_MA_CM2 = 0.01;
const SLOPE_MV = (1000 * Math.LN10 * GAS_CONSTANT.value * T_K) / (ALPHA * FARADAY.value);

function tafelTable(): string {
  const rows = ['j (mA/cm2)\tE (mV)'];
  const n = 16;
  for (let i = 0; i < n; i++) {
    const j = 10 ** (0 + (2.5 * i) / (n - 1)); // 1 … 316 mA/cm²
    const eta = SLOPE_MV * Math.log10(j / J0_MA_CM2) + (i % 2 === 0 ? 0.3 : -0.3);
    rows.push(`${j.toPrecision(6)}\t${eta.toFixed(2)}`);
  }
  return rows.join('\n');
}

describe.skipIf(!browserAvailable())('Kinetics page in a browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('fits a pasted table, draws the Tafel chart and shows the expected slope', async () => {
    const { page } = h;
    await page.goto(`${h.baseUrl}/`);
    await page.getByRole('link', { name: 'Kinetics' }).click();
    await page.waitForURL(/\/kinetics/);

    await page.locator('input[name="source"][value="paste"]').check();
    await page.locator('textarea[name="data"]').fill(tafelTable());
    await page.locator('select[name="currentUnit"]').selectOption('mA/cm2');
    await page.locator('select[name="potentialUnit"]').selectOption('mV');
    await page.locator('input[name="potentialKind"][value="overpotential"]').check();
    await page.locator('input[name="temperatureC"]').fill('25');
    await page.locator('input[name="irMode"][value="none"]').check();
    await page.locator('input[name="model"][value="tafel"]').check();
    await page.locator('input[name="windowMode"][value="auto"]').check();
    await Promise.all([page.waitForURL(/\/kinetics/), page.getByRole('button', { name: 'Fit', exact: true }).click()]);

    await page.locator('#parameter-table').waitFor({ state: 'visible' });
    const slopeText = await page.locator('#parameter-table tr[data-parameter="tafelSlope"] td.value').innerText();
    expectClose(Number(slopeText), SLOPE_MV, { rtol: 0.01 }, 'Tafel slope shown (mV/decade)');

    // Charts: Chart.js drew into the canvas (charts.js marks it) and the canvas is not blank.
    await page.waitForFunction(() => document.documentElement.getAttribute('data-charts-ready') !== null);
    const tafel = page.locator('#chart-tafel');
    await page.waitForSelector('#chart-tafel[data-drawn="true"]');
    expect(await tafel.getAttribute('data-drawn')).toBe('true');
    const { painted, total } = await paintedPixels(page, '#chart-tafel');
    expect(total).toBeGreaterThan(10_000);
    expect(painted / total).toBeGreaterThan(0.01);

    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]); // CSP violations and script errors would show here
    await page.screenshot({ path: screenshotPath('kinetics-fit'), fullPage: true });
  });
});
