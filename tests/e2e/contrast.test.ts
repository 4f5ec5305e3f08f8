/**
 * Colour contrast (WCAG 2.1 AA, success criterion 1.4.3: 4.5:1 for text, 3:1 for large text) on
 * every page, measured in Debian's Chromium by axe-core (Deque's accessibility engine, from npm)
 * with its `color-contrast` rule, which computes each text node's foreground against the
 * background actually painted behind it. The demo scenario gives every kind of page its content:
 * signed out, each role's pages, every tab of the decided, in-review and draft comparisons, the
 * administrator's pages, and the printable report in print media. Any failure fails the test,
 * naming the page, the element, its colours and its ratio.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { comparisonTabs } from '@/app/routes/comparisons/tabs';
import { ApiSession } from './helpers/api';
import { launchBrowser, openPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, signInAs } from './helpers/session';

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

let server: RunningServer;
let browser: Browser;
const ids = { decided: 0, inReview: 0, draft: 0 };

beforeAll(async () => {
  server = await startServer({ env: { DEMO_SCENARIO: 'true' }, timeoutMs: 300_000 });
  browser = await launchBrowser();
  const reader = new ApiSession(server.url);
  await reader.signIn('analyst@tallowmere.test');
  const { body } = await reader.request<{ items: { id: number; state: string }[] }>('GET', '/api/comparisons');
  const byState = (state: string) => body.items.find((item) => item.state === state)?.id ?? 0;
  ids.decided = byState('decided');
  ids.inReview = byState('in-review');
  ids.draft = byState('draft');
  expect(Object.values(ids).every((id) => id > 0), server.output().slice(-3000)).toBe(true);
}, 360_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

interface ContrastFailure {
  page: string;
  target: string;
  text: string;
  summary: string;
}

/** axe-core's color-contrast rule on the page as it is now. */
async function contrastFailures(page: Page, name: string): Promise<ContrastFailure[]> {
  // Evaluated through the DevTools protocol: the page's own CSP (scripts from 'self' only) stays as served.
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const result = await (window as unknown as { axe: { run: (context: Document, options: object) => Promise<{ violations: { nodes: { target: string[]; html: string; failureSummary?: string }[] }[] }> } }).axe.run(document, {
      runOnly: { type: 'rule', values: ['color-contrast'] },
      resultTypes: ['violations'],
    });
    return result.violations.flatMap((violation) => violation.nodes.map((node) => ({ target: node.target.join(' '), text: node.html.slice(0, 120), summary: node.failureSummary ?? '' })));
  });
  return violations.map((violation) => ({ page: name, ...violation }));
}

async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.locator('[aria-busy="true"]').first().waitFor({ state: 'detached', timeout: 15_000 }).catch(() => undefined);
  await page.waitForTimeout(150);
}

/** Every page a person opens, by who opens it. */
function pagesFor(person: DemoPerson): { name: string; url: string }[] {
  const comparisonPages = (id: number, label: string) => comparisonTabs.map((tab) => ({ name: `${label}-${tab.key}`, url: tab.path(id) }));
  const home = { name: 'home', url: '/' };
  switch (person) {
    case 'admin':
      return [home, { name: 'people', url: paths.admin.people() }, { name: 'outbox', url: paths.admin.outbox() }, { name: 'policy', url: paths.admin.policy() }];
    case 'modeler':
      return [
        home,
        { name: 'comparisons', url: paths.comparisons.list() },
        { name: 'new-comparison', url: paths.comparisons.new() },
        { name: 'draft-setup', url: paths.comparisons.setup(ids.draft) },
        ...comparisonPages(ids.decided, 'decided'),
        ...comparisonPages(ids.inReview, 'in-review'),
        { name: 'not-found', url: '/no-such-page' },
      ];
    default:
      // The reviewer's and the committee's forms are on the in-review comparison's tabs.
      return [home, ...comparisonPages(ids.inReview, 'in-review')];
  }
}

async function checkPages(person: DemoPerson | null, pages: { name: string; url: string }[]): Promise<ContrastFailure[]> {
  const tab = await openPage(browser, server.url, { width: 1280, height: 900 });
  const failures: ContrastFailure[] = [];
  try {
    if (person) await signInAs(tab.page, person);
    for (const { name, url } of pages) {
      await tab.page.goto(url);
      await settle(tab.page);
      failures.push(...(await contrastFailures(tab.page, `${person ?? 'signed-out'} ${name}`)));
    }
  } finally {
    await tab.close();
  }
  return failures;
}

const describeFailures = (failures: ContrastFailure[]) => failures.map((f) => `${f.page}: ${f.target} ${f.text}\n  ${f.summary.replace(/\n/g, ' ')}`).join('\n');

describe('colour contrast within WCAG 2.1 AA (axe-core color-contrast)', () => {
  it('on the signed-out pages', async () => {
    const failures = await checkPages(null, [
      { name: 'sign-in', url: paths.auth.signIn() },
      { name: 'forgot-password', url: paths.auth.forgotPassword() },
      { name: 'accept-unknown-link', url: paths.auth.accept('not-a-real-token') },
    ]);
    expect(failures, describeFailures(failures)).toEqual([]);
  }, 120_000);

  for (const person of ['modeler', 'analyst', 'committee', 'policy', 'admin'] as const) {
    it(`on every page the ${person} opens`, async () => {
      const failures = await checkPages(person, pagesFor(person));
      expect(failures, describeFailures(failures)).toEqual([]);
    }, 400_000);
  }

  it('on the printable report in print media', async () => {
    const tab = await openPage(browser, server.url, { width: 794, height: 1100 });
    try {
      await signInAs(tab.page, 'committee');
      await tab.page.goto(paths.comparisons.report(ids.decided));
      await tab.page.getByRole('heading', { name: 'Audit trail' }).waitFor();
      await settle(tab.page);
      await tab.page.emulateMedia({ media: 'print' });
      const failures = await contrastFailures(tab.page, 'committee printable report (print)');
      expect(failures, describeFailures(failures)).toEqual([]);
    } finally {
      await tab.close();
    }
  }, 120_000);
});
