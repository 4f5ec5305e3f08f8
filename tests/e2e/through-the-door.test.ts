/**
 * A through-the-door holdout in a real browser against the compiled server, without editing the
 * file: the champion's declines carry the coded outcome `R` (no outcome), booked goods are sampled
 * one in four with a weight of 4. The modeler uploads it, maps it (Applicants without an outcome,
 * the coded value, the sampling weight), checks it, sets parcelling as the reject inference and
 * runs the analysis; the verdict, the swap sets and the data page state the unknown applicants;
 * the modeler submits, the analyst validates, and the printable report names the population and
 * the inference.
 *
 * The file comes from the demo's own simulation (sample-data/through-the-door.ts) on 16,000
 * applications, written with `R` in place of the blank outcome; the expected counts are computed
 * here from the same rows.
 */
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { simulate } from '../../sample-data/generate';
import { throughTheDoor } from '../../sample-data/through-the-door';
import { type TestPage, launchBrowser, openPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, signInAs } from './helpers/session';

let server: RunningServer;
let browser: Browser;
let workDir: string;
let file: string;
let comparisonId: number | null = null;
const name = 'Through-the-door sample with coded rejects (browser test)';

/** What the file holds, counted from its rows. */
const expected = { rows: 0, unknown: 0, accounts: 0, known: 0 };

const fmt = (n: number) => n.toLocaleString('en-GB');

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  workDir = await mkdtemp(path.join(tmpdir(), 'scorecourt-e2e-door-'));
  const rows = throughTheDoor(simulate(16_000));
  const lines = ['account_id,product,channel,loan_amount,bad_12m,champion_points,challenger_points,sample_weight'];
  for (const { account: a, bad, weight } of rows) {
    lines.push([a.id, a.product, a.channel, a.amount, bad === null ? 'R' : bad, a.championPoints, a.challengerPoints, weight].join(','));
    expected.rows++;
    expected.accounts += weight;
    if (bad === null) expected.unknown++;
    else expected.known++;
  }
  file = path.join(workDir, 'through-the-door-2025.csv');
  await writeFile(file, lines.join('\n') + '\n');
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  if (workDir) await rm(workDir, { recursive: true, force: true });
});

async function asPerson(person: DemoPerson, run: (tab: TestPage) => Promise<void>) {
  const tab = await openPage(browser, server.url);
  try {
    await signInAs(tab.page, person);
    await run(tab);
    expect(tab.unexpectedErrors(), `console errors:\n${tab.consoleErrors.join('\n')}\nserver:\n${server.output().slice(-2000)}`).toEqual([]);
  } finally {
    await tab.close();
  }
}

function idFromUrl(url: string): number {
  const match = /\/comparisons\/(\d+)/.exec(new URL(url).pathname);
  if (!match) throw new Error(`no comparison id in ${url}`);
  return Number(match[1]);
}

describe('a through-the-door holdout with coded rejects and weights, in the browser', () => {
  it('the modeler uploads it, maps the unknown outcomes and the weight, checks it and runs the analysis without editing the file', async () => {
    // The file really has the coded value and no blank outcome: nothing was prepared for the reader.
    expect(expected.unknown).toBeGreaterThan(1000);
    await asPerson('modeler', async (tab) => {
      const { page } = tab;
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New comparison' }).click();
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(file);
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      await page.getByRole('heading', { level: 1, name: 'Name the comparison' }).waitFor();
      await page.getByText(`${fmt(expected.rows)} rows · 8 columns`).waitFor();
      await page.getByLabel('Name of the comparison').fill(name);
      await page.getByRole('button', { name: 'Save and map the columns' }).click();

      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      comparisonId = idFromUrl(page.url());
      // The reader proposes the outcome, its bad value and the coded "no outcome" value R.
      expect(await page.getByLabel('Outcome column').inputValue()).toBe('bad_12m');
      expect(await page.getByLabel('Value that means bad').inputValue()).toBe('1');
      expect(await page.getByLabel('Champion score column').inputValue()).toBe('champion_points');
      expect(await page.getByLabel('Challenger score column').inputValue()).toBe('challenger_points');
      expect(await page.getByLabel('Keep applicants without an outcome').isChecked()).toBe(true);
      expect(await page.getByLabel('Values that also mean no outcome').inputValue()).toBe('R');
      await page.getByLabel('Sampling weight').selectOption('sample_weight');

      // Without the option the coded rejects stop the check, naming row and column.
      await page.getByLabel('Keep applicants without an outcome').uncheck();
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByText(/The data do not fit this mapping/).waitFor();
      expect(await page.getByRole('main').innerText()).toContain('bad_12m');
      await page.getByRole('button', { name: 'Back to the column mapping' }).click();
      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();

      expect(await page.getByLabel('Sampling weight').inputValue()).toBe('sample_weight');
      await page.getByLabel('Keep applicants without an outcome').check();
      await page.getByLabel('Values that also mean no outcome').fill('R');
      await tab.screenshot('door-1-mapping');
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByRole('heading', { level: 1, name: 'Check the data' }).waitFor();
      await page.getByText('Every row fits the mapping').waitFor();
      const check = await page.getByRole('main').innerText();
      expect(check).toContain(`The analysis will run on ${fmt(expected.rows)} rows standing for ${fmt(expected.accounts)} applicants; ${fmt(expected.unknown)} rows have no outcome.`);
      await tab.screenshot('door-2-check');
      await page.getByRole('button', { name: 'Continue to the settings' }).click();

      await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
      await page.getByLabel('Bootstrap replicates').fill('200');
      await page.getByLabel("How to state the unknown applicants' bad rate").selectOption('parcel');
      await page.getByLabel('Parcel factor').fill('2');
      await tab.screenshot('door-3-settings');
      await page.getByRole('button', { name: 'Run the analysis' }).click();

      await page.waitForURL((url) => url.pathname === paths.comparisons.detail(comparisonId!));
      await page.getByTestId('verdict-summary').waitFor({ timeout: 120_000 });
      const verdict = await page.getByTestId('verdict-summary').innerText();
      // The swap-in is the champion's declines: its bad rate is stated as inferred, and how.
      expect(verdict).toMatch(/it swaps in [\d,]+ accounts with an inferred [\d.]+% bad rate for [\d,]+ with an inferred [\d.]+% bad rate \(parcelling \(factor 2\)\)/);
      expect(await page.getByRole('main').innerText()).toContain('Swap-in bad rate not above swap-out (parcelling (factor 2))');
      await tab.screenshot('door-4-verdict');

      // The swap sets: the swap-in's applicants have no outcome; bounds and the inferred rate beside it.
      await page.goto(paths.comparisons.swapSets(comparisonId!));
      await page.getByTestId('swapIn-unknown').waitFor();
      expect(await page.getByTestId('swapIn-unknown').innerText()).toBe(await page.getByTestId('swapIn-count').innerText());
      expect(await page.getByTestId('swapIn-bounds').innerText()).toMatch(/0\.0%.*100\.0%/);
      expect(await page.getByTestId('swapIn-inferred').innerText()).toMatch(/^\d+\.\d%$/);
      expect(await page.locator('[data-cell="swapIn"]').innerText()).toContain('The inferred rate assumes their bads from parcelling; it is not observed.');
      await tab.screenshot('door-5-swap-sets');

      // The review page: submitted for the analyst.
      await page.goto(paths.comparisons.review(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
      await page.getByLabel('Note for the analyst').fill('Through-the-door sample: declined applicants coded R, goods weighted 4; parcelling with factor 2.');
      await page.getByRole('button', { name: 'Submit for review' }).click();
      await page.getByText('Submitted for review. The analysts have been told by e-mail.').waitFor();
    });
  }, 240_000);

  it('the analyst reads the applicants without an outcome on the data page and validates it', async () => {
    expect(comparisonId, 'the first test creates the comparison').not.toBeNull();
    await asPerson('analyst', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.detail(comparisonId!));
      await page.getByTestId('verdict-summary').waitFor();
      await page.getByRole('navigation', { name: 'Comparison pages' }).getByRole('link', { name: 'Data' }).click();
      const unknown = page.getByRole('heading', { name: 'Applicants without an outcome' });
      await unknown.waitFor();
      expect(await page.getByRole('main').innerText()).toContain(`${fmt(expected.unknown)} rows`);

      // Segments, bands and swap sets by segment add the applicants and those without an outcome.
      await page.goto(paths.comparisons.segments(comparisonId!));
      const segments = page.getByRole('table', { name: 'Both models within each segment' });
      await segments.getByRole('columnheader', { name: 'Without an outcome' }).waitFor();
      await segments.getByRole('columnheader', { name: 'Rows with an outcome' }).waitFor();
      await page.goto(paths.comparisons.bands(comparisonId!));
      await page.getByRole('table', { name: 'Champion gains table' }).getByRole('columnheader', { name: 'Without an outcome' }).waitFor();
      await page.goto(paths.comparisons.swapSets(comparisonId!));
      const bySegment = page.getByRole('table', { name: 'Swap sets within each segment value, champion → challenger' });
      await bySegment.getByRole('columnheader', { name: 'Without an outcome' }).waitFor();
      expect(await bySegment.innerText()).toContain('inferred');
      await tab.screenshot('door-5-swap-by-segment');

      await page.goto(paths.comparisons.review(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
      await page
        .getByRole('textbox', { name: 'Findings' })
        .fill('Through-the-door sample read without edits: coded rejects kept as applicants without an outcome, goods weighted 4. The swap-in is declined applicants only; its bad rate is parcelled (factor 2), an assumption stated as such.');
      await page.getByLabel('Validate: the evidence holds; it goes to the committee').check();
      await page.getByRole('button', { name: 'Record the review' }).click();
      // Validating asks for a confirmation first (who is told), then records.
      await page.getByRole('dialog', { name: 'Validate this comparison?' }).getByRole('button', { name: 'Validate' }).click();
      await page.getByText('Validated. The committee members have been told by e-mail.').waitFor();
    });
  });

  it('the printable report states the population and the inference beside the swap-in', async () => {
    await asPerson('committee', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.report(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'Champion–challenger comparison: model-risk report' }).waitFor();
      const report = await page.locator('[data-report]').innerText();
      expect(report).toContain(`${fmt(expected.rows)} rows standing for ${fmt(expected.accounts)} applicants`);
      expect(report).toContain(`${fmt(expected.unknown)} without an outcome`);
      expect(report).toMatch(/swap-in[^\n]*inferred by parcelling \(factor 2\)/i);
      await tab.screenshot('door-6-report');
    });
  });
});
