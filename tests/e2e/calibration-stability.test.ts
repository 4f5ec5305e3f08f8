/**
 * The Calibration and Stability tabs in a real browser, on the demo database (the compiled
 * server's first start with the demo scenario): the PD comparison in review shows the band whose
 * PDs are too low (Jeffreys test), the months where the uplift turns, and the PSI against the
 * 2023 development sample. Screenshots go to tests/artifacts/screenshots/calibration/.
 */
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { ApiSession } from './helpers/api';
import { launchBrowser, openPage, screenshotDir } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { signInAs } from './helpers/session';

let server: RunningServer;
let browser: Browser;
let pdId = 0;
const outputDir = path.join(screenshotDir, 'calibration');

beforeAll(async () => {
  // The first start analyses two 60,000-account holdouts before it listens: minutes on a loaded machine.
  server = await startServer({ env: { DEMO_SCENARIO: 'true' }, timeoutMs: 420_000 });
  browser = await launchBrowser();
  const reader = new ApiSession(server.url);
  await reader.signIn('analyst@tallowmere.test');
  const { body } = await reader.request<{ items: { id: number; state: string }[] }>('GET', '/api/comparisons');
  pdId = body.items.find((item) => item.state === 'in-review')?.id ?? 0;
  expect(pdId, server.output().slice(-3000)).toBeGreaterThan(0);
  await mkdir(outputDir, { recursive: true });
}, 480_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('calibration and stability tabs on the demo', () => {
  it('the analyst opens Calibration and Stability of the PD comparison and sees the failing band, the turning months and the PSI', async () => {
    const tab = await openPage(browser, server.url, { width: 1280, height: 900 });
    try {
      const { page } = tab;
      await signInAs(page, 'analyst');
      await page.goto(paths.comparisons.detail(pdId));
      await page.getByRole('link', { name: 'Calibration', exact: true }).click();
      await page.waitForURL((url) => url.pathname === paths.comparisons.calibration(pdId));
      const failing = page.getByRole('row', { name: /^Band 10\b/ }).first();
      await failing.waitFor();
      expect(await failing.innerText()).toContain('too low');
      const main = page.locator('main');
      expect(await main.innerText()).toMatch(/Band 10 has more bads than its PD allows at α = 0.05/);
      expect(await page.locator('figure').count()).toBeGreaterThan(0);
      await page.waitForTimeout(300);
      await page.screenshot({ path: path.join(outputDir, 'calibration.png'), fullPage: true });

      await page.getByRole('link', { name: 'Stability', exact: true }).click();
      await page.waitForURL((url) => url.pathname === paths.comparisons.stability(pdId));
      await page.getByRole('heading', { name: 'By application_month', exact: true }).waitFor();
      const text = await main.innerText();
      expect(text).toMatch(/The uplift changes sign in 2025-08 .*2025-09 .*2025-12/);
      expect(text).toContain('tallowmere-development-2023.csv');
      expect(await page.getByRole('row', { name: /^2025-12\b/ }).first().innerText()).toContain('sign changed');
      await page.waitForTimeout(300);
      await page.screenshot({ path: path.join(outputDir, 'stability.png'), fullPage: true });
      expect(tab.unexpectedErrors(), `console errors:\n${tab.consoleErrors.join('\n')}`).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});
