import { type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { type TestPage, launchBrowser, openPage } from '../e2e/helpers/browser';
import { type DemoPerson, signInAs } from '../e2e/helpers/session';
import { record } from './helpers/figures';
import { type CompiledServer, startCompiled } from './helpers/server';
import { Session } from './helpers/session';

/**
 * Markup typed by people or carried in a file is shown as text in the browser, never run: every
 * free-text field (names, descriptions, notes, findings, votes, rationale, conditions, scenario
 * names and notes, people's names, the policy's reasons), and from the file its name, column
 * names, segment values and account ids. Each field gets its own payload — a <script>, an <img
 * onerror> and an <svg onload>, all marked `data-xss` — and each page of the compiled client is
 * opened in Debian's chromium: no marked element may exist in the DOM, no script may have run
 * (`window.__xss`, no dialog, no Content-Security-Policy report), and the payload must appear
 * literally in the page's text wherever the field is shown.
 */

let server: CompiledServer;
let browser: Browser;
const fields: Record<string, string> = {};
/** A payload naming its field: if any of it ran, window.__xss would say which. */
function payload(tag: string): string {
  const text = `<script data-xss>__xss='${tag}'</script><img src=x data-xss onerror="__xss='${tag}'"><svg data-xss onload="__xss='${tag}'">#${tag}`;
  fields[tag] = text;
  return text;
}
let comparisonId: number;
let draftId: number;

async function ok<T>(call: Promise<{ status: number; body: T; text: string }>, status = 200): Promise<T> {
  const response = await call;
  expect(response.status, response.text.slice(0, 300)).toBe(status);
  return response.body;
}

beforeAll(async () => {
  server = await startCompiled({ env: { SERVE_CLIENT: 'true' } });
  browser = await launchBrowser();
  const modeler = await new Session(server.url).signIn('modeler@tallowmere.test');
  const analyst = await new Session(server.url).signIn('analyst@tallowmere.test');
  const policy = await new Session(server.url).signIn('policy@tallowmere.test');
  const committee = await new Session(server.url).signIn('committee@tallowmere.test');
  // The default quorum is two votes: the demo's second committee member votes too.
  const committee2 = await new Session(server.url).signIn('committee2@tallowmere.test');
  const admin = await new Session(server.url).signIn('admin@tallowmere.test');

  // A file with markup in its name, a column name, segment values and ids.
  const segmentColumn = payload('column');
  const lines = [`account_id,"${segmentColumn.replace(/"/g, '""')}",bad,champion,challenger`];
  const segmentValues = [payload('segment-a'), payload('segment-b')];
  const idValue = payload('id');
  for (let i = 0; i < 600; i++) {
    const bad = i % 6 === 0 ? 1 : 0;
    const id = i < 25 ? `${idValue}${i}` : `A-${i}`;
    lines.push(`"${id.replace(/"/g, '""')}","${segmentValues[i % 2].replace(/"/g, '""')}",${bad},${600 + (i % 53) - bad * 25},${610 + (i % 47) - bad * 35}`);
  }
  const form = new FormData();
  // A file name keeps only its last path segment, so this payload has no "/".
  fields.file = `<img src=x data-xss onerror="__xss='file'"><svg data-xss onload="__xss='file'">#file.csv`;
  form.append('file', new Blob([lines.join('\n') + '\n'], { type: 'text/csv' }), fields.file);
  const holdout = await ok(modeler.request<{ id: number }>('POST', '/api/holdouts', form), 201);
  const mapping = { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, id: 'account_id', segments: [segmentColumn] };
  comparisonId = (await ok(modeler.request<{ id: number }>('POST', '/api/comparisons', { name: payload('name'), description: payload('description'), holdoutId: holdout.id, mapping, settings: { bootstrap: 100 } }), 201)).id;
  draftId = (await ok(modeler.request<{ id: number }>('POST', '/api/comparisons', { name: payload('draft-name'), holdoutId: holdout.id }), 201)).id;
  for (let i = 0; i < 200; i++) {
    const { body } = await modeler.request<{ state: string }>('GET', `/api/comparisons/${comparisonId}`);
    if (body.state === 'analysed') break;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  const scenario = await ok(policy.request<{ id: number }>('POST', `/api/comparisons/${comparisonId}/scenarios`, { name: payload('scenario').slice(0, 120), approvalRate: 0.6, note: payload('scenario-note') }), 201);
  await ok(policy.request('POST', `/api/comparisons/${comparisonId}/notes`, { body: payload('swap-note'), anchor: 'swap-in', scenarioId: scenario.id }), 201);
  await ok(analyst.request('POST', `/api/comparisons/${comparisonId}/notes`, { body: payload('note') }), 201);
  await ok(modeler.request('POST', `/api/comparisons/${comparisonId}/submit`, { message: payload('submit') }));
  await ok(analyst.request('POST', `/api/comparisons/${comparisonId}/review`, { outcome: 'validated', findings: payload('findings') }));
  await ok(committee.request('POST', `/api/comparisons/${comparisonId}/votes`, { vote: 'adopt', comment: payload('vote') }));
  await ok(committee2.request('POST', `/api/comparisons/${comparisonId}/votes`, { vote: 'adopt', comment: '' }));
  await ok(committee.request('POST', `/api/comparisons/${comparisonId}/decision`, { outcome: 'adopt', rationale: payload('rationale'), conditions: payload('conditions') }));
  await ok(admin.request('POST', '/api/users/invitations', { email: 'markup.person@tallowmere.test', name: payload('person').slice(0, 120), roles: ['policy'] }), 201);
  const current = await ok(admin.request<{ policy?: Record<string, unknown> } & Record<string, unknown>>('GET', '/api/policy'));
  const { version: _version, ...rules } = (current.policy ?? current) as Record<string, unknown>;
  await ok(admin.request('PUT', '/api/policy', { ...rules, reason: payload('policy-reason') }));
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** What a page shows of the payloads, and whether any of them ran. */
async function visit(tab: TestPage, url: string): Promise<{ shown: string[]; marked: number; ran: unknown; dialogs: number }> {
  let dialogs = 0;
  const onDialog = (dialog: { dismiss: () => Promise<void> }) => {
    dialogs++;
    void dialog.dismiss();
  };
  tab.page.on('dialog', onDialog);
  await tab.page.goto(url);
  await tab.page.waitForLoadState('networkidle');
  await tab.page.waitForTimeout(300);
  const state = await tab.page.evaluate(() => ({
    text: document.body.innerText,
    marked: document.querySelectorAll('[data-xss]').length,
    ran: (window as unknown as { __xss?: unknown }).__xss,
  }));
  tab.page.off('dialog', onDialog);
  const shown = Object.entries(fields)
    .filter(([tag, text]) => state.text.includes(text) || (tag === 'scenario' && state.text.includes(text.slice(0, 120))) || (tag === 'person' && state.text.includes(text.slice(0, 120))) || (tag === 'id' && state.text.includes(`${text}0`)))
    .map(([tag]) => tag);
  return { shown, marked: state.marked, ran: state.ran, dialogs };
}

describe('markup in the browser', () => {
  it('shows every payload as text on the pages where it appears, and none of them runs', async () => {
    const pages: [DemoPerson, string, string[]][] = [
      ['analyst', paths.comparisons.list(), ['name']],
      ['analyst', paths.comparisons.detail(comparisonId), ['name', 'description']],
      ['analyst', paths.comparisons.segments(comparisonId), ['column', 'segment-a', 'segment-b']],
      ['analyst', paths.comparisons.data(comparisonId), []],
      ['policy', paths.comparisons.swapSets(comparisonId), ['scenario', 'swap-note']],
      ['analyst', paths.comparisons.review(comparisonId), ['findings', 'vote', 'rationale', 'note']],
      ['analyst', paths.comparisons.report(comparisonId), ['name', 'findings', 'rationale', 'conditions']],
      ['modeler', paths.comparisons.setup(draftId), ['column', 'id']],
      ['admin', paths.admin.people(), ['person']],
      ['admin', paths.admin.policy(), ['policy-reason']],
      ['admin', paths.admin.outbox(), ['name']],
    ];
    const seen = new Map<string, string[]>();
    const byPage: Record<string, string[]> = {};
    const signedIn = new Map<DemoPerson, TestPage>();
    try {
      for (const [person, url, expected] of pages) {
        let tab = signedIn.get(person);
        if (!tab) {
          tab = await openPage(browser, server.url);
          await signInAs(tab.page, person);
          signedIn.set(person, tab);
        }
        const result = await visit(tab, url);
        byPage[url] = result.shown;
        for (const tag of result.shown) seen.set(tag, [...(seen.get(tag) ?? []), url]);
        expect(result.marked, `${url}: elements from a payload in the DOM`).toBe(0);
        expect(result.ran, `${url}: a payload ran`).toBeUndefined();
        expect(result.dialogs, `${url}: dialogs`).toBe(0);
        for (const tag of expected) expect(result.shown, `${url} shows the ${tag} payload as text`).toContain(tag);
      }
      for (const tab of signedIn.values()) {
        const csp = tab.consoleErrors.filter((text) => /Content Security Policy|Refused to (execute|load)/i.test(text));
        expect(csp, 'no script was blocked by the CSP either: none was ever inserted').toEqual([]);
      }
    } finally {
      for (const tab of signedIn.values()) await tab.close();
    }
    const never = Object.keys(fields).filter((tag) => !seen.has(tag));
    record('security: markup in the browser', { payloads: Object.keys(fields).length, pages: pages.length, shownOn: Object.fromEntries(seen), notShownOnThesePages: never });
    // Every free-text field a person types is shown somewhere, as text.
    for (const tag of ['name', 'description', 'file', 'submit', 'scenario-note', 'findings', 'vote', 'rationale', 'conditions', 'note', 'swap-note', 'scenario', 'person', 'policy-reason', 'column', 'segment-a', 'id']) expect(seen.has(tag), `${tag} shown on some page`).toBe(true);
  }, 180_000);
});
