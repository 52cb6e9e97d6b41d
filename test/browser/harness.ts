import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { createApp } from '../../server/app.js';

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const SCREENSHOT_DIR = path.resolve('test-output', 'screenshots');

/** Launch flags for Debian's chromium on a closed network, as root, with no GPU. */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--no-first-run',
  '--disable-sync',
  '--disable-quic',
];

/**
 * Browser tests are required (CI sets REQUIRE_BROWSER=1, and so does a plain `npm test`):
 * a missing chromium fails loudly. Only SKIP_BROWSER_TESTS=1 skips them, on purpose.
 */
export function browserAvailable(): boolean {
  if (process.env.SKIP_BROWSER_TESTS === '1') return false;
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`Browser tests need Debian's chromium at ${CHROMIUM_PATH} (apt-get install -y chromium), or set SKIP_BROWSER_TESTS=1 to skip them knowingly.`);
  }
  return true;
}

/** What went wrong on a page while a test drove it; both lists stay empty on a healthy page. */
export interface PageProblems {
  /** Console errors (with their source) and uncaught page errors: script errors, CSP violations. */
  consoleErrors: string[];
  /** Responses with an HTTP status of 400 or more, as "status url". */
  failedResponses: string[];
}

/**
 * Collect the page's console errors and failed responses from now on. The app serves
 * /favicon.ico (204) and every page links a `data:,` icon, so nothing is filtered out.
 */
export function trackPageProblems(page: Page): PageProblems {
  const problems: PageProblems = { consoleErrors: [], failedResponses: [] };
  page.on('console', (m) => {
    if (m.type() === 'error') problems.consoleErrors.push(`${m.text()} @ ${m.location().url}`);
  });
  page.on('pageerror', (e) => problems.consoleErrors.push(String(e)));
  page.on('response', (r) => {
    if (r.status() >= 400) problems.failedResponses.push(`${r.status()} ${r.url()}`);
  });
  return problems;
}

/**
 * Non-transparent pixels of the canvas matched by `selector`, and its pixel count: a drawn
 * chart paints thousands, a blank canvas none. Throws if the element is not a 2-d canvas.
 */
export async function paintedPixels(page: Page, selector: string): Promise<{ painted: number; total: number }> {
  return page.locator(selector).evaluate((el) => {
    const ctx = el instanceof HTMLCanvasElement ? el.getContext('2d') : null;
    if (!ctx) throw new Error('not a 2-d canvas');
    const c = ctx.canvas;
    const data = ctx.getImageData(0, 0, c.width, c.height).data;
    let painted = 0;
    for (let i = 3; i < data.length; i += 4) if (data[i] !== 0) painted++;
    return { painted, total: c.width * c.height };
  });
}

export interface Harness extends PageProblems {
  baseUrl: string;
  browser: Browser;
  page: Page;
  close: () => Promise<void>;
}

export async function startHarness(): Promise<Harness> {
  const studyDir = mkdtempSync(path.join(os.tmpdir(), 'studies-'));
  const app = createApp({ studyDir });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS, headless: true });
  const context = await browser.newContext({ viewport: { width: 1360, height: 1000 } });
  const page = await context.newPage();
  const problems = trackPageProblems(page);
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    browser,
    page,
    ...problems,
    close: async () => {
      await browser.close();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      rmSync(studyDir, { recursive: true, force: true });
    },
  };
}

export function screenshotPath(name: string): string {
  return path.join(SCREENSHOT_DIR, `${name}.png`);
}
