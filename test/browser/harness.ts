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

export interface Harness {
  baseUrl: string;
  browser: Browser;
  page: Page;
  consoleErrors: string[];
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
  const consoleErrors: string[] = [];
  page.on('console', (msg) => {
    if (msg.type() === 'error') consoleErrors.push(msg.text());
  });
  page.on('pageerror', (err) => consoleErrors.push(String(err)));
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    browser,
    page,
    consoleErrors,
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
