import { formatCount, formatInterval, formatPercent } from './format';
import { hasUnknownOrWeights } from './population';
import { inferenceOf, type Report, type RejectInference, type SegmentSwapCell, type SwapSets } from './report';

/**
 * The words the printable report (src/) and the committee pack (server/pack/) use for a holdout
 * with applicants without an outcome or sampling weights: the population it stands for, the reject
 * inference by name, and each swap set's bad rate with the inference named beside it. One copy, so
 * the screen, the PDF and the verdict say the same. Plain holdouts get nothing extra.
 */

/** The reject inference in words: "known outcomes only", "parcelling (factor 2)", "the inferred-bad column". */
export function inferenceWords(inference: RejectInference): string {
  return inference.method === 'known-only' ? 'known outcomes only' : inference.method === 'parcel' ? `parcelling (factor ${inference.parcelFactor})` : 'the inferred-bad column';
}

/** The inference with the column it reads, for the settings facts: "the inferred-bad column (bureau_pd_12m)". */
export function inferenceFact(report: Pick<Report, 'settings' | 'mapping'>): string {
  const inference = inferenceOf(report.settings);
  const words = inferenceWords(inference);
  if (inference.method === 'column' && report.mapping.inferredBad) return `${words} (${report.mapping.inferredBad})`;
  if (inference.method === 'known-only') return `${words}: the swap sets' bad rates are of the accounts with an outcome, with the bounds beside them`;
  return words;
}

const applicants = (n: number) => formatCount(Math.round(n));

/**
 * The Data facts that change for such a holdout: rows and the applicants they stand for, with and
 * without an outcome; goods and bads are rows with an outcome; the bad rate is weighted. Null for a
 * plain holdout (the facts stay as they were).
 */
export function populationFacts(report: Pick<Report, 'population' | 'rows' | 'goods' | 'bads' | 'badRate' | 'settings' | 'mapping'>): [string, string][] | null {
  const population = report.population;
  if (!population || !hasUnknownOrWeights(report)) return null;
  const { known, unknown } = population;
  const weighted = population.accounts !== population.rows;
  return [
    [
      'Population',
      `${formatCount(population.rows)} rows standing for ${applicants(population.accounts)} applicants${weighted ? ' (sampling weights summed)' : ''}: ` +
        `${formatCount(known.rows)} rows with an outcome (${applicants(known.accounts)} applicants), ${formatCount(unknown.rows)} without an outcome (${applicants(unknown.accounts)} applicants)`,
    ],
    ['Goods / bads', `${formatCount(report.goods)} / ${formatCount(report.bads)} rows with an outcome (${applicants(known.goods)} / ${applicants(known.bads)} applicants)`],
    ['Bad rate', `${formatPercent(report.badRate, 2)} of the applicants with an outcome${weighted ? ', weighted' : ''}`],
    ['Reject inference', inferenceFact(report)],
  ];
}

type Cell = Pick<SegmentSwapCell, 'count' | 'badRate' | 'accounts' | 'unknown' | 'badRateBounds' | 'inferred'>;

/** A swap cell's accounts: weighted applicants when the holdout has weights or unknown outcomes, else rows. */
export function cellAccounts(cell: Pick<Cell, 'count' | 'accounts'>): string {
  return applicants(cell.accounts ?? cell.count);
}

/**
 * A swap cell's bad rate with its basis named: "8.3% inferred by parcelling (factor 2)" when the
 * run infers the bads of its applicants without an outcome; "5.1% of known outcomes only" under
 * known-only; the plain rate when every outcome in it is known.
 */
export function cellRateWords(cell: Cell, settings: Report['settings']): string {
  if ((cell.unknown ?? 0) === 0) return formatPercent(cell.badRate);
  const inference = inferenceOf(settings);
  if (inference.method !== 'known-only' && cell.inferred) return `${formatPercent(cell.inferred.badRate)} inferred by ${inferenceWords(inference)}`;
  return `${formatPercent(cell.badRate)} of known outcomes only`;
}

/**
 * The sentence under the swap-set table for cells with applicants without an outcome, e.g.
 * "Swap-in: 10,767 applicants, 10,767 without an outcome (never booked); bad rate 8.3% inferred
 * by the inferred-bad column, an assumption, not observed; of known outcomes —, bounds 0.0% to
 * 100.0%." Null when every outcome in the swap-in and swap-out is known.
 */
export function swapUnknownNote(swap: Pick<SwapSets, 'swapIn' | 'swapOut'>, settings: Report['settings']): string | null {
  const parts: string[] = [];
  for (const [name, cell] of [
    ['Swap-in', swap.swapIn],
    ['Swap-out', swap.swapOut],
  ] as const) {
    const unknown = cell.unknown ?? 0;
    if (unknown === 0) continue;
    const bounds = formatInterval(cell.badRateBounds ?? null, (value) => formatPercent(value));
    const inferred = inferenceOf(settings).method !== 'known-only' && cell.inferred;
    parts.push(
      `${name}: ${cellAccounts(cell)} applicants, ${applicants(unknown)} without an outcome (never booked); bad rate ${cellRateWords(cell, settings)}${
        inferred ? `, an assumption, not observed; of known outcomes ${formatPercent(cell.badRate)}` : ''
      }, bounds ${bounds} (every applicant without an outcome good, or every one bad).`,
    );
  }
  return parts.length > 0 ? parts.join(' ') : null;
}
