/**
 * The decision in a real browser against the compiled server: an analysed comparison (set up
 * through the API) goes through submit (modeler) → review (analyst) → a quorum the admin sets on
 * the adoption-policy page → votes (two committee members) → the decision, each step by the right
 * person on the review page; then the decided state, the workflow e-mails in the outbox, the
 * audit timeline with its chain status, the printable report printed to PDF on A4 and Letter,
 * and the evidence pack.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { ApiSession } from './helpers/api';
import { type TestPage, launchBrowser, openPage, screenshotDir } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, signInAs } from './helpers/session';

const sample2k = fileURLToPath(new URL('../../sample-data/tallowmere-holdout-2025-sample-2k.csv', import.meta.url));
const pdfDir = path.join(screenshotDir, '..', 'pdf');

let server: RunningServer;
let browser: Browser;
let id: number;
const name = 'Cash-flow challenger on the 2025 holdout';

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  const modeler = new ApiSession(server.url);
  await modeler.signIn('modeler@tallowmere.test');
  const holdoutId = await modeler.upload(sample2k);
  const created = await modeler.request<{ id: number }>('POST', '/api/comparisons', {
    name,
    description: 'Out-of-time holdout, applications of 2025, 12-month bad definition.',
    holdoutId,
    mapping: {
      outcome: 'bad_12m',
      badValue: '1',
      champion: 'champion_points',
      challenger: 'challenger_points',
      higherIs: { champion: 'safer', challenger: 'safer' },
      id: 'account_id',
      segments: ['product', 'channel'],
      exposure: 'loan_amount',
    },
    settings: { bootstrap: 500, seed: 20251 },
  });
  expect(created.status).toBe(201);
  id = created.body.id;
  expect(await modeler.waitForAnalysis(id)).toBe('analysed');
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
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

async function openReview(tab: TestPage) {
  await tab.page.goto(paths.comparisons.review(id));
  await tab.page.getByRole('heading', { level: 2, name: 'Where it stands' }).waitFor();
}

const currentStep = (tab: TestPage) => tab.page.getByRole('list', { name: 'Workflow' }).locator('[aria-current="step"]');

describe('the committee decision, step by step in the browser', () => {
  it('the modeler submits the analysed comparison for review', async () => {
    await asPerson('modeler', async (tab) => {
      await openReview(tab);
      expect(await currentStep(tab).innerText()).toContain('Analysed');
      await tab.page.getByLabel('Note for the analyst').fill('Bootstrap 500, seed 20251. Please look at the web channel first.');
      await tab.screenshot('governance-1-submit');
      await tab.page.getByRole('button', { name: 'Submit for review' }).click();
      await tab.page.getByText('Submitted for review. The analysts have been told by e-mail.').waitFor();
      expect(await currentStep(tab).innerText()).toContain('In review');
      // The creator is not offered the analyst's or the committee's steps.
      expect(await tab.page.getByRole('button', { name: 'Record the review' }).count()).toBe(0);
    });
  });

  it('the analyst writes findings and validates it', async () => {
    await asPerson('analyst', async (tab) => {
      await openReview(tab);
      await tab.page.getByRole('textbox', { name: 'Findings' }).fill('On this holdout the challenger is not better: ΔGini −2.7 points, one-sided DeLong p = 0.83, interval includes 0. Data and set-up are sound, so the evidence can go to the committee.');
      await tab.page.getByLabel('Validate: the evidence holds; it goes to the committee').check();
      await tab.screenshot('governance-2-review');
      await tab.page.getByRole('button', { name: 'Record the review' }).click();
      // A confirmation first: what happens and who is told; Cancel sends nothing.
      const confirm = tab.page.getByRole('dialog', { name: 'Validate this comparison?' });
      await confirm.waitFor();
      expect(await confirm.innerText()).toContain('every active committee member who did not shape the comparison');
      await confirm.getByRole('button', { name: 'Cancel' }).click();
      await confirm.waitFor({ state: 'hidden' });
      expect(await currentStep(tab).innerText()).toContain('In review');
      await tab.page.getByRole('button', { name: 'Record the review' }).click();
      await tab.page.getByRole('dialog', { name: 'Validate this comparison?' }).getByRole('button', { name: 'Validate' }).click();
      await tab.page.getByText('Validated. The committee members have been told by e-mail.').waitFor();
      expect(await currentStep(tab).innerText()).toContain('Validated');
      expect(await tab.page.getByTestId('review').first().innerText()).toContain('the challenger is not better');
    });
  });

  it('the admin raises the quorum to three votes on the adoption-policy page, with a reason; the comparison in review keeps the version it was submitted under', async () => {
    await asPerson('admin', async (tab) => {
      await tab.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Adoption policy' }).click();
      await tab.page.getByRole('heading', { level: 1, name: 'Adoption policy' }).waitFor();
      // The default policy (version 2) already asks for two votes; this change comes after the
      // comparison was submitted, so it is still governed by version 2 (the next test sees 2 votes).
      await tab.page.getByLabel('Quorum of committee votes').fill('3');
      await tab.page.getByLabel('Why the policy changes').fill('Model changes need three committee votes from next quarter.');
      await tab.page.getByRole('button', { name: 'Save as version 3' }).click();
      await tab.page.getByText('Version 3 is now the adoption policy.').waitFor();
      expect(await tab.page.getByTestId('policy-rules').innerText()).toContain('3 committee votes before a decision');
      expect(await tab.page.getByTestId('policy-history').innerText()).toContain('Model changes need three committee votes');
      await tab.screenshot('governance-3-policy');
    });
  });

  it('two committee members vote; the decision waits for the quorum, then is recorded', async () => {
    await asPerson('committee', async (tab) => {
      await openReview(tab);
      expect(await tab.page.getByTestId('quorum').innerText()).toContain('0 of the 2 votes');
      // Before the quorum a decision is possible only as one against the record: choosing an outcome
      // brings up the acknowledgement (the server refuses it without one and a rationale of real length).
      const early = tab.page.getByRole('form', { name: 'Record the decision' });
      await early.getByLabel('Keep the champion').check();
      await early.getByLabel(/^I record this decision against the votes or without the quorum/).waitFor();
      await tab.page.getByRole('group', { name: 'Your vote' }).getByLabel('Keep the champion').check();
      await tab.page.getByRole('textbox', { name: /^Comment/ }).fill('No uplift to act on.');
      await tab.page.getByRole('button', { name: 'Cast my vote' }).click();
      await tab.page.getByText('Your vote is recorded.').waitFor();
      expect(await tab.page.getByTestId('quorum').innerText()).toContain('1 of the 2 votes');
    });
    await asPerson('committee2', async (tab) => {
      await openReview(tab);
      await tab.page.getByRole('group', { name: 'Your vote' }).getByLabel('Keep the champion').check();
      await tab.page.getByRole('button', { name: 'Cast my vote' }).click();
      await tab.page.getByText('Your vote is recorded.').waitFor();
      expect(await tab.page.getByTestId('quorum').innerText()).toContain('the quorum of 2 is met');

      const decision = tab.page.getByRole('form', { name: 'Record the decision' });
      await decision.getByLabel('Keep the champion').check();
      await decision.getByRole('textbox', { name: 'Rationale' }).fill('No significant or material uplift on the 2025 holdout; the champion stays in production.');
      await decision.getByRole('textbox', { name: /^Conditions/ }).fill('Re-run with the challenger refit on 2026 data before the next committee.');
      await decision.getByLabel(/^Effective from/).fill('2026-03-01');
      // The cautions stand beside the decision form.
      expect(await tab.page.getByText('Statistical significance is not business approval').count()).toBeGreaterThan(0);
      await tab.screenshot('governance-4-decision-form');
      await decision.getByRole('button', { name: 'Record the decision' }).click();
      // The confirmation names the decision and everyone the e-mail goes to.
      const confirm = tab.page.getByRole('dialog', { name: 'Record the committee’s decision?' });
      await confirm.waitFor();
      const said = await confirm.innerText();
      expect(said).toContain('“Keep the champion”');
      expect(said).toMatch(/Sent by e-mail to:.*Henrik Aalto/);
      await tab.screenshot('governance-4b-decision-confirm');
      await confirm.getByRole('button', { name: 'Record the decision' }).click();
      await tab.page.getByText('The decision is recorded.').waitFor();
      expect(await currentStep(tab).count()).toBe(0);
      expect(await tab.page.getByRole('list', { name: 'Workflow' }).innerText()).toContain('Decided');
      expect(await tab.page.getByTestId('decision').innerText()).toMatch(/Keep the champion[\s\S]*Grace Okafor[\s\S]*1 Mar 2026/);
      expect(await tab.page.getByTestId('next-step').innerText()).toContain('Decided');
    });
  });

  it('shows the decided comparison with its audit timeline and chain status to anyone', async () => {
    await asPerson('policy', async (tab) => {
      // Credit policy annotates the swap-out on the swap-sets page; everyone reads it there and in the report.
      await tab.page.goto(paths.comparisons.swapSets(id));
      const notes = tab.page.getByTestId('swap-set-notes');
      await notes.getByLabel('About').selectOption('swap-out');
      await notes.getByRole('textbox', { name: 'Annotation' }).fill('The swap-out is mostly thin-file web applicants; check them before any refit.');
      await notes.getByRole('button', { name: 'Add annotation' }).click();
      await notes.getByText('mostly thin-file web applicants').waitFor();
      expect(await notes.getByTestId('note').innerText()).toContain('on the swap-out');
      // Written after the committee's decision, so marked as such: not part of what it saw.
      expect(await notes.getByTestId('note').getByTestId('after-decision').innerText()).toContain('After the decision');

      // Conditional adoption: tick a value to keep on the champion; the server's figures appear
      // beside the champion and pure adoption.
      const conditional = tab.page.getByTestId('conditional-adoption');
      await conditional.getByLabel(/^channel = broker/).check();
      const figures = conditional.getByTestId('mixed-strategy');
      await figures.waitFor();
      const read = await figures.innerText();
      expect(read).toContain('The challenger decides every account except those in channel = broker');
      expect(read).toMatch(/Champion \(today\)[\s\S]*Challenger everywhere[\s\S]*Challenger except the kept values/);
      await tab.screenshot('governance-5-conditional-adoption');

      await openReview(tab);
      expect(await tab.page.getByTestId('chain-status').innerText()).toContain('The audit chain verifies');
      const timeline = await tab.page.getByTestId('audit-timeline').innerText();
      // The admin's policy change came after the submission: the comparison stays under the version it
      // was submitted under (the default, version 2), so that change is not part of its record.
      const order = ['Uploaded the holdout', 'Created the comparison', 'Submitted for review', 'Validated', 'Voted', 'Recorded the decision', 'Wrote a note'];
      expect(timeline).not.toContain('Changed the adoption policy');
      let at = -1;
      for (const label of order) {
        const next = timeline.indexOf(label, at + 1);
        expect(next, `${label} after position ${at} in:\n${timeline}`).toBeGreaterThan(at);
        at = next;
      }
      await tab.screenshot('governance-5-decided');
    });
  });

  it('puts the workflow e-mails in the outbox, to the people who act next, with the link', async () => {
    await asPerson('admin', async (tab) => {
      await tab.page.goto(paths.admin.outbox());
      await tab.page.getByRole('heading', { level: 1, name: 'Outbox' }).waitFor();
      const text = await tab.page.locator('main').innerText();
      for (const subject of [`Ready for review: ${name}`, `Validated, waiting for the committee: ${name}`, `Decision recorded: ${name}`]) expect(text).toContain(subject);
      await tab.screenshot('governance-6-outbox');
    });
    const admin = new ApiSession(server.url);
    await admin.signIn('admin@tallowmere.test');
    const { body } = await admin.request<{ messages: { to: string[]; subject: string; text: string; status: string }[] }>('GET', '/api/outbox?pageSize=50');
    const bySubject = (prefix: string) => body.messages.filter((message) => message.subject.startsWith(prefix));
    // Whoever acts in review: the analysts and the policy role.
    expect(bySubject('Ready for review').map((message) => message.to).sort()).toEqual([['analyst@tallowmere.test'], ['policy@tallowmere.test']]);
    expect(bySubject('Validated, waiting').map((message) => message.to).sort()).toEqual([['committee2@tallowmere.test'], ['committee@tallowmere.test']]);
    // Everyone on the record but the decider: the creator, the reviewer and the other voter.
    expect(bySubject('Decision recorded').map((message) => message.to).sort()).toEqual([['analyst@tallowmere.test'], ['committee@tallowmere.test'], ['modeler@tallowmere.test']]);
    const base = `http://localhost:${server.port}`;
    for (const message of bySubject('Ready for review')) expect(message.text).toContain(`${base}${paths.comparisons.review(id)}`);
    expect(bySubject('Decision recorded')[0].text).toContain(`${base}${paths.comparisons.report(id)}`);
  });

  it('prints the report on A4 and Letter without the app chrome, and offers the evidence pack', async () => {
    await asPerson('committee', async (tab) => {
      await tab.page.goto(paths.comparisons.report(id));
      await tab.page.getByRole('heading', { level: 2, name: 'Champion–challenger comparison: model-risk report' }).waitFor();
      expect(await tab.page.locator('[data-report]').innerText()).toContain('mostly thin-file web applicants');
      await tab.screenshot('governance-7-report-screen');
      await mkdir(pdfDir, { recursive: true });
      await tab.page.emulateMedia({ media: 'print' });
      expect(await tab.page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
      expect(await tab.page.getByRole('navigation', { name: 'Comparison pages' }).isVisible()).toBe(false);
      expect(await tab.page.getByRole('button', { name: 'Print or save as PDF' }).isVisible()).toBe(false);
      // page.pdf() prints with print media unless screen media is being emulated: stop emulating.
      await tab.page.emulateMedia({ media: null });

      const sizes: Record<string, [number, number]> = {};
      for (const paper of ['a4', 'letter'] as const) {
        await tab.page.getByLabel(paper === 'a4' ? 'A4' : 'US Letter').check();
        // The page's own @page size (named pages) decides the paper, as in a browser's print dialog.
        const pdf = await tab.page.pdf({ preferCSSPageSize: true, printBackground: true });
        const file = path.join(pdfDir, `governance-report-${paper}.pdf`);
        await writeFile(file, pdf);
        const box = /\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/.exec(pdf.toString('latin1'));
        expect(box, 'the PDF has a page size').not.toBeNull();
        sizes[paper] = [Math.round(Number(box![1])), Math.round(Number(box![2]))];
        const pages = pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g)?.length ?? 0;
        expect(pages, `${paper}: one page per part at least`).toBeGreaterThanOrEqual(5);
        if (existsSync('/usr/bin/pdftoppm')) execFileSync('/usr/bin/pdftoppm', ['-png', '-r', '60', file, path.join(screenshotDir, `governance-report-${paper}`)]);
      }
      // A4 is 210 × 297 mm = 595 × 842 pt; US Letter is 8.5 × 11 in = 612 × 792 pt.
      expect(sizes.a4).toEqual([595, 842]);
      expect(sizes.letter).toEqual([612, 792]);

      const download = tab.page.waitForEvent('download');
      await tab.page.getByRole('link', { name: 'Download the evidence pack (JSON)' }).click();
      const file = await (await download).path();
      const pack = JSON.parse(await (await import('node:fs/promises')).readFile(file, 'utf8')) as {
        format: string;
        decision: { outcome: string };
        audit: { chainValid: boolean };
        hashes: { inputSha256: string };
      };
      expect(pack.format).toBe('scorecourt-evidence-pack');
      expect(pack.decision.outcome).toBe('keep');
      expect(pack.audit.chainValid).toBe(true);
      expect(pack.hashes.inputSha256).toMatch(/^[0-9a-f]{64}$/);
    });
  });
});
