/**
 * Debian's chromium through playwright-core (never a downloaded browser), pages that record their
 * console errors, and screenshots saved to tests/artifacts/screenshots/ for people to look at.
 */
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Browser, type BrowserContext, type Page, chromium } from 'playwright-core';

export const screenshotDir = fileURLToPath(new URL('../../artifacts/screenshots', import.meta.url));

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update'],
  });
}

/**
 * Console messages that are expected, not faults. The browser logs every 4xx response as a
 * console error; asking "who is signed in?" while signed out is answered 401 by design.
 */
const expectedByDefault: RegExp[] = [/Failed to load resource: the server responded with a status of 401/];

export interface TestPage {
  page: Page;
  context: BrowserContext;
  /** Console errors and uncaught exceptions, in order. */
  consoleErrors: string[];
  /** The console errors not matched by the expected patterns (plus `allow`). */
  unexpectedErrors: (allow?: RegExp[]) => string[];
  screenshot: (name: string) => Promise<string>;
  close: () => Promise<void>;
}

export async function openPage(browser: Browser, baseURL: string, viewport = { width: 1280, height: 860 }): Promise<TestPage> {
  const context = await browser.newContext({ baseURL, viewport, locale: 'en-GB', timezoneId: 'UTC' });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  const consoleErrors: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
  });
  page.on('pageerror', (error) => consoleErrors.push(`Uncaught: ${error.message}`));
  return {
    page,
    context,
    consoleErrors,
    unexpectedErrors: (allow = []) => consoleErrors.filter((text) => ![...expectedByDefault, ...allow].some((pattern) => pattern.test(text))),
    screenshot: async (name: string) => {
      await mkdir(screenshotDir, { recursive: true });
      const file = path.join(screenshotDir, `${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      return file;
    },
    close: () => context.close(),
  };
}
