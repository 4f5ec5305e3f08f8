import { equalApprovalSentence } from '../equal-approval-words';
import { formatAuc, formatCount, formatGini, formatGiniDelta, formatInterval, formatKs, formatPercent, formatScore } from '../format';
import type { Report } from '../report';
import { swapInRiskier } from '../report';
import { normalQuantile } from '../stats/normal';

/**
 * The committee pack's charts as plain shapes in a fixed coordinate box, so one drawing serves
 * both the printable report (rendered as SVG with a viewBox, so it scales to the page) and the
 * server's PDF (drawn as vectors with pdfkit). Every chart is computed from the stored report
 * only; each has a caption in words with its key numbers, since a chart is never the only way
 * the pack says a thing.
 *
 * Look, as on screen: champion violet, solid, circles; challenger copper, dashed, triangles;
 * reference lines grey and dotted. Colour is never the only difference.
 */

export type Ink =
  | 'champion'
  | 'challenger'
  | 'championStrong'
  | 'challengerStrong'
  | 'reference'
  | 'axis'
  | 'grid'
  | 'text'
  | 'muted'
  | 'good'
  | 'goodStrong'
  | 'goodSoft'
  | 'bad'
  | 'badSoft'
  | 'paper'
  | 'sunk';

/**
 * The palette (the same hex values as tailwind.config.ts), for both renderers. Words are drawn
 * only in inks with at least 4.5:1 against what is behind them (WCAG 2.1 AA; checked in
 * tests/unit/shared/pack-contrast.test.ts): a model's name in its `…Strong` ink, never in the
 * line colour (the challenger's copper is 3.9:1 on white, enough for lines, not for words).
 */
export const inkColors: Record<Ink, string> = {
  champion: '#6b5b95',
  challenger: '#c26a2e',
  championStrong: '#4f4172',
  challengerStrong: '#8a4515',
  reference: '#5f697a',
  axis: '#b9b4a6',
  grid: '#dedbd2',
  text: '#1d2430',
  muted: '#4a5567',
  good: '#2d7a66',
  goodStrong: '#1f5d4d',
  goodSoft: '#dcefe8',
  bad: '#a33a3a',
  badSoft: '#f4dcdc',
  paper: '#ffffff',
  sunk: '#eeece6',
};

export type Dash = 'solid' | 'dashed' | 'dotted';

export type Shape =
  | { kind: 'line'; x1: number; y1: number; x2: number; y2: number; stroke: Ink; width: number; dash: Dash }
  | { kind: 'polyline'; points: [number, number][]; stroke: Ink; width: number; dash: Dash }
  | { kind: 'rect'; x: number; y: number; w: number; h: number; fill: Ink | null; stroke: Ink | null }
  | { kind: 'marker'; x: number; y: number; shape: 'circle' | 'triangle' | 'diamond'; fill: Ink; size: number }
  | { kind: 'text'; x: number; y: number; text: string; anchor: 'start' | 'middle' | 'end'; size: number; bold: boolean; fill: Ink };

export interface Chart {
  id: 'uplift' | 'roc' | 'ks' | 'swap-grid' | 'strategy' | 'segments' | 'calibration' | 'stability';
  title: string;
  /** The chart's message in a sentence, with its numbers. */
  caption: string;
  width: number;
  height: number;
  shapes: Shape[];
}

const FONT = 9;

/** Where a chart's shapes are collected (also used by calibration-charts.ts). */
export class Canvas {
  readonly shapes: Shape[] = [];
  line(x1: number, y1: number, x2: number, y2: number, stroke: Ink, width = 1, dash: Dash = 'solid'): void {
    this.shapes.push({ kind: 'line', x1, y1, x2, y2, stroke, width, dash });
  }
  polyline(points: [number, number][], stroke: Ink, width = 1.5, dash: Dash = 'solid'): void {
    if (points.length > 1) this.shapes.push({ kind: 'polyline', points, stroke, width, dash });
  }
  rect(x: number, y: number, w: number, h: number, fill: Ink | null, stroke: Ink | null = null): void {
    this.shapes.push({ kind: 'rect', x, y, w, h, fill, stroke });
  }
  marker(x: number, y: number, shape: 'circle' | 'triangle' | 'diamond', fill: Ink, size = 3): void {
    this.shapes.push({ kind: 'marker', x, y, shape, fill, size });
  }
  text(x: number, y: number, text: string, options: { anchor?: 'start' | 'middle' | 'end'; size?: number; bold?: boolean; fill?: Ink } = {}): void {
    this.shapes.push({ kind: 'text', x, y, text, anchor: options.anchor ?? 'start', size: options.size ?? FONT, bold: options.bold ?? false, fill: options.fill ?? 'text' });
  }
}

export const model = {
  champion: { ink: 'champion' as const, textInk: 'championStrong' as const, dash: 'solid' as const, marker: 'circle' as const, label: 'Champion' },
  challenger: { ink: 'challenger' as const, textInk: 'challengerStrong' as const, dash: 'dashed' as const, marker: 'triangle' as const, label: 'Challenger' },
};

/** A linear scale from a domain to a pixel range. */
export function scale(domain: [number, number], range: [number, number]): (value: number) => number {
  const span = domain[1] - domain[0] || 1;
  return (value) => range[0] + ((value - domain[0]) / span) * (range[1] - range[0]);
}

/** About `count` round tick values covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  const span = hi - lo;
  if (!(span > 0)) return [lo];
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((candidate) => candidate >= raw) ?? raw;
  const ticks: number[] = [];
  for (let value = Math.ceil(lo / step - 1e-9) * step; value <= hi + step * 1e-9; value += step) ticks.push(Number(value.toPrecision(12)));
  return ticks;
}

export function legend(canvas: Canvas, x: number, y: number, items: { label: string; key: 'champion' | 'challenger' | 'reference' }[]): void {
  let at = x;
  for (const item of items) {
    const style = item.key === 'reference' ? { ink: 'reference' as const, dash: 'dotted' as const, marker: null } : model[item.key];
    canvas.line(at, y - 3, at + 18, y - 3, style.ink, 1.75, style.dash);
    if (style.marker) canvas.marker(at + 9, y - 3, style.marker, style.ink, 2.5);
    canvas.text(at + 22, y, item.label, { fill: 'muted' });
    at += 36 + item.label.length * 5.4;
  }
}

/** Axes with ticks and labels around a plot box. */
export function axes(
  canvas: Canvas,
  box: { left: number; top: number; right: number; bottom: number },
  x: { ticks: number[]; at: (v: number) => number; format: (v: number) => string; label: string },
  y: { ticks: number[]; at: (v: number) => number; format: (v: number) => string; label: string },
): void {
  for (const tick of y.ticks) {
    canvas.line(box.left, y.at(tick), box.right, y.at(tick), 'grid', 0.5);
    canvas.text(box.left - 4, y.at(tick) + 3, y.format(tick), { anchor: 'end', size: 8, fill: 'muted' });
  }
  for (const tick of x.ticks) {
    canvas.line(x.at(tick), box.bottom, x.at(tick), box.bottom + 3, 'axis', 0.75);
    canvas.text(x.at(tick), box.bottom + 12, x.format(tick), { anchor: 'middle', size: 8, fill: 'muted' });
  }
  canvas.line(box.left, box.bottom, box.right, box.bottom, 'axis', 0.75);
  canvas.line(box.left, box.top, box.left, box.bottom, 'axis', 0.75);
  canvas.text((box.left + box.right) / 2, box.bottom + 25, x.label, { anchor: 'middle', fill: 'muted' });
  canvas.text(box.left, box.top - 6, y.label, { anchor: 'start', fill: 'muted' });
}

const pct = (value: number) => formatPercent(value, 0);

/** One horizontal interval row of a forest plot. */
export function intervalRow(canvas: Canvas, at: (v: number) => number, y: number, point: number | null, interval: readonly [number, number] | null, ink: Ink, marker: 'circle' | 'triangle' | 'diamond'): void {
  if (interval) {
    canvas.line(at(interval[0]), y, at(interval[1]), y, ink, 1.5);
    canvas.line(at(interval[0]), y - 4, at(interval[0]), y + 4, ink, 1.5);
    canvas.line(at(interval[1]), y - 4, at(interval[1]), y + 4, ink, 1.5);
  }
  if (point !== null) canvas.marker(at(point), y, marker, ink, 3.5);
}

/** Uplift: each model's Gini with its interval, and ΔGini (DeLong, and the bootstrap cross-check) against zero and the materiality line. */
export function upliftChart(report: Report): Chart {
  const { champion, challenger, difference, policy, settings } = report;
  const level = formatPercent(settings.confidence, 0);
  const materiality = policy.materialityGiniPoints / 100;
  const canvas = new Canvas();
  const width = 480;
  const left = 150;
  const right = width - 20;
  // Panel 1: each model's Gini.
  // A model without a variance (fewer than two goods or bads) has no interval: its point alone.
  const giniCiOf = (key: 'champion' | 'challenger'): readonly [number, number] => report[key].giniCi ?? [report[key].gini, report[key].gini];
  const giniLo = Math.min(giniCiOf('champion')[0], giniCiOf('challenger')[0]);
  const giniHi = Math.max(giniCiOf('champion')[1], giniCiOf('challenger')[1]);
  const pad1 = (giniHi - giniLo) * 0.15 || 0.01;
  const ticks1 = niceTicks(giniLo - pad1, giniHi + pad1, 5);
  const at1 = scale([Math.min(ticks1[0], giniLo - pad1), Math.max(ticks1[ticks1.length - 1], giniHi + pad1)], [left, right]);
  canvas.text(8, 16, `Gini of each model (points, ${level} DeLong intervals)`, { bold: true });
  const rows1: [string, 'champion' | 'challenger'][] = [
    [`Champion ${formatGini(champion.gini)}`, 'champion'],
    [`Challenger ${formatGini(challenger.gini)}`, 'challenger'],
  ];
  rows1.forEach(([label, key], index) => {
    const y = 38 + index * 22;
    canvas.text(left - 8, y + 3, label, { anchor: 'end' });
    intervalRow(canvas, at1, y, report[key].gini, giniCiOf(key), model[key].ink, model[key].marker);
  });
  const axis1 = 38 + 2 * 22 - 6;
  canvas.line(left, axis1, right, axis1, 'axis', 0.75);
  for (const tick of ticks1) {
    canvas.line(at1(tick), axis1, at1(tick), axis1 + 3, 'axis', 0.75);
    canvas.text(at1(tick), axis1 + 12, formatGini(tick), { anchor: 'middle', size: 8, fill: 'muted' });
  }
  // Panel 2: the difference.
  const top2 = axis1 + 34;
  canvas.text(8, top2, `Challenger − champion (ΔGini points, ${level} intervals)`, { bold: true });
  const deltaCi: readonly [number, number] = difference.giniCi ?? [difference.gini, difference.gini];
  const rows2: { label: string; interval: readonly [number, number] }[] = [{ label: 'DeLong interval', interval: deltaCi }];
  if (difference.giniBootstrapCi) rows2.push({ label: 'Bootstrap interval', interval: difference.giniBootstrapCi });
  const values = [0, materiality, difference.gini, ...rows2.flatMap((row) => [...row.interval])];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const pad2 = (hi - lo) * 0.12 || 0.01;
  const ticks2 = niceTicks(lo - pad2, hi + pad2, 6);
  const at2 = scale([Math.min(ticks2[0], lo - pad2), Math.max(ticks2[ticks2.length - 1], hi + pad2)], [left, right]);
  const rowTop = top2 + 20;
  const axis2 = rowTop + rows2.length * 22 - 6;
  canvas.rect(at2(materiality), rowTop - 12, Math.max(0, right - at2(materiality)), axis2 - rowTop + 12, 'goodSoft');
  canvas.line(at2(0), rowTop - 12, at2(0), axis2, 'text', 1);
  canvas.line(at2(materiality), rowTop - 12, at2(materiality), axis2, 'good', 1, 'dotted');
  rows2.forEach((row, index) => {
    const y = rowTop + index * 22;
    canvas.text(left - 8, y + 3, index === 0 ? `ΔGini ${formatGiniDelta(difference.gini)}` : row.label, { anchor: 'end' });
    intervalRow(canvas, at2, y, index === 0 ? difference.gini : null, row.interval, index === 0 ? 'text' : 'muted', 'diamond');
  });
  canvas.line(left, axis2, right, axis2, 'axis', 0.75);
  for (const tick of ticks2) {
    canvas.line(at2(tick), axis2, at2(tick), axis2 + 3, 'axis', 0.75);
    canvas.text(at2(tick), axis2 + 12, formatGiniDelta(tick), { anchor: 'middle', size: 8, fill: 'muted' });
  }
  canvas.text(at2(0) - 3, axis2 + 24, 'no difference', { anchor: 'end', size: 8, fill: 'muted' });
  canvas.text(at2(materiality) + 3, axis2 + 24, `materiality ${formatGiniDelta(materiality)}`, { anchor: 'start', size: 8, fill: 'goodStrong' });
  const where = difference.giniCi === null ? 'with no interval (too few goods or bads for a variance)' : difference.giniCi[0] > materiality ? 'wholly above the materiality line' : difference.giniCi[0] > 0 ? 'above zero but not wholly above the materiality line' : 'reaching zero or below';
  return {
    id: 'uplift',
    title: 'Uplift with its interval',
    caption: `ΔGini ${formatGiniDelta(difference.gini)} points (${level} DeLong interval ${difference.giniCi ? formatInterval(difference.giniCi, formatGiniDelta) : 'none'}${difference.giniBootstrapCi ? `; bootstrap ${formatInterval(difference.giniBootstrapCi, formatGiniDelta)}` : ''}), ${where}. Champion Gini ${formatGini(champion.gini)}, challenger ${formatGini(challenger.gini)}.`,
    width,
    height: axis2 + 32,
    shapes: canvas.shapes,
  };
}

/** ROC curves of both models with the diagonal of a random model. */
export function rocChart(report: Report): Chart {
  const canvas = new Canvas();
  const width = 320;
  const box = { left: 44, top: 22, right: 304, bottom: 282 };
  const x = scale([0, 1], [box.left, box.right]);
  const y = scale([0, 1], [box.bottom, box.top]);
  const ticks = [0, 0.25, 0.5, 0.75, 1];
  axes(canvas, box, { ticks, at: x, format: pct, label: 'Share of goods declined (false-positive rate)' }, { ticks, at: y, format: pct, label: 'Share of bads declined' });
  canvas.line(x(0), y(0), x(1), y(1), 'reference', 1, 'dotted');
  for (const key of ['champion', 'challenger'] as const) {
    const points = report.curves.roc[key].map((p) => [x(p.x), y(p.y)] as [number, number]);
    canvas.polyline(points, model[key].ink, 1.75, model[key].dash);
    const step = Math.max(1, Math.floor(points.length / 8));
    for (let i = step; i < points.length - 1; i += step) canvas.marker(points[i][0], points[i][1], model[key].marker, model[key].ink, 2.5);
  }
  legend(canvas, box.left + 8, box.bottom + 42, [
    { label: `Champion AUC ${formatAuc(report.champion.auc)}`, key: 'champion' },
    { label: `Challenger AUC ${formatAuc(report.challenger.auc)}`, key: 'challenger' },
  ]);
  return {
    id: 'roc',
    title: 'ROC curves',
    caption: `Champion AUC ${formatAuc(report.champion.auc)}, challenger ${formatAuc(report.challenger.auc)}; the dotted diagonal is a model that does not separate goods from bads.`,
    width,
    height: box.bottom + 50,
    shapes: canvas.shapes,
  };
}

/** KS: for each model, the cumulative shares of bads and goods by score, riskiest first, with the gap marked. */
export function ksChart(report: Report): Chart {
  const canvas = new Canvas();
  const width = 480;
  const panelWidth = 205;
  const ticks = [0, 0.5, 1];
  (['champion', 'challenger'] as const).forEach((key, index) => {
    const points = report.curves.ks[key];
    const metrics = report[key];
    const left = 40 + index * (panelWidth + 30);
    const box = { left, top: 34, right: left + panelWidth, bottom: 214 };
    const n = points.length;
    const x = scale([0, Math.max(1, n - 1)], [box.left, box.right]);
    const y = scale([0, 1], [box.bottom, box.top]);
    canvas.text(left, 14, `${model[key].label}: KS ${formatKs(metrics.ks)} at ${formatScore(metrics.ksScore)}`, { bold: true, fill: model[key].textInk });
    const scoreTicks = n > 1 ? [0, Math.floor((n - 1) / 2), n - 1] : [0];
    axes(
      canvas,
      box,
      { ticks: scoreTicks, at: x, format: (i) => formatScore(points[i]?.score ?? null), label: 'Score, riskiest first' },
      { ticks, at: y, format: pct, label: 'Cumulative share' },
    );
    canvas.polyline(points.map((p, i) => [x(i), y(p.cumBad)]), 'bad', 1.75, 'solid');
    canvas.polyline(points.map((p, i) => [x(i), y(p.cumGood)]), 'good', 1.75, 'dashed');
    let best = 0;
    for (let i = 1; i < n; i++) if (Math.abs(points[i].cumBad - points[i].cumGood) > Math.abs(points[best].cumBad - points[best].cumGood)) best = i;
    if (n > 0) {
      canvas.line(x(best), y(points[best].cumBad), x(best), y(points[best].cumGood), 'text', 1.25);
      canvas.text(x(best) + (best > n / 2 ? -4 : 4), (y(points[best].cumBad) + y(points[best].cumGood)) / 2, `KS ${formatKs(metrics.ks)}`, { anchor: best > n / 2 ? 'end' : 'start', bold: true });
    }
  });
  canvas.line(40, 254, 58, 254, 'bad', 1.75);
  canvas.text(62, 257, 'bads', { fill: 'muted' });
  canvas.line(100, 254, 118, 254, 'good', 1.75, 'dashed');
  canvas.text(122, 257, 'goods', { fill: 'muted' });
  return {
    id: 'ks',
    title: 'Kolmogorov–Smirnov',
    caption: `The largest gap between the cumulative shares of bads and goods: champion ${formatKs(report.champion.ks)} points at score ${formatScore(report.champion.ksScore)}, challenger ${formatKs(report.challenger.ks)} at ${formatScore(report.challenger.ksScore)}.`,
    width,
    height: 264,
    shapes: canvas.shapes,
  };
}

/** The swap sets as a 2×2: champion's decision in rows, challenger's in columns. */
export function swapGridChart(report: Report): Chart {
  const { swap } = report;
  const canvas = new Canvas();
  const width = 480;
  const left = 150;
  const top = 44;
  const cellW = (width - left - 10) / 2;
  const cellH = 62;
  canvas.text(left + cellW, 14, 'Challenger', { anchor: 'middle', bold: true, fill: 'challengerStrong' });
  canvas.text(left + cellW / 2, 32, `accepts (cut-off ${formatScore(swap.challenger.cutoff)})`, { anchor: 'middle', fill: 'muted' });
  canvas.text(left + cellW * 1.5, 32, 'declines', { anchor: 'middle', fill: 'muted' });
  canvas.text(8, top + cellH - 4, 'Champion', { bold: true, fill: 'championStrong' });
  canvas.text(left - 8, top + cellH / 2 + 3, `accepts (cut-off ${formatScore(swap.champion.cutoff)})`, { anchor: 'end', fill: 'muted' });
  canvas.text(left - 8, top + cellH * 1.5 + 3, 'declines', { anchor: 'end', fill: 'muted' });
  const cells = [
    { key: 'bothAccept' as const, row: 0, col: 0, label: 'Both accept', fill: 'sunk' as Ink },
    { key: 'swapOut' as const, row: 0, col: 1, label: 'Swap-out', fill: 'badSoft' as Ink },
    { key: 'swapIn' as const, row: 1, col: 0, label: 'Swap-in', fill: 'goodSoft' as Ink },
    { key: 'bothReject' as const, row: 1, col: 1, label: 'Both decline', fill: 'sunk' as Ink },
  ];
  for (const cell of cells) {
    const x = left + cell.col * cellW;
    const y = top + cell.row * cellH;
    const data = swap[cell.key];
    canvas.rect(x, y, cellW, cellH, cell.fill, 'axis');
    canvas.text(x + 8, y + 16, cell.label, { bold: true });
    canvas.text(x + 8, y + 32, `${formatCount(data.count)} accounts (${formatPercent(data.share)})`);
    canvas.text(x + 8, y + 48, `bad rate ${formatPercent(data.badRate)}`, { fill: 'muted' });
  }
  return {
    id: 'swap-grid',
    title: 'Swap sets',
    caption: `Swap-in ${formatCount(swap.swapIn.count)} accounts with a bad rate of ${formatPercent(swap.swapIn.badRate)}; swap-out ${formatCount(swap.swapOut.count)} with ${formatPercent(swap.swapOut.badRate)}.`,
    width,
    height: top + cellH * 2 + 8,
    shapes: canvas.shapes,
  };
}

/** The strategy curve: the approved book's bad rate at each approval rate, both models, the report's rate marked. */
export function strategyChart(report: Report): Chart {
  const { points, atApprovalRate } = report.strategyCurve;
  const canvas = new Canvas();
  const width = 480;
  const box = { left: 48, top: 22, right: 464, bottom: 212 };
  const rates = points.flatMap((p) => [p.champion.portfolioBadRate, p.challenger.portfolioBadRate]).filter((v): v is number => v !== null);
  const maxRate = Math.max(0.01, ...rates);
  const yTicks = niceTicks(0, maxRate, 4);
  const x = scale([0, 1], [box.left, box.right]);
  const y = scale([0, Math.max(maxRate, yTicks[yTicks.length - 1])], [box.bottom, box.top]);
  axes(canvas, box, { ticks: [0, 0.2, 0.4, 0.6, 0.8, 1], at: x, format: pct, label: 'Approval rate' }, { ticks: yTicks, at: y, format: (v) => formatPercent(v, 1), label: 'Bad rate of the approved book' });
  canvas.line(x(atApprovalRate.approvalRate), box.top, x(atApprovalRate.approvalRate), box.bottom, 'reference', 1, 'dotted');
  canvas.text(x(atApprovalRate.approvalRate) + 3, box.top + 8, `report’s rate ${formatPercent(atApprovalRate.approvalRate, 0)}`, { size: 8, fill: 'muted' });
  for (const key of ['champion', 'challenger'] as const) {
    const line = points.filter((p) => p[key].portfolioBadRate !== null).map((p) => [x(p.approvalRate), y(p[key].portfolioBadRate as number)] as [number, number]);
    canvas.polyline(line, model[key].ink, 1.75, model[key].dash);
    const step = Math.max(1, Math.floor(line.length / 8));
    for (let i = step; i < line.length - 1; i += step) canvas.marker(line[i][0], line[i][1], model[key].marker, model[key].ink, 2.5);
  }
  legend(canvas, box.left + 8, box.bottom + 42, [
    { label: 'Champion', key: 'champion' },
    { label: 'Challenger', key: 'challenger' },
  ]);
  return {
    id: 'strategy',
    title: 'Strategy curve',
    caption: equalApprovalSentence(atApprovalRate),
    width,
    height: box.bottom + 50,
    shapes: canvas.shapes,
  };
}

/** ΔGini in each segment value with its interval (ΔGini ± z·se at the report's confidence), against zero. */
export function segmentIntervalsChart(report: Report): Chart | null {
  const rows = report.segments;
  if (rows.length === 0) return null;
  const z = normalQuantile((1 + report.settings.confidence) / 2);
  const level = formatPercent(report.settings.confidence, 0);
  const canvas = new Canvas();
  const width = 480;
  const left = 170;
  const right = width - 20;
  const rowH = 16;
  const top = 30;
  const intervals = rows.map((row) => (row.deltaGini !== null && row.giniSe !== null ? ([row.deltaGini - z * row.giniSe, row.deltaGini + z * row.giniSe] as [number, number]) : null));
  const values = [0, ...intervals.flatMap((interval) => (interval ? interval : []))];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const pad = (hi - lo) * 0.08 || 0.01;
  const ticks = niceTicks(lo - pad, hi + pad, 6);
  const at = scale([Math.min(ticks[0], lo - pad), Math.max(ticks[ticks.length - 1], hi + pad)], [left, right]);
  const bottom = top + rows.length * rowH;
  canvas.text(8, 14, `ΔGini points by segment value, ${level} intervals`, { bold: true });
  canvas.line(at(0), top - 8, at(0), bottom, 'text', 1);
  rows.forEach((row, index) => {
    const y = top + index * rowH + 4;
    const label = `${row.column} = ${row.value}`;
    canvas.text(left - 8, y + 3, label.length > 32 ? `${label.slice(0, 31)}…` : label, { anchor: 'end', size: 8, fill: row.tooFewBads ? 'muted' : 'text' });
    const interval = intervals[index];
    if (interval) intervalRow(canvas, at, y, row.deltaGini, interval, interval[1] < 0 ? 'bad' : 'text', 'diamond');
    else canvas.text(left + 4, y + 3, row.note ?? 'not defined', { size: 8, fill: 'muted' });
  });
  canvas.line(left, bottom, right, bottom, 'axis', 0.75);
  for (const tick of ticks) {
    canvas.line(at(tick), bottom, at(tick), bottom + 3, 'axis', 0.75);
    canvas.text(at(tick), bottom + 12, formatGiniDelta(tick), { anchor: 'middle', size: 8, fill: 'muted' });
  }
  const below = rows.filter((_, index) => intervals[index] !== null && (intervals[index] as [number, number])[1] < 0).length;
  const riskier = report.swap.bySegment.filter(swapInRiskier).length;
  return {
    id: 'segments',
    title: 'Segment intervals',
    caption: `${formatCount(rows.length)} segment values; ${below === 0 ? 'in none' : `in ${formatCount(below)}`} is the challenger’s interval wholly below zero. ${riskier > 0 ? `In ${formatCount(riskier)} the swap-in is riskier than the swap-out (see the swap sets by segment).` : ''}`.trim(),
    width,
    height: bottom + 22,
    shapes: canvas.shapes,
  };
}

/** Every chart of the pack, in the order the pack shows them. New charts are added here. */
export function packCharts(report: Report): Chart[] {
  return [upliftChart(report), rocChart(report), ksChart(report), swapGridChart(report), strategyChart(report), segmentIntervalsChart(report)].filter(
    (chart): chart is Chart => chart !== null,
  );
}
