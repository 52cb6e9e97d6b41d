/**
 * The Safety page in a real browser: the example's checks and the caution texts with their
 * sources are visible, a recompute at a low minimum load raises an alarm, and the console stays
 * clean. Saves a full-page screenshot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { browserAvailable, screenshotPath, startHarness, type Harness } from './harness.js';

describe.skipIf(!browserAvailable())('Safety page in a browser', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  it('shows the checks and the cautions', async () => {
    const { page } = h;
    await page.goto(`${h.baseUrl}/`);
    await page.getByRole('link', { name: 'Safety', exact: true }).click();
    await page.waitForURL(/\/safety/);
    await page.locator('#checks').waitFor({ state: 'visible' });
    const checks = page.locator('section.check');
    expect(await checks.count()).toBe(5);
    const text = await page.locator('#checks').innerText();
    expect(text).toContain('Hydrogen in chlorine at the operating point');
    expect(text).toContain('Hydrogen in chlorine at minimum load');
    expect(text).toContain('Temperature against the boiling point');
    expect(text).toContain('Current density against the limiting current');
    await expect(page.locator('#caution-chlorine').isVisible()).resolves.toBe(true);
    await expect(page.locator('#caution-hydrogen').isVisible()).resolves.toBe(true);
    expect(await page.locator('#cautions').innerText()).toContain('OSHA');
    expect(await page.locator('body').innerText()).toContain('licensed engineering practice govern');
    await page.screenshot({ path: screenshotPath('safety-page'), fullPage: true });

    // 5 % minimum load: 0.15 vol % at full load becomes ≈ 2.9 vol % H2 in Cl2, above the trip screen.
    await page.locator('input[name="minimumLoad"]').fill('5');
    await Promise.all([page.waitForURL(/\/safety/), page.getByRole('button', { name: 'Recompute' }).click()]);
    await page.locator('#checks').waitFor({ state: 'visible' });
    await expect(page.locator('#check-hydrogen-in-chlorine-minimum-load').getAttribute('data-level')).resolves.toBe('alarm');

    expect(h.failedResponses).toEqual([]);
    expect(h.consoleErrors).toEqual([]);
  });
});
