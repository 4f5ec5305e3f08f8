import { describe, expect, it } from 'vitest';
import { type SwapSets } from '@shared/report';
import { acceptanceRule, approvedBooks, heatLevel, reportSwapQuery, sameSwapQuery, scoreRange, snapToRange, swapQueryFromParams, swapQueryToParams } from '@/features/swap-sets/lib/swap-controls';
import { equalApprovalSentence } from '@shared/equal-approval-words';

describe('cut-off sliders in each model\'s units', () => {
  it('steps whole points by one', () => {
    expect(scoreRange({ min: 452, max: 749 })).toEqual({ min: 452, max: 749, sliderMin: 452, sliderMax: 749, step: 1, decimals: 0 });
  });

  it('steps a probability of default in about a thousand round steps', () => {
    // span 0.4985 → raw step 0.0004985 → 10^−4
    expect(scoreRange({ min: 0.0015, max: 0.5 })).toEqual({ min: 0.0015, max: 0.5, sliderMin: 0.0015, sliderMax: 0.5, step: 0.0001, decimals: 4 });
    // The demo PD: observed 0.000155 to 0.8757, span 0.875545 → raw 0.000875545 → steps of 10^−4;
    // the slider's low end widens to a whole step, 0.0001, so its values are round.
    expect(scoreRange({ min: 0.000155, max: 0.8757 })).toEqual({ min: 0.000155, max: 0.8757, sliderMin: 0.0001, sliderMax: 0.8757, step: 0.0001, decimals: 4 });
  });

  it('snaps a typed cut-off to the range and its step', () => {
    const points = scoreRange({ min: 452, max: 749 });
    expect(snapToRange(600.4, points)).toBe(600);
    expect(snapToRange(10, points)).toBe(452);
    expect(snapToRange(1000, points)).toBe(749);
    const pd = scoreRange({ min: 0.0015, max: 0.5 });
    expect(snapToRange(0.123456, pd)).toBe(0.1235);
  });

  it('says which side of the cut-off is accepted', () => {
    expect(acceptanceRule('safer', '600')).toBe('600 or more is accepted');
    expect(acceptanceRule('riskier', '0.05')).toBe('0.05 or less is accepted');
  });
});

describe('the swap query in the URL', () => {
  it('reads cut-offs before an approval rate and refuses nonsense', () => {
    expect(swapQueryFromParams(new URLSearchParams('champion=600&challenger=0.05&rate=0.5'))).toEqual({ cutoffs: { champion: 600, challenger: 0.05 } });
    expect(swapQueryFromParams(new URLSearchParams('rate=0.65'))).toEqual({ approvalRate: 0.65 });
    expect(swapQueryFromParams(new URLSearchParams('rate=1.5'))).toBeNull();
    expect(swapQueryFromParams(new URLSearchParams('champion=600'))).toBeNull();
    expect(swapQueryFromParams(new URLSearchParams('champion=abc&challenger=1'))).toBeNull();
  });

  it('writes what it reads', () => {
    for (const query of [{ approvalRate: 0.7 }, { cutoffs: { champion: -3.5, challenger: 612 } }]) {
      expect(swapQueryFromParams(new URLSearchParams(swapQueryToParams(query)))).toEqual(query);
    }
  });

  it('compares queries by value', () => {
    expect(sameSwapQuery({ approvalRate: 0.7 }, { approvalRate: 0.7 })).toBe(true);
    expect(sameSwapQuery({ approvalRate: 0.7 }, { cutoffs: { champion: 1, challenger: 2 } })).toBe(false);
    expect(sameSwapQuery({ cutoffs: { champion: 1, challenger: 2 } }, { cutoffs: { champion: 1, challenger: 2 } })).toBe(true);
    expect(sameSwapQuery(null, null)).toBe(true);
    expect(sameSwapQuery(null, { approvalRate: 0.7 })).toBe(false);
  });
});

// The swap sets of the 60,000-row demo holdout at a 70% approval rate, as the engine reports them
// (npm run compare -- sample-data/tallowmere-holdout-2025.csv … --json, engine 1.0.0).
const cell = (count: number, bads: number, amount: number) => ({ count, share: count / 60000, bads, badRate: bads / count, badRateCi: null, amount });
const swap: SwapSets = {
  basis: 'approval-rate',
  requestedApprovalRate: 0.7,
  champion: { cutoff: 590, approvalRate: 0.70845 },
  challenger: { cutoff: 589, approvalRate: 0.7038666666666666 },
  bothAccept: cell(37021, 997, 231950650),
  swapIn: cell(5211, 352, 30269450),
  swapOut: cell(5486, 523, 31486350),
  bothReject: cell(12282, 2271, 68713550),
  test: { method: 'two-proportion-z', z: -5.24, p: 1.6e-7, reason: null },
  bySegment: [],
};

describe('numbers derived from a swap result', () => {
  it("adds up each model's approved book", () => {
    const books = approvedBooks(swap);
    // Champion: both accept + swap-out = 37,021 + 5,486 = 42,507 accounts, 997 + 523 = 1,520 bads —
    // the engine's strategyCurve.atApprovalRate.championBads is 1,520 as well.
    expect(books.champion).toMatchObject({ count: 42507, bads: 1520, amount: 263437000 });
    expect(books.champion.badRate).toBeCloseTo(1520 / 42507, 12);
    // Challenger: 37,021 + 5,211 = 42,232 accounts, 997 + 352 = 1,349 bads (engine: challengerBads 1,349).
    expect(books.challenger).toMatchObject({ count: 42232, bads: 1349 });
    expect(books.champion.share).toBeCloseTo(0.70845, 12);
  });

  it('gives the query that reproduces the report', () => {
    expect(reportSwapQuery(swap)).toEqual({ approvalRate: 0.7 });
    expect(reportSwapQuery({ ...swap, basis: 'cutoffs', requestedApprovalRate: null })).toEqual({ cutoffs: { champion: 590, challenger: 589 } });
  });

  it('shades heat-map cells in five levels, empty cells apart', () => {
    expect(heatLevel(0, 100)).toBe(0);
    expect(heatLevel(1, 100)).toBe(1);
    expect(heatLevel(20, 100)).toBe(1);
    expect(heatLevel(21, 100)).toBe(2);
    expect(heatLevel(100, 100)).toBe(5);
  });

  it('words the trade-offs at equal approval whichever way they go', () => {
    const at = { approvalRate: 0.7, accounts: 42_000, championBads: 1_200, challengerBads: 1_029, badsAvoided: 171, challengerAtCutoff: { accounts: 42_000, bads: 1_029 }, approvalsGainedAtEqualBadRate: 2913 };
    expect(equalApprovalSentence(at)).toBe(
      'At equal approval — the 42,000 accounts the champion approves at 70.0% — the champion’s book holds 1,200 bads and the challenger’s 1,029: the challenger approves 171 fewer bads than the champion. At the champion’s bad rate it could approve 2,913 more accounts.',
    );
    // Ties: the challenger's own cut-off approves fewer; the equal book's bads are fractional.
    expect(
      equalApprovalSentence({ ...at, approvalRate: 0.62, challengerBads: 1_213.5, badsAvoided: -13.5, challengerAtCutoff: { accounts: 41_725, bads: 1_190 }, approvalsGainedAtEqualBadRate: -124 }),
    ).toBe(
      'At equal approval — the 42,000 accounts the champion approves at 62.0% — the champion’s book holds 1,200 bads and the challenger’s 1,213.5: the challenger approves 13.5 more bads than the champion (its own cut-off for 62.0% approves 41,725 accounts with 1,190 bads; ties at the cut-offs make the two books differ in size). At the champion’s bad rate it could approve 124 fewer accounts.',
    );
    expect(equalApprovalSentence({ ...at, badsAvoided: 0, approvalsGainedAtEqualBadRate: null })).toContain('No book of the challenger reaches the champion’s bad rate.');
  });
});
