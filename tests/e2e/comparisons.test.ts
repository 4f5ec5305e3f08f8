/**
 * The comparison pages in a real browser against the compiled server (real API, real engine,
 * temporary database): the modeler's wizard from upload to verdict, the swap sets at another
 * approval rate, every tab without console errors, a policy scenario, refusals by role, and the
 * mistakes of the broken sample file by row and column.
 */
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roleLabels } from '@shared/roles';
import { paths } from '@/config/paths';
import { type TestPage, launchBrowser, openPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { signInAs } from './helpers/session';

const sampleDir = fileURLToPath(new URL('../../sample-data/', import.meta.url));
const sample2k = path.join(sampleDir, 'tallowmere-holdout-2025-sample-2k.csv');
const broken = path.join(sampleDir, 'tallowmere-holdout-broken.csv');

let server: RunningServer;
let browser: Browser;
let workDir: string;
/** The comparison the wizard test creates; later tests read it. */
let comparisonId: number | null = null;

beforeAll(async () => {
  server = await startServer({ timeoutMs: 120_000 });
  browser = await launchBrowser();
  workDir = await mkdtemp(path.join(tmpdir(), 'scorecourt-e2e-files-'));
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  if (workDir) await rm(workDir, { recursive: true, force: true });
});

async function withPage(run: (tab: TestPage) => Promise<void>, allow: RegExp[] = []) {
  const tab = await openPage(browser, server.url);
  try {
    await run(tab);
    expect(tab.unexpectedErrors(allow), `console errors:\n${tab.consoleErrors.join('\n')}\nserver:\n${server.output().slice(-2000)}`).toEqual([]);
  } finally {
    await tab.close();
  }
}

function idFromUrl(url: string): number {
  const match = /\/comparisons\/(\d+)/.exec(new URL(url).pathname);
  if (!match) throw new Error(`no comparison id in ${url}`);
  return Number(match[1]);
}

describe('the new-comparison wizard', () => {
  it('takes the modeler from upload to the verdict, with upload progress and the analysis polled', async () => {
    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'modeler');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New comparison' }).click();
      await page.getByRole('heading', { level: 1, name: 'Upload the holdout' }).waitFor();
      await tab.screenshot('wizard-1-upload');

      // Throttle the upload (about 3 s for 112 KB) so the progress bar is seen moving.
      const cdp = await tab.context.newCDPSession(page);
      await cdp.send('Network.enable');
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 10, downloadThroughput: -1, uploadThroughput: 40 * 1024 });
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(sample2k);
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      const seen = new Set<number>();
      const nameHeading = page.getByRole('heading', { level: 1, name: 'Name the comparison' });
      for (let i = 0; i < 200 && !(await nameHeading.isVisible()); i++) {
        const value = await page.getByRole('progressbar').first().getAttribute('aria-valuenow', { timeout: 100 }).catch(() => null);
        if (value !== null) seen.add(Number(value));
        if (seen.size === 3) await tab.screenshot('wizard-1-uploading');
        await page.waitForTimeout(50);
      }
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
      await nameHeading.waitFor();
      // Progress events arrived between the ends: the bar moved, it did not jump from 0 to done.
      expect([...seen].some((value) => value > 0 && value < 100), `progress values seen: ${[...seen].join(', ')}`).toBe(true);

      // Step 2: the uploaded file, its SHA-256, and a name from the file name.
      await page.getByText('2,000 rows · 9 columns').waitFor();
      await page.getByText(/^[0-9a-f]{64}$/).waitFor();
      await expect.poll(() => page.getByLabel('Name of the comparison').inputValue()).toBe('tallowmere holdout 2025 sample 2k');
      await page.getByLabel('Name of the comparison').fill('Cash-flow challenger, 2k sample (browser test)');
      await tab.screenshot('wizard-2-name');
      await page.getByRole('button', { name: 'Save and map the columns' }).click();

      // Step 3: the mapping, proposed from names and data, with the preview of the first 20 rows.
      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      comparisonId = idFromUrl(page.url());
      expect(new URL(page.url()).pathname).toBe(paths.comparisons.setup(comparisonId));
      expect(await page.getByLabel('Outcome column').inputValue()).toBe('bad_12m');
      expect(await page.getByLabel('Value that means bad').inputValue()).toBe('1');
      expect(await page.getByLabel('Champion score column').inputValue()).toBe('champion_points');
      expect(await page.getByLabel('Challenger score column').inputValue()).toBe('challenger_points');
      const preview = page.getByRole('table', { name: /The first 20 rows/ });
      expect(await preview.getByRole('row').count()).toBe(21);
      // The orientation hint from the data, beside each score.
      expect(await page.getByText(/From the data: bads have lower scores/).count()).toBe(2);
      await tab.screenshot('wizard-3-mapping');

      // A column used twice is refused before anything is sent.
      await page.getByLabel('Challenger score column').selectOption('champion_points');
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByText('"champion_points" is already the champion\'s score').waitFor();
      await page.getByLabel('Challenger score column').selectOption('challenger_points');

      // Step 4: every row read with this mapping.
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByRole('heading', { level: 1, name: 'Check the data' }).waitFor();
      await page.getByText('Every row fits the mapping').waitFor();
      const summary = await page.getByRole('main').innerText();
      expect(summary).toContain('2,000');
      expect(summary).toContain('150'); // bads in the 2k sample (sample-data/README.md: bad rate about 7%; the reader counts 150)
      expect(summary).toContain('7.5%');
      await tab.screenshot('wizard-4-check');
      await page.getByRole('button', { name: 'Continue to the settings' }).click();

      // Step 5: settings; a low bootstrap count keeps the run quick.
      await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
      await page.getByLabel('Bootstrap replicates').fill('200');
      await page.getByLabel('Random seed').fill('7');
      await tab.screenshot('wizard-5-settings');
      const setupAnswer = page.waitForResponse((response) => response.request().method() === 'PUT' && response.url().endsWith(`/setup`));
      await page.getByRole('button', { name: 'Run the analysis' }).click();

      // Step 6: the comparison's page shows the run's progress, then the verdict. The set-up answer
      // has the run queued (or just started), and the page starts from it: only polling
      // GET /api/comparisons/:id can bring the verdict.
      const started = (await (await setupAnswer).json()) as { latestRun: { status: string } | null; currentRunId: number | null };
      expect(['queued', 'running']).toContain(started.latestRun?.status);
      expect(started.currentRunId).toBeNull();
      await page.waitForURL((url) => url.pathname === paths.comparisons.detail(comparisonId!));
      const progress = page.getByRole('heading', { name: /^The analysis is (queued|running)$/ });
      if (await progress.isVisible()) await tab.screenshot('wizard-6-run');
      await page.getByTestId('verdict-summary').waitFor({ timeout: 60_000 });
      const verdict = await page.getByTestId('verdict-summary').innerText();
      expect(verdict).toMatch(/^The challenger's Gini is \d+\.\d points (higher|lower) \(95% interval/);
      await page.getByRole('heading', { name: 'Adoption criteria' }).waitFor();
      // Criteria say met / not met in words.
      // Six criteria by default: significance, materiality, interval, swap bad rate, enough bads, segments.
      expect(await page.getByText(/^(Met|Not met)$/).count()).toBe(6);
      await page.getByText('Before anyone acts on this').waitFor();
      await tab.screenshot('verdict');
    });
  });
});

describe('the comparison pages', () => {
  it('recomputes the swap sets when the approval rate changes', async () => {
    expect(comparisonId, 'the wizard test creates the comparison').not.toBeNull();
    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'modeler');
      await page.goto(paths.comparisons.swapSets(comparisonId!));
      const swapIn = page.getByTestId('swapIn-count');
      await swapIn.waitFor();
      const before = await swapIn.innerText();
      const outBefore = await page.getByTestId('swapOut-count').innerText();
      await tab.screenshot('swap-sets');

      await page.getByLabel('Approval rate (%)').fill('50');
      await expect.poll(() => new URL(page.url()).searchParams.get('rate')).toBe('0.5');
      await page.getByText('Up to date.').waitFor();
      await expect.poll(async () => `${await swapIn.innerText()} / ${await page.getByTestId('swapOut-count').innerText()}`).not.toBe(`${before} / ${outBefore}`);
      expect(await page.getByText(/Matched cut-offs: champion/).innerText()).toContain('approves 5');
      await tab.screenshot('swap-sets-50');

      // The slider moves it too, in half-point steps, from the keyboard.
      const slider = page.getByLabel('Approval rate slider');
      await slider.focus();
      await page.keyboard.press('ArrowRight');
      await expect.poll(() => new URL(page.url()).searchParams.get('rate')).toBe('0.505');
    });
  });

  it('opens every tab of the comparison without console errors', async () => {
    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'analyst');
      await page.goto(paths.comparisons.list());
      await page.getByRole('link', { name: 'Cash-flow challenger, 2k sample (browser test)' }).click();
      await page.getByTestId('verdict-summary').waitFor();
      await tab.screenshot('verdict-analyst');
      const tabs = page.getByRole('navigation', { name: 'Comparison pages' });
      const pages: { tab: string; check: () => Promise<unknown>; shot: string }[] = [
        { tab: 'Curves', shot: 'curves', check: () => page.getByRole('heading', { name: 'ROC curve' }).waitFor() },
        { tab: 'Swap sets', shot: 'swap-sets-analyst', check: () => page.getByTestId('swap-matrix').waitFor() },
        {
          tab: 'Segments',
          shot: 'segments',
          // The swap sets page has segment rows too: wait for the Segments tab's own table.
          check: () => page.getByRole('table', { name: 'Both models within each segment' }).getByRole('rowheader', { name: 'personal-loan', exact: true }).waitFor(),
        },
        { tab: 'Bands', shot: 'bands', check: () => page.getByRole('table', { name: 'Champion gains table' }).waitFor() },
        { tab: 'Data', shot: 'data', check: () => page.getByTestId('sha256').waitFor() },
        { tab: 'Verdict', shot: 'verdict-again', check: () => page.getByTestId('verdict-summary').waitFor() },
      ];
      for (const step of pages) {
        await tabs.getByRole('link', { name: step.tab }).click();
        await step.check();
        expect(await tabs.getByRole('link', { name: step.tab }).getAttribute('aria-current')).toBe('page');
        if (step.shot !== 'verdict-again') await tab.screenshot(step.shot);
      }
      // Charts have their numbers as tables too.
      await tabs.getByRole('link', { name: 'Curves' }).click();
      await page.getByRole('button', { name: 'Show as table' }).first().click();
      await page.getByRole('table', { name: /ROC curve: values every 5%/ }).waitFor();
      // The bootstrap ran (200 replicates): its histograms are there.
      await page.getByRole('heading', { name: 'ΔGini across replicates' }).waitFor();
      await tab.screenshot('curves-roc-table');

      // The list shows the comparison with its numbers.
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Comparisons' }).click();
      const row = page.getByRole('row').filter({ hasText: 'Cash-flow challenger, 2k sample (browser test)' });
      await row.waitFor();
      expect(await row.innerText()).toMatch(/Analysed/);
      await page.getByLabel('State').selectOption('in-review');
      await page.getByText('No comparison matches these filters').waitFor();
      await page.getByLabel('State').selectOption('analysed');
      await row.waitFor();
      await page.getByLabel('Search by name').fill('no such name');
      await page.getByText('No comparison matches these filters').waitFor();
      await page.getByLabel('Search by name').fill('browser test');
      await row.waitFor();
      await tab.screenshot('comparisons-list');
    });
  });

  it('lets the policy role save a scenario and offers the swap list', async () => {
    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'policy');
      await page.goto(paths.comparisons.detail(comparisonId!));
      // The next step for this role on an analysed comparison.
      await page.getByTestId('next-step').getByText('Choose cut-offs and inspect the swap sets').waitFor();
      await page.getByTestId('next-step').getByRole('link', { name: 'Open the swap sets' }).click();
      await page.getByTestId('swap-matrix').waitFor();
      await page.getByLabel('A cut-off for each model').check();
      await page.getByLabel('Champion cut-off', { exact: true }).fill('600');
      await expect.poll(() => new URL(page.url()).searchParams.get('champion')).toBe('600');
      await page.getByText('Up to date.').waitFor();
      expect(await page.getByRole('link', { name: /Swap list at these settings/ }).getAttribute('href')).toContain('championCutoff=600');

      await page.getByRole('button', { name: 'Save as a scenario' }).click();
      const dialog = page.getByRole('dialog', { name: 'Save as a scenario' });
      await dialog.getByRole('button', { name: 'Save the scenario' }).click();
      await dialog.getByText('Name the scenario').waitFor();
      await dialog.getByLabel('Name').fill('Champion at 600');
      await dialog.getByLabel('Note').fill('Tighter than today, to see the swap-in at a lower approval rate.');
      await tab.screenshot('swap-sets-save-scenario');
      await dialog.getByRole('button', { name: 'Save the scenario' }).click();
      await page.getByText('Scenario “Champion at 600” saved.').waitFor();
      await page.getByRole('row').filter({ hasText: 'Champion at 600' }).waitFor();
      await tab.screenshot('swap-sets-policy');
    });
  });

  it('shows a refusal that names the role when the analyst opens New comparison', async () => {
    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'analyst');
      expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New comparison' }).count()).toBe(0);
      await page.goto(paths.comparisons.new());
      await page.getByRole('heading', { level: 1, name: 'New comparison needs another role' }).waitFor();
      expect(await page.getByRole('main').innerText()).toContain(`open to people with the ${roleLabels.modeler} role`);
      await tab.screenshot('refusal-analyst-new-comparison');
      // The set-up of a comparison is the modeler's too.
      await page.goto(paths.comparisons.setup(comparisonId!));
      await page.getByRole('heading', { level: 1, name: /needs another role/ }).waitFor();
      // A comparison that does not exist.
      await page.goto(paths.comparisons.detail(999_999));
      await page.getByRole('heading', { level: 1, name: 'Page not found' }).waitFor();
    }, [/status of 404/]);
  });
});

describe('problems in the file', () => {
  it('shows the mistakes of the broken sample file by row and column in the check, and refuses a file that is no CSV', async () => {
    const empty = path.join(workDir, 'empty.csv');
    await writeFile(empty, '');

    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'modeler');
      await page.goto(paths.comparisons.new());

      // A file that cannot be read at all is refused at upload, with the reader's words.
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(empty);
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      await page.getByText('The file was not accepted').waitFor();
      await tab.screenshot('wizard-upload-refused');

      // The broken sample uploads; its mistakes (sample-data/README.md: text in a score on line 13,
      // an outcome of 2 on line 58, a short row on line 102, an empty score on line 151) are listed
      // by the check with their lines and columns.
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(broken);
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      await page.getByRole('heading', { level: 1, name: 'Name the comparison' }).waitFor();
      await page.getByRole('button', { name: 'Save and map the columns' }).click();
      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      const draftId = idFromUrl(page.url());
      expect(await page.getByLabel('Outcome column').inputValue()).toBe('bad_12m');
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByText(/The data do not fit this mapping/).waitFor();
      const problems = page.getByRole('table', { name: 'Problems found with this mapping' });
      const rows = await problems.getByRole('row').allInnerTexts();
      const byLine = (line: number) => rows.find((row) => row.split('\t')[0].trim() === String(line)) ?? '';
      const all = rows.join('\n');
      expect(byLine(13), all).toContain('challenger_points');
      expect(byLine(58), all).toContain('bad_12m');
      expect(byLine(102), all).toContain('7 fields');
      expect(byLine(151), all).toContain('champion_points');
      await tab.screenshot('wizard-check-problems');
      // No way on to the settings while the data do not fit.
      expect(await page.getByRole('button', { name: 'Continue to the settings' }).count()).toBe(0);

      // The draft waits for its mapping: opening it from the list resumes the wizard at the columns.
      await page.goto(paths.comparisons.list());
      await page.getByRole('link', { name: 'tallowmere holdout broken' }).click();
      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      expect(new URL(page.url()).pathname).toBe(paths.comparisons.setup(draftId));
    }, [/status of 400/]);
  });
});

describe('a holdout in a workbook', () => {
  it('lists the workbook’s sheets before the upload and reads the one chosen', async () => {
    // Sheet 1 a note, sheet 2 the 2,000-row sample (numbers as numbers), as a spreadsheet saves it.
    const { default: ExcelJS } = await import('exceljs');
    const { readFile } = await import('node:fs/promises');
    const rows = (await readFile(sample2k, 'utf8')).trim().split('\n').map((line) => line.split(','));
    const book = new ExcelJS.Workbook();
    book.addWorksheet('Read me').addRow(['note']);
    const sheet = book.addWorksheet('Holdout 2025');
    rows.forEach((row, index) => sheet.addRow(index === 0 ? row : row.map((cell) => (/^-?\d+(\.\d+)?$/.test(cell) ? Number(cell) : cell))));
    const workbook = path.join(workDir, 'tallowmere-2025.xlsx');
    await writeFile(workbook, new Uint8Array(await book.xlsx.writeBuffer()));

    await withPage(async (tab) => {
      const { page } = tab;
      await signInAs(page, 'modeler');
      await page.goto(paths.comparisons.new());
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(workbook);
      const choice = page.getByLabel('Sheet with the holdout');
      await choice.waitFor();
      expect(await choice.locator('option').allInnerTexts()).toEqual(['Read me', 'Holdout 2025']);
      expect(await choice.inputValue()).toBe('Read me');
      await choice.selectOption('Holdout 2025');
      await tab.screenshot('wizard-upload-sheet');
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      await page.getByRole('heading', { level: 1, name: 'Name the comparison' }).waitFor();
      await page.getByText('sheet “Holdout 2025”').waitFor();
      await page.getByText('2,000 rows').waitFor();
    });
  });
});
