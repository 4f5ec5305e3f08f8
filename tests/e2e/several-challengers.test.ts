/**
 * One champion and three challengers in a real browser against the compiled server, from upload
 * to decision: the modeler uploads the holdout, maps three named challengers (the form refuses a
 * name given twice), checks it and runs the analysis; the verdict page names the recommended
 * challenger with the caution, shows every model, the joint test and the pairs; the swap sets of
 * every challenger stand side by side with who each model approves; the modeler submits, the
 * analyst validates, two committee members vote to adopt a named challenger, and the decision for
 * it is recorded and shown. The pages of the comparison are checked at 390, 768, 1280 and 1440 px
 * for sideways scrolling, and the printable report has the part for several challengers. The list
 * names the recommended and the adopted model, and the band tables stand for every challenger. A
 * second comparison, set up through the API, has a further challenger worse in one region: flagged
 * on the verdict and segments pages, and adopted by the committee except in that region.
 *
 * The holdout is tests/reference/challengers/points-ties-3.csv (3,000 accounts, four scores in
 * points); its third score, c2, is the challenger the R check finds significant after Holm
 * (tests/reference/challengers/joint.json).
 */
import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { regionsHoldoutCsv } from '../api/helpers/regions-holdout';
import { ApiSession } from './helpers/api';
import { type TestPage, launchBrowser, openPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, signInAs } from './helpers/session';

const file = fileURLToPath(new URL('../reference/challengers/points-ties-3.csv', import.meta.url));
const name = 'Three candidates on the 2025 holdout (browser test)';
let server: RunningServer;
let browser: Browser;
let comparisonId: number | null = null;
let regionsId: number | null = null;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function asPerson(person: DemoPerson, run: (tab: TestPage) => Promise<void>, viewport?: { width: number; height: number }) {
  const tab = await openPage(browser, server.url, viewport);
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

/** The document's width against the viewport, and what passes its right edge outside a scrolling frame. */
async function widthCheck(page: Page): Promise<{ scrollWidth: number; clientWidth: number; overflowing: string[] }> {
  return page.evaluate(() => {
    const viewport = document.documentElement.clientWidth;
    const overflowing: string[] = [];
    const scrollsSideways = (element: Element | null): boolean => {
      for (let at = element; at && at !== document.body; at = at.parentElement) {
        const style = getComputedStyle(at);
        if (style.overflowX === 'auto' || style.overflowX === 'scroll' || style.overflowX === 'hidden') return true;
      }
      return false;
    };
    for (const element of Array.from(document.body.querySelectorAll('*'))) {
      const box = element.getBoundingClientRect();
      if (box.width > 0 && box.right > viewport + 1 && !scrollsSideways(element.parentElement)) {
        overflowing.push(`${element.tagName.toLowerCase()}.${String(element.getAttribute('class') ?? '').slice(0, 60)} right=${Math.round(box.right)}`);
      }
    }
    return { scrollWidth: document.documentElement.scrollWidth, clientWidth: viewport, overflowing: overflowing.slice(0, 5) };
  });
}

describe('a comparison with three challengers, from upload to decision, in the browser', () => {
  it('the modeler uploads, maps three named challengers, checks, analyses, reads the verdict and the choice, and submits', async () => {
    await asPerson('modeler', async (tab) => {
      const { page } = tab;
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New comparison' }).click();
      await page.getByLabel('Holdout file (CSV or .xlsx)').setInputFiles(file);
      await page.getByRole('button', { name: 'Upload the holdout' }).click();
      await page.getByRole('heading', { level: 1, name: 'Name the comparison' }).waitFor();
      await page.getByText('3,000 rows · 5 columns').waitFor();
      await page.getByLabel('Name of the comparison').fill(name);
      await page.getByRole('button', { name: 'Save and map the columns' }).click();

      await page.getByRole('heading', { level: 1, name: 'Map the columns' }).waitFor();
      comparisonId = idFromUrl(page.url());
      await page.getByLabel('Outcome column').selectOption('bad');
      await page.getByLabel('Value that means bad').selectOption('1');
      await page.getByLabel('Champion score column').selectOption('champion');
      await page.getByLabel(/^Champion name/).fill('CF-2 scorecard');
      await page.getByLabel('Challenger score column').selectOption('c1');
      await page.getByLabel(/^Challenger name/).fill('CF-3 bureau');
      // All four scores are points: higher is safer (the reader's guess for the first two).
      for (const index of [0, 1]) await page.getByLabel('Higher is safer').nth(index).check();
      await page.getByRole('button', { name: 'Add a challenger' }).click();
      await page.getByRole('button', { name: 'Add a challenger' }).click();
      await page.getByLabel('Challenger 2 score column').selectOption('c2');
      await page.getByLabel(/^Challenger 2 name/).fill('CF-4 open banking');
      await page.getByLabel('Challenger 3 score column').selectOption('c3');
      // A name given twice is refused at its field, in the words the API would use.
      await page.getByLabel(/^Challenger 3 name/).fill('cf-3 bureau');
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByText('The name "cf-3 bureau" is given to both the primary challenger and challenger 3; give each model its own name.').waitFor();
      await page.getByLabel(/^Challenger 3 name/).fill('Refit 2025');
      for (const number of [2, 3]) await page.getByTestId(`challenger-${number}`).getByLabel('Higher is safer').check();
      await tab.screenshot('challengers-1-mapping');
      await page.getByRole('button', { name: 'Check the data' }).click();
      await page.getByRole('heading', { level: 1, name: 'Check the data' }).waitFor();
      await page.getByText('Every row fits the mapping').waitFor();
      await page.getByRole('button', { name: 'Continue to the settings' }).click();

      await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
      await page.getByLabel('Bootstrap replicates').fill('100');
      await page.getByRole('button', { name: 'Run the analysis' }).click();

      await page.waitForURL((url) => url.pathname === paths.comparisons.detail(comparisonId!));
      await page.getByTestId('choice-summary').waitFor({ timeout: 180_000 });
      expect(await page.getByTestId('choice-summary').innerText()).toMatch(/^CF-4 open banking is recommended: the only one of the 3 challengers supported/);
      await page.getByText('Recommended: CF-4 open banking', { exact: true }).first().waitFor();
      expect(await page.getByText(/rests with the institution’s policy and its committee/).count()).toBeGreaterThan(0);
      const summary = page.getByTestId('models-summary');
      expect(await summary.getByRole('row').count()).toBe(5);
      const summaryText = await summary.innerText();
      for (const model of ['CF-2 scorecard', 'CF-3 bureau', 'CF-4 open banking', 'Refit 2025']) expect(summaryText).toContain(model);
      expect(summaryText).toContain('Challenger 2 (recommended)');
      expect(await page.getByTestId('joint-test').innerText()).toMatch(/^Joint test that all 3 challengers equal the champion .*: χ² = [\d.]+ on 3 degrees of freedom, p = /);
      expect(await page.getByTestId('pairwise').getByRole('row').count()).toBe(4);
      expect(await page.getByTestId('challenger-verdicts').innerText()).toMatch(/CF-4 open banking[\s\S]*Challenger supported/);
      expect(await page.getByTestId('header-recommended').innerText()).toBe('3 challengers · recommended: CF-4 open banking');
      // The sections below stay those of the first challenger, named so.
      await page.getByRole('heading', { name: 'Verdict on CF-3 bureau, challenger 1' }).waitFor();
      await tab.screenshot('challengers-2-verdict');

      await page.goto(paths.comparisons.swapSets(comparisonId!));
      const side = page.getByTestId('swap-side-by-side');
      await side.waitFor();
      expect(await side.getByRole('columnheader').allInnerTexts()).toEqual(['', 'CF-3 bureau', 'CF-4 open banking', 'Refit 2025']);
      expect(await page.getByTestId('approval-patterns').getByRole('row').count()).toBe(17);
      // Another approval rate is computed by the server for every challenger.
      const before = await side.innerText();
      await page.getByLabel('Approval rate for every challenger (%)').fill('55');
      await expect.poll(async () => (await side.innerText()) !== before, { timeout: 30_000 }).toBe(true);
      expect(await page.getByRole('heading', { name: 'Who each model approves' }).count()).toBe(1);
      await tab.screenshot('challengers-3-swap-sets');

      await page.goto(paths.comparisons.review(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
      await page.getByLabel('Note for the analyst').fill('Three candidates on one holdout: bureau, open banking and a refit of the champion.');
      await page.getByRole('button', { name: 'Submit for review' }).click();
      await page.getByText('Submitted for review. The analysts have been told by e-mail.').waitFor();
    });
  }, 300_000);

  it('the analyst validates it', async () => {
    expect(comparisonId, 'the first test creates the comparison').not.toBeNull();
    await asPerson('analyst', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.review(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
      await page.getByRole('textbox', { name: 'Findings' }).fill('Three challengers checked against the champion with Holm across them; the joint test and the pairs read as the verdicts say.');
      await page.getByLabel('Validate: the evidence holds; it goes to the committee').check();
      await page.getByRole('button', { name: 'Record the review' }).click();
      await page.getByRole('dialog', { name: 'Validate this comparison?' }).getByRole('button', { name: 'Validate' }).click();
      await page.getByText('Validated. The committee members have been told by e-mail.').waitFor();
    });
  });

  it('two committee members vote to adopt a named challenger, and the decision for it is recorded and shown', async () => {
    for (const member of ['committee2', 'committee'] as const) {
      await asPerson(member, async (tab) => {
        const { page } = tab;
        await page.goto(paths.comparisons.review(comparisonId!));
        await page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
        await page.getByRole('group', { name: 'Your vote' }).getByLabel('Adopt the challenger').check();
        await page.getByRole('group', { name: 'Which challenger to adopt' }).getByLabel('CF-4 open banking (challenger supported, recommended)').check();
        await page.getByRole('button', { name: 'Cast my vote' }).click();
        await page.getByText('Your vote is recorded.').waitFor();
        if (member === 'committee') {
          expect(await page.getByTestId('adopt-votes-by-challenger').innerText()).toContain('Adopt CF-4 open banking: 2');
          const decision = page.getByRole('form', { name: 'Record the decision' });
          await decision.getByLabel(/^Adopt the challenger/).check();
          // Choosing a challenger the verdict does not support goes against the record.
          await decision.getByLabel('CF-3 bureau (not proven) — 0 adopt votes').check();
          await decision.getByText('This decision goes against the record').waitFor();
          await decision.getByLabel('CF-4 open banking (challenger supported, recommended) — 2 adopt votes').check();
          expect(await decision.getByText('This decision goes against the record').count()).toBe(0);
          await decision.getByRole('textbox', { name: 'Rationale' }).fill('CF-4 open banking is the only challenger supported after Holm; its swap-in is less risky than its swap-out.');
          await tab.screenshot('challengers-4-decision-form');
          await decision.getByRole('button', { name: 'Record the decision' }).click();
          const confirm = page.getByRole('dialog', { name: 'Record the committee’s decision?' });
          await confirm.waitFor();
          expect(await confirm.innerText()).toContain('“Adopt the challenger” for CF-4 open banking');
          await confirm.getByRole('button', { name: 'Record the decision' }).click();
          await page.getByText('The decision is recorded.').waitFor();
          expect(await page.getByTestId('decision-chosen').innerText()).toBe('Adopted: CF-4 open banking (challenger 2)');
          expect(await page.getByRole('list', { name: 'Workflow' }).innerText()).toContain('Decided');
          // The header names the recommended and the decided model.
          await expect.poll(() => page.getByTestId('header-recommended').innerText(), { timeout: 15_000 }).toBe('3 challengers · recommended: CF-4 open banking · decided: CF-4 open banking (challenger 2)');
          await tab.screenshot('challengers-5-decided');
        }
      });
    }
  }, 180_000);

  it('the printable report has the part for several challengers and the decided model', async () => {
    await asPerson('analyst', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.report(comparisonId!));
      await page.getByRole('heading', { level: 2, name: 'One champion, 3 challengers' }).waitFor();
      const report = await page.locator('[data-report]').innerText();
      expect(report).toMatch(/CF-4 open banking is recommended/);
      expect(report).toContain('Who each model approves');
      expect(report).toContain('Adopted: CF-4 open banking (challenger 2)');
    });
  });

  it('a further challenger worse in one region is flagged on the verdict page and the segments page, and the committee adopts it except there', async () => {
    // Set up through the API: two challengers, the second worse in region B (tests/api/helpers/regions-holdout.ts), analysed, validated, two adopt votes for it.
    const folder = await mkdtemp(path.join(tmpdir(), 'scorecourt-regions-'));
    const csv = path.join(folder, 'regions.csv');
    await writeFile(csv, regionsHoldoutCsv());
    const api = (person: DemoPerson) => {
      const session = new ApiSession(server.url);
      return session.signIn(`${person}@tallowmere.test`).then(() => session);
    };
    const modeler = await api('modeler');
    const holdoutId = await modeler.upload(csv);
    const created = await modeler.request<{ id: number }>('POST', '/api/comparisons', {
      name: 'Two candidates by region (browser test)',
      holdoutId,
      mapping: {
        outcome: 'bad',
        badValue: '1',
        champion: 'champion',
        challenger: 'c1',
        higherIs: { champion: 'safer', challenger: 'safer' },
        id: 'id',
        segments: ['region'],
        weight: 'weight',
        challengerName: 'CF-3 bureau',
        moreChallengers: [{ column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' }],
      },
      settings: { bootstrap: 20 },
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    regionsId = created.body.id;
    expect(await modeler.waitForAnalysis(regionsId, 120_000)).toBe('analysed');

    await asPerson('policy', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.detail(regionsId!));
      const blocks = page.getByTestId('challenger-flagged-segments');
      await blocks.first().waitFor({ timeout: 30_000 });
      expect(await blocks.count()).toBe(2);
      expect(await blocks.nth(0).innerText()).toContain('No segment value is significantly or materially worse for CF-3 bureau.');
      const flagged = blocks.nth(1).getByRole('list', { name: 'Flagged segment values of CF-4 open banking' });
      expect(await flagged.innerText()).toMatch(/region = B[\s\S]*Significantly worse/);
      expect(await page.getByTestId('challenger-verdicts').innerText()).toContain('it is significantly worse in region = B');
      await tab.screenshot('challengers-6-flagged-segments');

      await page.goto(paths.comparisons.segments(regionsId!));
      await page.getByLabel('Challenger against the champion').selectOption('1');
      await page.waitForURL((url) => url.searchParams.get('challenger') === '1');
      await page.getByText(/CF-4 open banking is behind in 1 of them, significantly in 1/).waitFor();

      // Keeping the champion in region B, for CF-4: its own figures.
      await page.goto(paths.comparisons.swapSets(regionsId!));
      const conditional = page.getByTestId('conditional-adoption');
      await conditional.getByLabel('Challenger adopted outside the kept values').selectOption('1');
      await conditional.getByLabel('region = B — flagged: the challenger is worse here').check();
      await conditional.getByText(/The challenger “CF-4 open banking” \(challenger 2\) decides every account except those in region = B/).waitFor({ timeout: 30_000 });
    });

    expect((await modeler.request('POST', `/api/comparisons/${regionsId}/submit`, { message: '' })).status).toBe(200);
    const analyst = await api('analyst');
    expect((await analyst.request('POST', `/api/comparisons/${regionsId}/review`, { outcome: 'validated', findings: 'CF-4 cannot rank region B.' })).status).toBe(200);
    for (const member of ['committee', 'committee2'] as const) {
      expect((await (await api(member)).request('POST', `/api/comparisons/${regionsId}/votes`, { vote: 'adopt', challenger: 1, comment: 'Except region B.' })).status).toBe(200);
    }

    await asPerson('committee', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.review(regionsId!));
      const decision = page.getByRole('form', { name: 'Record the decision' });
      await decision.waitFor();
      await decision.getByLabel(/^Adopt the challenger/).check();
      await decision.getByLabel(/^CF-4 open banking/).check();
      await decision.getByLabel('region = B — flagged: the challenger is worse here').check();
      await decision.getByText(/The challenger “CF-4 open banking” \(challenger 2\) decides every account/).waitFor({ timeout: 30_000 });
      // Its verdict does not support it (the segment rule): against the record.
      await decision.getByText('This decision goes against the record').waitFor();
      await decision.getByLabel(/^I record this decision against the votes/).check();
      await decision
        .getByRole('textbox', { name: 'Rationale' })
        .fill('CF-4 open banking is adopted outside region B, where it cannot rank applicants; the champion stays there until its data are fixed.');
      await decision.getByRole('button', { name: 'Record the decision' }).click();
      const confirm = page.getByRole('dialog', { name: 'Record the committee’s decision?' });
      expect(await confirm.innerText()).toContain('for CF-4 open banking except in region = B, where the champion is kept');
      await confirm.getByRole('button', { name: 'Record the decision' }).click();
      await page.getByText('The decision is recorded.').waitFor();
      expect(await page.getByTestId('decision-chosen').innerText()).toBe('Adopted: CF-4 open banking (challenger 2)');
      expect(await page.getByTestId('decision').innerText()).toContain('except in region = B, which keep the champion');
    });
  }, 300_000);

  it('the list names the recommended and the adopted model; the band tables are there for every challenger', async () => {
    await asPerson('analyst', async (tab) => {
      const { page } = tab;
      await page.goto(paths.comparisons.list({ q: 'Three candidates' }));
      const lines = page.getByTestId('list-choice');
      await lines.first().waitFor();
      expect(await lines.allInnerTexts()).toEqual(['Recommended: CF-4 open banking', 'Adopted: CF-4 open banking']);
      await page.goto(paths.comparisons.bands(comparisonId!));
      await page.getByRole('heading', { name: 'Refit 2025 (challenger 3)' }).waitFor();
      expect(await page.getByRole('table', { name: /gains table/ }).count()).toBe(4);
      const links = page.getByTestId('bands-csv');
      expect(await links.evaluateAll((elements) => elements.map((element) => element.getAttribute('href')))).toEqual([
        paths.exports.bandsCsv(comparisonId!),
        paths.exports.bandsCsv(comparisonId!, 1),
        paths.exports.bandsCsv(comparisonId!, 2),
      ]);
    });
  });

  it('the pages of the comparison fit 390, 768, 1280 and 1440 px without sideways scrolling', async () => {
    for (const width of [390, 768, 1280, 1440]) {
      await asPerson(
        'committee',
        async (tab) => {
          for (const url of [
            paths.comparisons.detail(comparisonId!),
            paths.comparisons.swapSets(comparisonId!),
            paths.comparisons.review(comparisonId!),
            paths.comparisons.report(comparisonId!),
            paths.comparisons.bands(comparisonId!),
            ...(regionsId === null ? [] : [paths.comparisons.detail(regionsId), `${paths.comparisons.segments(regionsId)}?challenger=1`]),
          ]) {
            await tab.page.goto(url);
            await tab.page.waitForLoadState('networkidle');
            await tab.page.waitForTimeout(150);
            const check = await widthCheck(tab.page);
            expect(check.scrollWidth, `${url} at ${width}px is ${check.scrollWidth}px wide: ${check.overflowing.join('; ')}`).toBeLessThanOrEqual(check.clientWidth);
          }
        },
        { width, height: 900 },
      );
    }
  }, 240_000);
});
