import { type SwapQuery } from '@shared/comparisons';
import { fullSwapCell, type HigherIs, type SwapCell, type SwapSets } from '@shared/report';

/**
 * The swap-set controls' logic: slider ranges in each model's own units, the query kept in the
 * page's URL, and the numbers the page derives from a swap result. Pure; tested on its own.
 */

export interface ScoreRange {
  /** The observed lowest and highest score. */
  min: number;
  max: number;
  /** The slider's ends: the observed range widened to whole steps, so its values are round. */
  sliderMin: number;
  sliderMax: number;
  /** Slider step in the score's units. */
  step: number;
  /** Decimals to show for a value on this range. */
  decimals: number;
}

/**
 * The slider range over the observed scores: whole points step by 1; anything else (a PD in
 * [0, 1], a score with decimals) in about a thousand steps of a round size.
 */
export function scoreRange(summary: { min: number; max: number }): ScoreRange {
  const { min, max } = summary;
  if (Number.isInteger(min) && Number.isInteger(max) && max - min >= 20) return { min, max, sliderMin: min, sliderMax: max, step: 1, decimals: 0 };
  const span = max - min;
  if (!(span > 0)) return { min, max: min, sliderMin: min, sliderMax: min, step: 1, decimals: 0 };
  const raw = span / 1000;
  const exponent = Math.floor(Math.log10(raw));
  const decimals = Math.max(0, -exponent);
  const step = Number((10 ** exponent).toFixed(decimals));
  const round = (value: number) => Number(value.toFixed(decimals));
  return { min, max, sliderMin: round(Math.floor(min / step) * step), sliderMax: round(Math.ceil(max / step) * step), step, decimals };
}

/** A value snapped to the slider's steps and kept within its ends (for a typed cut-off). */
export function snapToRange(value: number, range: ScoreRange): number {
  const clamped = Math.min(range.sliderMax, Math.max(range.sliderMin, value));
  const snapped = range.sliderMin + Math.round((clamped - range.sliderMin) / range.step) * range.step;
  return Number(Math.min(range.sliderMax, snapped).toFixed(range.decimals));
}

/** Which side of a cut-off is accepted, in words: "600 or more is accepted". */
export function acceptanceRule(higherIs: HigherIs, cutoff: string): string {
  return higherIs === 'safer' ? `${cutoff} or more is accepted` : `${cutoff} or less is accepted`;
}

// --- the query in the URL -----------------------------------------------------------------

/** Reads ?rate=0.7, or ?champion=600&challenger=610, into a swap query; null when neither is valid. */
export function swapQueryFromParams(params: URLSearchParams): SwapQuery | null {
  const champion = params.get('champion');
  const challenger = params.get('challenger');
  if (champion !== null && challenger !== null && champion !== '' && challenger !== '') {
    const cutoffs = { champion: Number(champion), challenger: Number(challenger) };
    if (Number.isFinite(cutoffs.champion) && Number.isFinite(cutoffs.challenger)) return { cutoffs };
  }
  const rate = params.get('rate');
  if (rate !== null && rate !== '') {
    const approvalRate = Number(rate);
    if (Number.isFinite(approvalRate) && approvalRate > 0 && approvalRate < 1) return { approvalRate };
  }
  return null;
}

export function swapQueryToParams(query: SwapQuery): Record<string, string> {
  if (query.cutoffs) return { champion: String(query.cutoffs.champion), challenger: String(query.cutoffs.challenger) };
  return { rate: String(query.approvalRate) };
}

export function sameSwapQuery(a: SwapQuery | null, b: SwapQuery | null): boolean {
  if (!a || !b) return a === b;
  if (a.cutoffs || b.cutoffs) {
    return !!a.cutoffs && !!b.cutoffs && a.cutoffs.champion === b.cutoffs.champion && a.cutoffs.challenger === b.cutoffs.challenger;
  }
  return a.approvalRate === b.approvalRate;
}

/** The query that reproduces a report's own swap sets. */
export function reportSwapQuery(swap: SwapSets): SwapQuery {
  if (swap.basis === 'approval-rate' && swap.requestedApprovalRate !== null) return { approvalRate: swap.requestedApprovalRate };
  return { cutoffs: { champion: swap.champion.cutoff, challenger: swap.challenger.cutoff } };
}

// --- derived numbers ----------------------------------------------------------------------

function combine(a: SwapCell, b: SwapCell) {
  // Accounts (summed weights with a weight column); the bad rate is of those with a known outcome.
  const x = fullSwapCell(a);
  const y = fullSwapCell(b);
  const count = x.accounts + y.accounts;
  const known = x.known + y.known;
  const bads = a.bads + b.bads;
  return {
    count,
    bads,
    badRate: known > 0 ? bads / known : null,
    amount: a.amount === null || b.amount === null ? null : a.amount + b.amount,
    share: a.share + b.share,
  };
}

/**
 * Each model's approved book at these cut-offs: the champion approves both-accept and swap-out,
 * the challenger both-accept and swap-in.
 */
export function approvedBooks(swap: SwapSets) {
  return { champion: combine(swap.bothAccept, swap.swapOut), challenger: combine(swap.bothAccept, swap.swapIn) };
}

/** Shading level 0–5 of a heat-map cell by its share of the largest cell (0 only for an empty cell). */
export function heatLevel(count: number, maxCount: number): number {
  if (count <= 0 || maxCount <= 0) return 0;
  return Math.max(1, Math.min(5, Math.ceil((count / maxCount) * 5)));
}
