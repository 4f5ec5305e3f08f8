/**
 * Pages on any screen, and the printable report on paper, in Debian's Chromium against the
 * compiled server with the demo scenario:
 *
 * - every page at 390, 768, 1280 and 1440 px wide: the document is never wider than the viewport
 *   (wide tables scroll inside their own frame), every comparison tab is reachable (in view, or
 *   scrolled into view inside the tab strip), and the swap sets' flag badge is not clipped by its
 *   table's frame; a full-page screenshot of each (tests/artifacts/screenshots/pack-layout/).
 * - the decided demo comparison's report printed with Chromium's own print (page.pdf) on A4 and
 *   on Letter: read back with pdf.js, it holds the charts' captions and the flag of the riskier
 *   segment, and wide tables are on landscape pages. The print layout is checked in the print
 *   media at the paper's width: no table cell narrower than its longest word, no table wider than
 *   the page.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { type Browser, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { paths } from '@/config/paths';
import { comparisonTabs } from '@/app/routes/comparisons/tabs';
import { ApiSession } from './helpers/api';
import { launchBrowser, openPage, screenshotDir, type TestPage } from './helpers/browser';
import { type RunningServer, startServer } from './helpers/server';
import { type DemoPerson, fillSignIn, signInAs } from './helpers/session';

const widths = [390, 768, 1280, 1440] as const;
const outputDir = path.join(screenshotDir, 'pack-layout');

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
  await mkdir(outputDir, { recursive: true });
}, 360_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** Every page a person can open, by who opens it. */
function pagesFor(person: DemoPerson): { name: string; url: string }[] {
  const comparisonPages = (id: number, label: string) => comparisonTabs.map((tab) => ({ name: `${label}-${tab.key}`, url: tab.path(id) }));
  if (person === 'admin') {
    return [
      { name: 'home', url: '/' },
      { name: 'people', url: paths.admin.people() },
      { name: 'outbox', url: paths.admin.outbox() },
      { name: 'policy', url: paths.admin.policy() },
    ];
  }
  return [
    { name: 'comparisons', url: paths.comparisons.list() },
    { name: 'new-comparison', url: paths.comparisons.new() },
    { name: 'draft-setup', url: paths.comparisons.setup(ids.draft) },
    ...comparisonPages(ids.decided, 'decided'),
    ...comparisonPages(ids.inReview, 'in-review'),
  ];
}

interface WidthCheck {
  scrollWidth: number;
  clientWidth: number;
  /** Elements (outside a scrolling frame) whose right edge passes the viewport. */
  overflowing: string[];
}

async function widthCheck(page: Page): Promise<WidthCheck> {
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

async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.locator('[aria-busy="true"]').first().waitFor({ state: 'detached', timeout: 15_000 }).catch(() => undefined);
  await page.waitForTimeout(150);
}

async function visitAll(person: DemoPerson, width: number): Promise<void> {
  const tab: TestPage = await openPage(browser, server.url, { width, height: 900 });
  try {
    await signInAs(tab.page, person);
    for (const { name, url } of pagesFor(person)) {
      await tab.page.goto(url);
      await settle(tab.page);
      await tab.page.screenshot({ path: path.join(outputDir, `${width}-${person}-${name}.png`), fullPage: true });
      const check = await widthCheck(tab.page);
      expect(check.scrollWidth, `${name} at ${width}px is ${check.scrollWidth}px wide: ${check.overflowing.join('; ')}`).toBeLessThanOrEqual(check.clientWidth);
      if (name.startsWith('decided-') || name.startsWith('in-review-')) {
        // Every tab can be reached: it is in the tab strip, and scrolling the strip brings it into view.
        const strip = tab.page.getByRole('navigation', { name: 'Comparison pages' });
        for (const item of comparisonTabs) {
          const link = strip.getByRole('link', { name: item.label, exact: true });
          await link.scrollIntoViewIfNeeded();
          const box = await link.boundingBox();
          expect(box && box.x >= 0 && box.x + box.width <= width + 1, `${item.label} tab reachable at ${width}px on ${name}`).toBe(true);
        }
      }
      if (name === 'decided-swap-sets' && width >= 1280) {
        // The flag badge sits inside the table's frame, not cut off by it.
        const badge = tab.page.getByText('Swap-in riskier than swap-out').first();
        await badge.waitFor();
        const clipped = await badge.evaluate((element) => {
          const own = element.getBoundingClientRect();
          const frame = element.closest('.overflow-x-auto')?.getBoundingClientRect();
          return frame ? own.right > frame.right + 0.5 || own.left < frame.left - 0.5 : false;
        });
        expect(clipped, `flag badge clipped at ${width}px`).toBe(false);
      }
    }
    expect(tab.unexpectedErrors(), tab.consoleErrors.join('\n')).toEqual([]);
  } finally {
    await tab.close();
  }
}

describe('every page at every width', () => {
  for (const width of widths) {
    it(`no page is wider than ${width}px, tabs reachable, screenshots taken`, async () => {
      await visitAll('modeler', width);
      await visitAll('admin', width);
    }, 300_000);
  }
});

async function pdfText(bytes: Buffer): Promise<{ pages: { text: string; landscape: boolean; width: number; height: number }[] }> {
  const document = await getDocument({ data: new Uint8Array(bytes), isEvalSupported: false }).promise;
  const pages = [];
  for (let number = 1; number <= document.numPages; number++) {
    const page = await document.getPage(number);
    const [, , width, height] = page.view;
    const content = await page.getTextContent();
    pages.push({ text: content.items.map((item) => ('str' in item ? item.str : '')).join(' ').replace(/\s+/g, ' '), landscape: width > height, width, height });
  }
  await document.destroy();
  return { pages };
}

describe('the printable report of the decided demo comparison', () => {
  for (const paper of ['a4', 'letter'] as const) {
    it(`prints on ${paper === 'a4' ? 'A4' : 'Letter'} with every table fitting its page, charts included`, async () => {
      // The paper's printable width in CSS px (96 per inch): A4 210 mm − 24 mm margins, Letter 8.5 in − 1 in.
      const contentWidth = paper === 'a4' ? Math.floor(((210 - 24) / 25.4) * 96) : Math.floor(7.5 * 96);
      const tab = await openPage(browser, server.url, { width: contentWidth, height: 1100 });
      try {
        await signInAs(tab.page, 'committee');
        await tab.page.goto(paths.comparisons.report(ids.decided));
        await tab.page.getByRole('heading', { name: 'Audit trail' }).waitFor();
        await tab.page.getByLabel(paper === 'a4' ? 'A4' : 'US Letter').check();
        await settle(tab.page);
        await tab.page.emulateMedia({ media: 'print' });
        // Wide tables print on landscape pages: lay them out at that page's width for the check.
        const landscapeWidth = paper === 'a4' ? Math.floor(((297 - 24) / 25.4) * 96) : Math.floor(10 * 96 - 96);
        await tab.page.evaluate((w) => {
          for (const frame of Array.from(document.querySelectorAll<HTMLElement>('.report-wide'))) frame.style.width = `${w}px`;
        }, landscapeWidth);
        const layout = await tab.page.evaluate(() => {
          const canvas = document.createElement('canvas').getContext('2d')!;
          const narrow: string[] = [];
          const wide: string[] = [];
          let cells = 0;
          for (const table of Array.from(document.querySelectorAll('[data-report] table'))) {
            const frame = table.parentElement!.getBoundingClientRect();
                        const room = frame.width;
            if (table.getBoundingClientRect().width > room + 1) wide.push(table.querySelector('caption')?.textContent ?? '?');
            for (const cell of Array.from(table.querySelectorAll('th, td'))) {
              const text = (cell.textContent ?? '').trim();
              if (!text) continue;
              cells++;
              const style = getComputedStyle(cell);
              // The longest word, each in the font of the element that holds it.
              let longest = 0;
              const walker = document.createTreeWalker(cell, NodeFilter.SHOW_TEXT);
              for (let node = walker.nextNode(); node; node = walker.nextNode()) {
                const own = getComputedStyle(node.parentElement!);
                canvas.font = `${own.fontWeight} ${own.fontSize} ${own.fontFamily}`;
                for (const word of (node.textContent ?? '').split(/\s+/)) longest = Math.max(longest, canvas.measureText(word).width);
              }
              const inner = cell.getBoundingClientRect().width - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight);
              if (inner + 0.5 < longest) narrow.push(`${text.slice(0, 40)} (${Math.round(inner)}px < ${Math.round(longest)}px)`);
            }
          }
          return { narrow, wide, cells };
        });
        expect(layout.cells).toBeGreaterThan(200);
        expect(layout.narrow, 'cells narrower than a word').toEqual([]);
        expect(layout.wide, 'tables wider than the page').toEqual([]);

        const pdf = await tab.page.pdf({ preferCSSPageSize: true, printBackground: true });
        await writeFile(path.join(outputDir, `report-${paper}.pdf`), pdf);
        const { pages } = await pdfText(pdf);
        const all = pages.map((page) => page.text).join(' ');
        for (const caption of ['Uplift with its interval', 'ROC curves', 'Kolmogorov', 'Strategy curve', 'Segment intervals']) expect(all).toContain(caption);
        // pdf.js gives the non-breaking hyphen as an item of its own.
        expect(all).toMatch(/Swap\s*\S\s*in riskier than swap\s*\S\s*out/);
        const portrait = pages.filter((page) => !page.landscape);
        const landscape = pages.filter((page) => page.landscape);
        // A4 is 595 × 842 pt, Letter 612 × 792 pt.
        const [w, h] = paper === 'a4' ? [595, 842] : [612, 792];
        expect(Math.round(portrait[0].width)).toBe(w);
        expect(Math.round(portrait[0].height)).toBe(h);
        expect(landscape.length, 'wide tables on landscape pages').toBeGreaterThan(0);
        expect(landscape.some((page) => page.text.includes('Swap sets by segment'))).toBe(true);
        expect(tab.unexpectedErrors()).toEqual([]);
      } finally {
        await tab.close();
      }
    }, 180_000);
  }
});

describe('the committee pack linked in the e-mail', () => {
  it('opens, for a reader who is signed out, the sign-in page and then the report with the PDF first; the PDF downloads', async () => {
    // The link of the validated e-mail (server/pack/links.ts): the report page with ?pack=pdf.
    const tab = await openPage(browser, server.url, { width: 390, height: 900 });
    try {
      await tab.page.goto(`${paths.comparisons.report(ids.decided)}?pack=pdf`);
      await tab.page.getByLabel('E-mail address').waitFor();
      expect(await tab.page.textContent('body')).not.toContain('"error"');
      await fillSignIn(tab.page, 'committee@tallowmere.test');
      const pdfLink = tab.page.getByRole('link', { name: 'PDF as decided' });
      await pdfLink.waitFor();
      expect(new URL(tab.page.url()).pathname + new URL(tab.page.url()).search).toBe(`${paths.comparisons.report(ids.decided)}?pack=pdf`);
      await expect.poll(() => pdfLink.evaluate((element) => element === document.activeElement)).toBe(true);
      await expect.poll(() => tab.page.getByText('The committee pack from your e-mail:').isVisible()).toBe(true);
      const [download] = await Promise.all([tab.page.waitForEvent('download', { timeout: 120_000 }), pdfLink.click()]);
      expect(download.suggestedFilename()).toMatch(/-decided-pack\.pdf$/);
      const file = await download.path();
      const { readFile } = await import('node:fs/promises');
      expect((await readFile(file)).subarray(0, 5).toString('latin1')).toBe('%PDF-');
      expect(tab.unexpectedErrors()).toEqual([]);
    } finally {
      await tab.close();
    }
  }, 180_000);
});
