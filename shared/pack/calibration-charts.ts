import { formatCount, formatGiniDelta, formatPercent } from '../format';
import type { Report } from '../report';
import { Canvas, type Chart, intervalRow, legend, model, niceTicks, scale } from './charts';

/**
 * The committee pack's calibration and stability charts, drawn like the other pack charts
 * (charts.ts: plain shapes in a fixed box, SVG in the printable report and vectors in the PDF).
 *
 * - Calibration: for each band or grade, the mean PD (grey diamond) and the observed bad rate
 *   (the model's marker) with its Wilson interval; a group whose Jeffreys p is below α is drawn
 *   in the warning colour and labelled.
 * - Stability: ΔGini in each period with its interval, against zero; periods with fewer bads than
 *   the sign rule needs are drawn muted.
 */

const pct1 = (value: number) => formatPercent(value, 1);

/** Mean PD against the observed bad rate by group; null when the model has no calibration. */
export function calibrationChart(report: Report, key: 'champion' | 'challenger'): Chart | null {
  const calibration = report.calibration;
  const result = calibration?.[key];
  if (!calibration || !result || result.rows.length === 0) return null;
  const rows = result.rows;
  const canvas = new Canvas();
  const width = 480;
  const box = { left: 48, top: 22, right: 464, bottom: 200 };
  const values = rows.flatMap((row) => [row.meanPd, row.observedBadRate, ...(row.observedBadRateCi ?? [])]);
  const hi = Math.max(0.01, ...values);
  const yTicks = niceTicks(0, hi, 4);
  const y = scale([0, Math.max(hi, yTicks[yTicks.length - 1])], [box.bottom, box.top]);
  const step = (box.right - box.left) / rows.length;
  const x = (index: number) => box.left + step * (index + 0.5);
  for (const tick of yTicks) {
    canvas.line(box.left, y(tick), box.right, y(tick), 'grid', 0.5);
    canvas.text(box.left - 4, y(tick) + 3, pct1(tick), { anchor: 'end', size: 8, fill: 'muted' });
  }
  canvas.line(box.left, box.bottom, box.right, box.bottom, 'axis', 0.75);
  canvas.line(box.left, box.top, box.left, box.bottom, 'axis', 0.75);
  canvas.text(box.left, box.top - 6, 'Bad rate', { fill: 'muted' });
  const labelEvery = Math.max(1, Math.ceil(rows.length / 12));
  rows.forEach((row, index) => {
    const ink = row.fails ? 'bad' : model[key].ink;
    if (row.observedBadRateCi) {
      canvas.line(x(index), y(row.observedBadRateCi[0]), x(index), y(row.observedBadRateCi[1]), ink, 1.5);
      canvas.line(x(index) - 3, y(row.observedBadRateCi[0]), x(index) + 3, y(row.observedBadRateCi[0]), ink, 1.5);
      canvas.line(x(index) - 3, y(row.observedBadRateCi[1]), x(index) + 3, y(row.observedBadRateCi[1]), ink, 1.5);
    }
    canvas.marker(x(index) - 5, y(row.meanPd), 'diamond', 'reference', 3);
    canvas.marker(x(index), y(row.observedBadRate), model[key].marker, ink, 3.5);
    if (row.fails) canvas.text(x(index), box.top + 8, 'too low', { anchor: 'middle', size: 7, fill: 'bad' });
    if (index % labelEvery === 0) {
      const label = row.band !== null ? String(row.band) : row.label.length > 8 ? `${row.label.slice(0, 7)}…` : row.label;
      canvas.text(x(index), box.bottom + 12, label, { anchor: 'middle', size: 8, fill: 'muted' });
    }
  });
  const groups = result.groupedBy.kind === 'grades' ? `Grade (${result.groupedBy.column})` : 'Band (1 is the riskiest)';
  canvas.text((box.left + box.right) / 2, box.bottom + 25, groups, { anchor: 'middle', fill: 'muted' });
  const observed = `${model[key].label}: observed bad rate and interval`;
  legend(canvas, box.left + 8, box.bottom + 42, [{ label: observed, key }]);
  // The mean PD is a marker without a line: its own legend entry (legend() draws lines).
  const at = box.left + 8 + 36 + observed.length * 5.4;
  canvas.marker(at + 4, box.bottom + 39, 'diamond', 'reference', 3);
  canvas.text(at + 12, box.bottom + 42, 'Mean PD', { fill: 'muted' });
  const portfolio = result.portfolio;
  return {
    id: 'calibration',
    title: `${model[key].label} calibration`,
    caption: `Mean PD ${formatPercent(portfolio.meanPd, 2)} against an observed bad rate of ${formatPercent(portfolio.observedBadRate, 2)} over the portfolio; ${result.failing === 0 ? 'in no group' : `in ${formatCount(result.failing)} of ${formatCount(rows.length)} groups`} is the PD too low for the defaults observed (Jeffreys p below ${calibration.alpha}).`,
    width,
    height: box.bottom + 50,
    shapes: canvas.shapes,
  };
}

/** ΔGini by period with its interval; null without periods. */
export function stabilityChart(report: Report): Chart | null {
  const stability = report.stability;
  if (!stability || stability.periods.length === 0) return null;
  const rows = stability.periods;
  const canvas = new Canvas();
  const width = 480;
  const left = 110;
  const right = width - 20;
  const rowH = 16;
  const top = 30;
  const values = [0, ...rows.flatMap((row) => [...(row.deltaGiniCi ?? []), ...(row.deltaGini === null ? [] : [row.deltaGini])])];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const pad = (hi - lo) * 0.08 || 0.01;
  const ticks = niceTicks(lo - pad, hi + pad, 6);
  const at = scale([Math.min(ticks[0], lo - pad), Math.max(ticks[ticks.length - 1], hi + pad)], [left, right]);
  const bottom = top + rows.length * rowH;
  canvas.text(8, 14, `ΔGini points by ${stability.periodColumn ?? 'period'}, with intervals`, { bold: true });
  canvas.line(at(0), top - 8, at(0), bottom, 'text', 1);
  rows.forEach((row, index) => {
    const yy = top + index * rowH + 4;
    canvas.text(left - 8, yy + 3, row.period.length > 18 ? `${row.period.slice(0, 17)}…` : row.period, { anchor: 'end', size: 8, fill: row.enoughBads ? 'text' : 'muted' });
    if (row.deltaGini === null) canvas.text(left + 4, yy + 3, row.note ?? 'not defined', { size: 8, fill: 'muted' });
    else intervalRow(canvas, at, yy, row.deltaGini, row.deltaGiniCi, row.signChanged ? 'bad' : row.enoughBads ? 'text' : 'muted', 'diamond');
  });
  canvas.line(left, bottom, right, bottom, 'axis', 0.75);
  for (const tick of ticks) {
    canvas.line(at(tick), bottom, at(tick), bottom + 3, 'axis', 0.75);
    canvas.text(at(tick), bottom + 12, formatGiniDelta(tick), { anchor: 'middle', size: 8, fill: 'muted' });
  }
  return {
    id: 'stability',
    title: 'Uplift by period',
    caption:
      stability.signChanges.length > 0
        ? `The uplift changes sign in ${stability.signChanges.join(', ')} (periods with at least ${formatCount(stability.minBads)} bads).`
        : `The uplift keeps its sign in every period with at least ${formatCount(stability.minBads)} bads (${formatCount(rows.length)} periods in all).`,
    width,
    height: bottom + 22,
    shapes: canvas.shapes,
  };
}
