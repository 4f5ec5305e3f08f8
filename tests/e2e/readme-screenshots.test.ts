/**
 * The README's five-minute walkthrough, in a real browser against the compiled server started on
 * an empty database with the demo scenario (as `npm start` does on first start): each demo person
 * signs in and opens the pages the walkthrough names; the test checks that each page shows the
 * demo's story and takes the walkthrough's screenshots.
 *
 * The screenshots go to tests/artifacts/screenshots/readme/; with UPDATE_README_SCREENSHOTS=1 they
 * replace the committed ones in docs/screenshots/ (the pages show dates, so they change from day
 * to day: update them on purpose, and look at every one before committing it):
 *
 *   UPDATE_README_SCREENSHOTS=1 npm run test:e2e -- tests/e2e/readme-screenshots.test.ts
 */
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Browser, type Locator, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { ApiSession } from './helpers/api';
import { type TestPage, launchBrowser, openPage, screenshotDir } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, signInAs } from './helpers/session';

const committedDir = fileURLToPath(new URL('../../docs/screenshots', import.meta.url));
const outputDir = process.env.UPDATE_README_SCREENSHOTS === '1' ? committedDir : path.join(screenshotDir, 'readme');

let server: RunningServer;
let browser: Browser;
const ids = { decided: 0, inReview: 0, draft: 0 };

beforeAll(async () => {
  // The first start analyses two 60,000-account holdouts before it listens.
  server = await startServer({ env: { DEMO_SCENARIO: 'true' }, timeoutMs: 180_000 });
  browser = await launchBrowser();
  const reader = new ApiSession(server.url);
  await reader.signIn('analyst@tallowmere.test');
  const { body } = await reader.request<{ items: { id: number; state: string }[] }>('GET', '/api/comparisons');
  const byState = (state: string) => body.items.find((item) => item.state === state)?.id ?? 0;
  ids.decided = byState('decided');
  ids.inReview = byState('in-review');
  ids.draft = byState('draft');
  expect(Object.values(ids).every((id) => id > 0), server.output().slice(-3000)).toBe(true);
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function asPerson(person: DemoPerson, run: (tab: TestPage) => Promise<void>) {
  const tab = await openPage(browser, server.url, { width: 1280, height: 800 });
  try {
    await signInAs(tab.page, person);
    await run(tab);
    expect(tab.unexpectedErrors(), `console errors:\n${tab.consoleErrors.join('\n')}\nserver:\n${server.output().slice(-2000)}`).toEqual([]);
  } finally {
    await tab.close();
  }
}

/** The visible window (1280 × 800), after scrolling `from` near the top when given. */
async function capture(page: Page, name: string, from?: Locator): Promise<void> {
  await mkdir(outputDir, { recursive: true });
  if (from) {
    await from.evaluate((element) => {
      element.scrollIntoView({ block: 'start' });
      window.scrollBy(0, -24);
    });
  }
  // Let charts finish their entrance and fonts settle.
  await page.waitForTimeout(500);
  await page.screenshot({ path: path.join(outputDir, `${name}.png`) });
}

const heading = (page: Page, name: string) => page.getByRole('heading', { name, exact: true }).first();

describe('the README walkthrough on the demo database', () => {
  it('modeler: the comparisons list, and the draft waiting for its mapping', async () => {
    await asPerson('modeler', async ({ page }) => {
      await page.goto(paths.comparisons.list());
      await page.getByRole('heading', { level: 1, name: 'Comparisons' }).waitFor();
      const main = page.locator('main');
      await main.getByText('Cash-flow challenger CF-3 vs application scorecard AS-19 — 2025 holdout').waitFor();
      const text = await main.innerText();
      for (const name of ['CF-3 as probability of default vs AS-19 — 2025 holdout', 'Quick look: 2,000-account sample of the 2025 holdout']) expect(text).toContain(name);
      await capture(page, '1-modeler-comparisons');

      await page.getByRole('link', { name: 'Quick look: 2,000-account sample of the 2025 holdout' }).click();
      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      expect(new URL(page.url()).pathname).toBe(paths.comparisons.setup(ids.draft));
      expect(await page.getByLabel('Outcome column').inputValue()).toBe('bad_12m');
      await capture(page, '2-modeler-mapping', heading(page, 'Columns'));
    });
  });

  it('analyst: the verdict of the comparison in review, and the segment where the challenger is worse', async () => {
    await asPerson('analyst', async ({ page }) => {
      await page.goto(paths.comparisons.detail(ids.inReview));
      await page.getByRole('heading', { level: 1, name: 'CF-3 as probability of default vs AS-19 — 2025 holdout' }).waitFor();
      await page.getByRole('heading', { name: 'Adoption criteria' }).waitFor();
      await capture(page, '3-analyst-verdict');

      await page.goto(paths.comparisons.segments(ids.decided));
      const row = page.getByRole('row', { name: /credit-card\/broker/ });
      await row.waitFor();
      expect(await row.innerText()).toContain('(worse)');
      await capture(page, '4-analyst-segments', heading(page, 'Segments'));

      // The review form of the comparison waiting for them.
      await page.goto(paths.comparisons.review(ids.inReview));
      await page.getByRole('textbox', { name: 'Findings' }).waitFor();
      await capture(page, '5-analyst-review', heading(page, 'Where it stands'));
    });
  });

  it('policy: the swap sets at the approval rate they run, with their annotations', async () => {
    await asPerson('policy', async ({ page }) => {
      // The verdict page names the segment values whose swap-in is riskier: brokers, and within
      // them brokered cards (npm run compare on the demo holdout flags exactly these two).
      await page.goto(paths.comparisons.detail(ids.decided));
      const glance = await page.getByTestId('swap-segments-glance').innerText();
      expect(glance).toContain('in 5 of 23 values: product = credit-card, channel = broker, product_channel = credit-card/broker, application_month = 2025-03, 1 more.');

      await page.goto(`${paths.comparisons.swapSets(ids.decided)}?rate=0.7`);
      const notes = page.getByTestId('swap-set-notes');
      await notes.getByText(/At our 70% approval rate the challenger swaps in/).waitFor();
      const grid = await page.locator('main').innerText();
      expect(grid).toContain('Swap-in');
      expect(grid).toContain('Growth case (75%)');
      await capture(page, '6-policy-swap-sets', heading(page, 'Who each model accepts'));

      // Within product × channel, brokered cards are the one value where the swap-in is riskier
      // than the swap-out (the demo's story; `npm run compare` prints the same rows).
      await page.getByLabel('Segment column').selectOption('product_channel');
      const bySegment = page.getByRole('table', { name: 'Swap sets within each segment value, champion → challenger' });
      await expect.poll(() => bySegment.getByRole('row').count()).toBe(7);
      expect(await bySegment.getByRole('row', { name: /credit-card\/broker/ }).innerText()).toContain('Swap-in riskier than swap-out');
      expect(await bySegment.getByText('Swap-in riskier than swap-out').count()).toBe(1);
      await capture(page, '6-policy-swap-by-segment', heading(page, 'Swap sets by segment'));
      await capture(page, '7-policy-scenarios-and-annotations', heading(page, 'Saved scenarios'));
    });
  });

  it('committee: the decided comparison with its review, votes and decision', async () => {
    await asPerson('committee', async ({ page }) => {
      await page.goto(paths.comparisons.review(ids.decided));
      await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
      const decision = page.getByTestId('decision');
      expect(await decision.innerText()).toMatch(/Adopt the challenger[\s\S]*Henrik Aalto/);
      // The adoption keeps the champion for brokered cards, with the strategy's figures (issue 13).
      expect(await decision.innerText()).toContain('except in product_channel = credit-card/broker, which keep the champion');
      expect(await decision.getByTestId('mixed-strategy').innerText()).toContain('Challenger except the kept values');
      expect(await page.getByTestId('chain-status').innerText()).toContain('The audit chain verifies');
      // Two challengers: the decision names the one adopted (CF-3, against the verdict's recommendation of the refit).
      expect(await page.getByTestId('decision-chosen').innerText()).toBe('Adopted: CF-3 cash-flow (challenger 1)');
      await capture(page, '8-committee-decision', heading(page, 'Committee votes'));

      // The verdict page: every model side by side, the joint test and the recommended challenger.
      await page.goto(paths.comparisons.detail(ids.decided));
      await page.getByTestId('models-summary').waitFor();
      expect(await page.getByTestId('choice-summary').innerText()).toMatch(/^AS-19 refit 2024 is recommended/);
      expect(await page.getByTestId('models-summary').innerText()).toContain('AS-19 application scorecard');
      await capture(page, '8-committee-challengers', heading(page, 'Every model'));
    });
  });

  it('admin: the outbox with the e-mails the workflow sent', async () => {
    await asPerson('admin', async ({ page }) => {
      await page.goto(paths.admin.outbox());
      await page.getByRole('heading', { level: 1, name: 'Outbox' }).waitFor();
      const text = await page.locator('main').innerText();
      for (const subject of ['Ready for review: CF-3 as probability of default', 'Decision recorded: Cash-flow challenger CF-3', 'Validated, waiting for the committee: Cash-flow challenger CF-3']) {
        expect(text).toContain(subject);
      }
      await capture(page, '9-admin-outbox');
    });
  });
});
