import { type Curves, type Histogram } from '@shared/report';

/**
 * Shaping the report's curves and bootstrap histograms for charts and their table alternatives.
 * Pure functions, tested in tests/unit/client/chart-data.test.ts.
 */

export interface XY {
  x: number;
  y: number;
}

/**
 * y at `x` on a polyline through `points` (sorted by x, as the report sends ROC and CAP points),
 * by linear interpolation; at a vertical step (several points with the same x) the last one wins.
 */
export function interpolateAt(points: readonly XY[], x: number): number | null {
  if (points.length === 0) return null;
  if (x < points[0].x) return points[0].y;
  const last = points[points.length - 1];
  if (x >= last.x) return last.y;
  let lo = 0;
  let hi = points.length - 1;
  // The last index with points[i].x <= x.
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (points[mid].x <= x) lo = mid;
    else hi = mid - 1;
  }
  const a = points[lo];
  const b = points[lo + 1];
  if (!b || b.x === a.x) return a.y;
  return a.y + ((x - a.x) / (b.x - a.x)) * (b.y - a.y);
}

/** The points 0, step, 2·step, … 1, free of floating-point drift. */
export function gridSteps(step = 0.05): number[] {
  const count = Math.round(1 / step);
  return Array.from({ length: count + 1 }, (_, index) => Number((index / count).toFixed(6)));
}

/** A table of both models' curves at fixed x positions: the "show as table" of ROC and CAP. */
export function curveTable(curve: Curves['roc'], step = 0.05): { x: number; champion: number | null; challenger: number | null }[] {
  return gridSteps(step).map((x) => ({ x, champion: interpolateAt(curve.champion, x), challenger: interpolateAt(curve.challenger, x) }));
}

export interface KsPoint {
  score: number;
  cumBad: number;
  cumGood: number;
}

/**
 * Where to mark the KS gap on a model's cumulative-share chart: the point at the report's
 * `ksScore` (the engine found it on every account), else the largest gap among the drawn points.
 */
export function ksMarker(points: readonly KsPoint[], ksScore: number): (KsPoint & { gap: number }) | null {
  if (points.length === 0) return null;
  const exact = points.filter((point) => point.score === ksScore);
  const candidates = exact.length > 0 ? exact : points;
  let best = candidates[0];
  for (const point of candidates) {
    if (Math.abs(point.cumBad - point.cumGood) > Math.abs(best.cumBad - best.cumGood)) best = point;
  }
  return { ...best, gap: best.cumBad - best.cumGood };
}

/** About `count` points spread over a model's KS points, always with its KS point, for a table. */
export function ksTable(points: readonly KsPoint[], ksScore: number, count = 20): (KsPoint & { gap: number; isKs: boolean })[] {
  if (points.length === 0) return [];
  const marker = ksMarker(points, ksScore);
  const picked = new Set<number>();
  const stride = Math.max(1, (points.length - 1) / Math.max(1, count - 1));
  for (let index = 0; index < points.length; index += stride) picked.add(Math.round(index));
  picked.add(points.length - 1);
  if (marker) picked.add(points.findIndex((point) => point.score === marker.score && point.cumBad === marker.cumBad));
  return [...picked]
    .filter((index) => index >= 0)
    .sort((a, b) => a - b)
    .map((index) => {
      const point = points[index];
      return { ...point, gap: point.cumBad - point.cumGood, isKs: !!marker && point.score === marker.score && point.cumBad === marker.cumBad };
    });
}

export interface HistogramBin {
  /** A unique key per bin for the bar chart. */
  id: string;
  from: number;
  to: number;
  count: number;
  /** The bin lies wholly inside the interval. */
  inside: boolean;
}

/** Bins of a histogram, each marked as inside the interval or not (a bin that straddles a bound is not). */
export function histogramBins(histogram: Histogram, interval: readonly [number, number] | null): HistogramBin[] {
  return histogram.counts.map((count, index) => {
    const from = histogram.edges[index];
    const to = histogram.edges[index + 1];
    return { id: `bin-${index}`, from, to, count, inside: !!interval && from >= interval[0] && to <= interval[1] };
  });
}

/** Where a value sits along the histogram's whole range, 0 at the first edge, 1 at the last (clamped). */
export function positionInHistogram(histogram: Histogram, value: number): number {
  const first = histogram.edges[0];
  const last = histogram.edges[histogram.edges.length - 1];
  if (!(last > first)) return 0.5;
  return Math.min(1, Math.max(0, (value - first) / (last - first)));
}

/** The total of a histogram's counts (the number of replicates it holds). */
export function histogramTotal(histogram: Histogram): number {
  return histogram.counts.reduce((sum, count) => sum + count, 0);
}

/**
 * At most `max` points of a curve, evenly by index, keeping the first and the last: nivo draws
 * SVG, and a line of 500 points per model is more than the eye can use at chart size.
 */
export function thin<T>(points: readonly T[], max: number): T[] {
  if (points.length <= max) return points.slice();
  const out: T[] = [];
  const stride = (points.length - 1) / (max - 1);
  for (let index = 0; index < max; index += 1) out.push(points[Math.round(index * stride)]);
  return out;
}
