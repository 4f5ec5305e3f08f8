import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { calibrationChart, stabilityChart } from '@shared/pack/calibration-charts';
import { type Chart, inkColors, packCharts } from '@shared/pack/charts';
import type { ColumnMapping, Report } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import { loadReference } from '@server/reader/load-reference';
import { buildReport } from '@server/stats/report';
import tailwind from '../../../tailwind.config';

/**
 * Words in the committee pack's charts — drawn as SVG in the printable report (where the browser
 * test's axe-core does not look: it skips SVG text) and as vectors in the server's PDF — and the
 * PDF's own text colours, against WCAG 2.1 AA's 4.5:1 for text (success criterion 1.4.3; the
 * charts' words are 7–9 pt, never "large"). The ratio is WCAG 2.1's: (L1 + 0.05) / (L2 + 0.05) with
 * L the relative luminance of the sRGB colour (W3C, WCAG 2.1, "contrast ratio" and "relative
 * luminance" definitions); the first test checks the function on values W3C and WebAIM publish.
 */

function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((at) => {
    const c = parseInt(hex.slice(at, at + 2), 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

const AA = 4.5;
const root = new URL('../../../', import.meta.url).pathname;

/** Each word of a chart with the colour behind it: the last filled rectangle drawn under its anchor, else the paper. */
function chartWords(chart: Chart): { text: string; fg: string; bg: string; ratio: number }[] {
  const words: { text: string; fg: string; bg: string; ratio: number }[] = [];
  chart.shapes.forEach((shape, index) => {
    if (shape.kind !== 'text') return;
    let bg = inkColors.paper;
    const y = shape.y - shape.size / 3;
    for (const under of chart.shapes.slice(0, index)) {
      if (under.kind === 'rect' && under.fill && shape.x >= under.x && shape.x <= under.x + under.w && y >= under.y && y <= under.y + under.h) bg = inkColors[under.fill];
    }
    const fg = inkColors[shape.fill];
    words.push({ text: shape.text, fg, bg, ratio: contrast(fg, bg) });
  });
  return words;
}

async function reports(): Promise<Report[]> {
  const sample: ColumnMapping = {
    outcome: 'bad_12m',
    badValue: '1',
    champion: 'champion_points',
    challenger: 'challenger_points',
    higherIs: { champion: 'safer', challenger: 'safer' },
    id: 'account_id',
    segments: ['product', 'channel'],
    exposure: 'loan_amount',
  };
  const plain = await loadHoldout({ path: `${root}sample-data/tallowmere-holdout-2025-sample-2k.csv` }, sample);
  const pd: ColumnMapping = {
    outcome: 'bad_12m',
    badValue: '1',
    champion: 'champion_points',
    challenger: 'challenger_pd',
    higherIs: { champion: 'safer', challenger: 'riskier' },
    probabilityOfDefault: { champion: false, challenger: true },
    period: 'application_month',
  };
  const head = (file: string, rows: number) => new TextEncoder().encode(readFileSync(`${root}sample-data/${file}`, 'utf8').split('\n').slice(0, rows + 1).join('\n') + '\n');
  const pdHoldout = await loadHoldout({ bytes: head('tallowmere-holdout-2025-pd.csv', 4000), fileName: 'pd.csv' }, pd);
  const reference = await loadReference({ bytes: head('tallowmere-development-2023.csv', 3000), fileName: 'dev.csv' }, pd);
  return [
    await buildReport({ ...plain, mapping: sample, settings: { bootstrap: 50 } }),
    await buildReport({ ...pdHoldout, mapping: pd, settings: { bootstrap: 0 }, reference: { fileName: 'dev.csv', sha256: reference.sha256, champion: reference.champion, challenger: reference.challenger } }),
  ];
}

describe('text contrast in the committee pack (WCAG 2.1 AA)', () => {
  it('computes WCAG’s contrast ratio', () => {
    // W3C / WebAIM: black on white 21:1; #767676 on white 4.54:1 (the lightest grey passing AA); #777777 4.48:1.
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrast('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
    expect(contrast('#777777', '#ffffff')).toBeCloseTo(4.48, 2);
    expect(contrast('#ffffff', '#777777')).toBe(contrast('#777777', '#ffffff'));
  });

  it('every word of every chart, on what is behind it, has at least 4.5:1', async () => {
    const charts = (await reports()).flatMap((report) => [
      ...packCharts(report),
      ...(['champion', 'challenger'] as const).map((model) => calibrationChart(report, model)),
      stabilityChart(report),
    ]);
    const drawn = charts.filter((chart): chart is Chart => chart !== null);
    expect(drawn.map((chart) => chart.id).sort()).toEqual(
      ['calibration', 'ks', 'ks', 'roc', 'roc', 'segments', 'stability', 'strategy', 'strategy', 'swap-grid', 'swap-grid', 'uplift', 'uplift'].sort(),
    );
    const failures = drawn.flatMap((chart) => chartWords(chart).filter((word) => word.ratio < AA).map((word) => `${chart.id}: "${word.text}" ${word.fg} on ${word.bg} = ${word.ratio.toFixed(2)}`));
    expect(failures).toEqual([]);
    // The words do sit on the tinted cells too (the swap grid), not only on paper.
    expect(drawn.flatMap(chartWords).some((word) => word.bg === inkColors.badSoft)).toBe(true);
  });

  it('the PDF’s own text colours (body, notes, table heads on their tint, footers) have at least 4.5:1', () => {
    // server/pack/pdf.ts: body and cells in `text`, notes, captions, table heads and footers in
    // `muted`, on the white page or the table head's `sunk` fill.
    for (const fg of [inkColors.text, inkColors.muted]) {
      for (const bg of [inkColors.paper, inkColors.sunk]) expect(contrast(fg, bg), `${fg} on ${bg}`).toBeGreaterThanOrEqual(AA);
    }
  });

  it('the pages’ text colours have at least 4.5:1 on every paper tone, and the charts use the pages’ palette', () => {
    const colors = (tailwind.theme?.extend?.colors ?? {}) as Record<string, Record<string, string>>;
    const papers = Object.values(colors.paper);
    for (const [name, hex] of Object.entries(colors.ink)) {
      for (const bg of papers) expect(contrast(hex, bg), `ink ${name} ${hex} on ${bg}`).toBeGreaterThanOrEqual(AA);
    }
    // Words in a status or model colour use its strong shade, on every paper tone and on its own soft tint.
    for (const family of ['champion', 'challenger', 'good', 'caution', 'bad']) {
      for (const bg of [...papers, colors[family].soft]) expect(contrast(colors[family].strong, bg), `${family}.strong on ${bg}`).toBeGreaterThanOrEqual(AA);
    }
    expect([inkColors.text, inkColors.muted, inkColors.reference]).toEqual([colors.ink.DEFAULT, colors.ink.soft, colors.ink.faint]);
    expect([inkColors.championStrong, inkColors.challengerStrong, inkColors.goodStrong]).toEqual([colors.champion.strong, colors.challenger.strong, colors.good.strong]);
  });
});
