/**
 * The ΔGini interval against zero and against the adoption policy's materiality line: the scale
 * of the drawing and the same facts in words. Values are Gini fractions (0.041 = 4.1 points).
 */

export interface UpliftFacts {
  delta: number;
  interval: readonly [number, number];
  /** Materiality in Gini fractions (2 points = 0.02). */
  materiality: number;
}

/** The drawn range: the interval, zero and the materiality line, with a margin, in round steps. */
export function upliftDomain({ delta, interval, materiality }: UpliftFacts, step = 0.01): [number, number] {
  const values = [delta, interval[0], interval[1], 0, materiality];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const margin = Math.max((hi - lo) * 0.15, step);
  return [Math.floor((lo - margin) / step) * step, Math.ceil((hi + margin) / step) * step];
}

/** Tick values across the domain: every 1, 2, 5 or 10 … points so there are about `target` ticks. */
export function upliftTicks(domain: readonly [number, number], target = 8): number[] {
  const span = domain[1] - domain[0];
  const raw = span / target;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((factor) => factor * magnitude).find((candidate) => candidate >= raw) ?? 10 * magnitude;
  const ticks: number[] = [];
  for (let value = Math.ceil(domain[0] / step) * step; value <= domain[1] + step / 1e6; value += step) ticks.push(Number(value.toFixed(10)));
  return ticks;
}

export type IntervalPosition = 'above' | 'straddles' | 'below';

/** Where the interval lies relative to a line. */
export function relativeTo(interval: readonly [number, number], line: number): IntervalPosition {
  if (interval[0] > line) return 'above';
  if (interval[1] < line) return 'below';
  return 'straddles';
}

/** The picture in words (the chart's text alternative), with numbers formatted by the caller. */
export function describeUplift(facts: UpliftFacts, text: { delta: string; interval: string; materiality: string; confidence: string }): string {
  const zero = relativeTo(facts.interval, 0);
  const material = relativeTo(facts.interval, facts.materiality);
  const first = `The challenger's Gini is ${text.delta} points against the champion's, ${text.confidence} interval ${text.interval}.`;
  const againstZero =
    zero === 'above'
      ? 'The whole interval lies above zero'
      : zero === 'below'
        ? 'The whole interval lies below zero: the champion separates better'
        : 'The interval includes zero: no difference is consistent with the data';
  const againstMateriality =
    material === 'above'
      ? `and above the materiality line of ${text.materiality} points.`
      : material === 'below'
        ? `and below the materiality line of ${text.materiality} points.`
        : facts.delta >= facts.materiality
          ? `; the estimate reaches the materiality line of ${text.materiality} points but the lower bound does not.`
          : `; the estimate is below the materiality line of ${text.materiality} points.`;
  return `${first} ${againstZero}${againstMateriality.startsWith(';') ? againstMateriality : ` ${againstMateriality}`}`;
}
