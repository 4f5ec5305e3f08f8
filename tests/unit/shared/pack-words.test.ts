import { describe, expect, it } from 'vitest';
import type { ModelCalibration, Stability } from '@shared/calibration';
import { defaultAdoptionPolicy } from '@shared/policy';
import {
  brierFacts,
  calibratedModels,
  calibrationTable,
  calibrationTestsSentence,
  calibrationTitle,
  psiBandsTable,
  psiSentence,
  psiTable,
  stabilitySignSentence,
  stabilityTable,
} from '@shared/pack/calibration-words';
import { swapSegmentsTable, swapSetsTable } from '@shared/pack/evidence-words';
import { segmentsTable } from '@shared/segments-words';
import { criteriaTable, noDecisionSentence, policyInOneSentence, verdictHeading } from '@shared/pack/record-words';
import type { Report, SwapCell, SwapSets } from '@shared/report';

// The words the committee pack (PDF) and the printable report both print, from one function each
// (shared/pack/*-words.ts). Expected strings written out by hand from the inputs below and the
// number formats of shared/format.ts (thousands separators, the real minus sign, "—" for nothing,
// p to three significant digits and in scientific notation below 0.001).

const cell = (count: number, share: number, bads: number, badRate: number | null, ci: [number, number] | null, amount: number | null): SwapCell => ({
  count,
  share,
  bads,
  badRate,
  badRateCi: ci,
  amount,
});

const swap: SwapSets = {
  basis: 'approval-rate',
  requestedApprovalRate: 0.7,
  champion: { cutoff: 612, approvalRate: 0.7004 },
  challenger: { cutoff: 598, approvalRate: 0.6998 },
  bothAccept: cell(12_000, 0.6, 480, 0.04, [0.0366, 0.0437], 9_500_000),
  swapIn: cell(2_000, 0.1, 130, 0.065, [0.0549, 0.0768], 1_250_000),
  swapOut: cell(2_000, 0.1, 190, 0.095, [0.0829, 0.1087], 1_300_000),
  bothReject: cell(4_000, 0.2, 800, 0.2, [0.1878, 0.2128], 2_000_000),
  test: { method: 'two-proportion-z', z: -3.3, p: 0.001, reason: null },
  bySegment: [
    {
      column: 'channel',
      value: 'broker',
      accounts: 5_000,
      bads: 400,
      champion: { approved: 3_500, approvalRate: 0.7, approvedBadRate: 0.05 },
      challenger: { approved: 3_620, approvalRate: 0.724, approvedBadRate: 0.052 },
      swapIn: { count: 600, bads: 66, badRate: 0.11, badRateCi: [0.0876, 0.1373], amount: null },
      swapOut: { count: 480, bads: 38, badRate: 0.0792, badRateCi: [0.0583, 0.1068], amount: null },
    },
  ],
} as SwapSets;

const settings = { confidence: 0.95 } as Report['settings'];

describe('the evidence in words (shared/pack/evidence-words.ts)', () => {
  it('writes the swap cells with their intervals, and the amounts in full or short', () => {
    const report = { swap, settings, mapping: { exposure: 'loan_amount' } } as unknown as Report;
    const table = swapSetsTable(report);
    expect(table.note).toBe('Bad rates with 95% Wilson intervals.');
    expect(table.head).toEqual(['', 'Accounts', 'Share', 'Bads', 'Bad rate', '95% interval', 'Amount']);
    expect(table.rows[1]).toEqual(['Swap-in (champion declines, challenger accepts)', '2,000', '10.0%', '130', '6.5%', '5.5% to 7.7%', '1,250,000']);
    expect(swapSetsTable(report, { compactMoney: true }).rows[0].at(-1)).toBe('9.5M');
    const noAmount = swapSetsTable({ ...report, mapping: { exposure: undefined } } as unknown as Report);
    expect(noAmount.head).not.toContain('Amount');
    expect(noAmount.rows.every((row) => row.length === 6)).toBe(true);
  });

  it('flags the segment value whose swap-in is riskier, with the rates and approvals moving champion → challenger', () => {
    const table = swapSegmentsTable({ swap, settings } as unknown as Report)!;
    expect(table.rows).toEqual([
      ['channel = broker', '5,000', '70.0% → 72.4%', '+120', '5.0% → 5.2%', '600', '11.0% (8.8% to 13.7%)', '480', '7.9% (5.8% to 10.7%)', 'Swap-in riskier than swap-out'],
    ]);
    expect(table.note).toContain('Swap-in and swap-out bad rates with 95% Wilson intervals.');
    const safer = { ...swap, bySegment: [{ ...swap.bySegment[0], swapIn: { ...swap.bySegment[0].swapIn, badRate: 0.05 } }] };
    expect(swapSegmentsTable({ swap: safer, settings } as unknown as Report)!.rows[0].at(-1)).toBe('');
    expect(swapSegmentsTable({ swap: { ...swap, bySegment: [] }, settings } as unknown as Report)).toBeNull();
  });

  it('writes each segment’s ΔGini with its interval, DeLong’s and Holm’s p and the flags, naming the side and the thin values', () => {
    // An engine 1.1 row: no two-sided p, no interval, no flags; the p in the policy's sidedness.
    const segments = [
      { column: 'product', value: 'card', n: 12_345, bads: 40, championGini: 0.41, challengerGini: 0.455, deltaGini: 0.045, p: 0.0123, pHolm: 0.00042, tooFewBads: true, note: null },
    ];
    const table = segmentsTable({ segments, policy: { sided: 'one-sided' }, settings: { confidence: 0.95 } } as unknown as Report)!;
    expect(table.note).toMatch(/^ΔGini per segment value with its DeLong interval and p \(one-sided\)/);
    expect(table.head).toEqual(['Segment', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', '95% interval', 'p, one-sided', 'Holm p', 'Flag or note']);
    expect(table.rows[0]).toEqual(['product = card', '12,345', '40', '41.0', '45.5', '+4.5', '—', '0.0123', '4.2 × 10⁻⁴', 'few bads']);
    expect(segmentsTable({ segments: [], policy: { sided: 'two-sided' } } as unknown as Report)).toBeNull();
    // Since engine 1.2 the segment p is two-sided whatever the policy (the row then carries pTwoSided):
    // a one-sided policy must not relabel it; the interval and the flags are printed.
    const current = segmentsTable({
      segments: [{ ...segments[0], pTwoSided: 0.0123, giniCi: [-0.01, 0.1], tooFewBads: false, flags: ['materially-worse'] }],
      policy: { sided: 'one-sided' },
      settings: { confidence: 0.9 },
    } as unknown as Report)!;
    expect(current.note).toMatch(/^ΔGini per segment value with its DeLong interval and p \(two-sided\)/);
    expect(current.head[6]).toBe('90% interval');
    expect(current.head[7]).toBe('p, two-sided');
    expect(current.rows[0]).toEqual(['product = card', '12,345', '40', '41.0', '45.5', '+4.5', '−1.0 to +10.0', '0.0123', '4.2 × 10⁻⁴', 'Materially worse']);
  });
});

const calibration: ModelCalibration = {
  groupedBy: { kind: 'grades', column: 'grade' },
  rows: [
    { label: 'A', band: null, accounts: 1_000, meanPd: 0.02, observedBadRate: 0.031, observedBadRateCi: [0.0219, 0.0437], expectedBads: 20, observedBads: 31, jeffreysP: 0.0089, binomialP: 0.0112, fails: true },
  ],
  portfolio: { label: 'Portfolio', band: null, accounts: 1_000, meanPd: 0.02, observedBadRate: 0.031, observedBadRateCi: [0.0219, 0.0437], expectedBads: 20, observedBads: 31, jeffreysP: 0.0089, binomialP: 0.0112, fails: true },
  failing: 1,
  brier: { brier: 0.0301234, reliability: 0.0001234, resolution: 0.0000567, uncertainty: 0.030039, withinGroup: 0.0000001 },
} as unknown as ModelCalibration;

describe('calibration and stability in words (shared/pack/calibration-words.ts)', () => {
  it('names the grouping, the tests and how many groups fail', () => {
    expect(calibrationTitle('challenger', calibration)).toBe('Challenger: calibration by grade (grade)');
    expect(calibrationTestsSentence({ alpha: 0.05, confidence: 0.95 }, calibration)).toBe(
      'Jeffreys test (ECB 2019 instructions for IRB validation reporting) and exact binomial test, one-sided, H0: the PD is not underestimated; groups with Jeffreys p below α = 0.05 are marked “too low”: 1 of 1. Observed bad rates with their 95% Wilson intervals.',
    );
    expect(calibrationTestsSentence({ alpha: 0.01, confidence: 0.9 }, { ...calibration, failing: 0 })).toContain('α = 0.01 are marked “too low”: none is. Observed bad rates with their 90% Wilson');
    expect(calibratedModels({ champion: null, challenger: calibration } as never)).toEqual(['challenger']);
    expect(calibratedModels(undefined)).toEqual([]);
  });

  it('writes the groups then the portfolio, and the Brier score with five decimals', () => {
    const table = calibrationTable(calibration);
    expect(table.rows).toHaveLength(2);
    expect(table.rows[0]).toEqual(['A', '1,000', '2.00%', '3.10%', '2.19% to 4.37%', '20.0', '31', '0.00890', '0.0112', 'too low']);
    expect(brierFacts(calibration.brier)).toEqual([
      ['Brier score', '0.03012'],
      ['Reliability (Murphy 1973)', '0.00012'],
      ['Resolution', '0.00006'],
      ['Uncertainty', '0.03004'],
      ['Within groups', '0.00000'],
    ]);
  });

  it('says whether the uplift keeps its sign, and writes each period', () => {
    const stability = {
      periodColumn: 'month',
      minBads: 50,
      signChanges: [],
      periods: [
        { period: '2025-01', accounts: 3_000, bads: 120, championGini: 0.4, challengerGini: 0.43, deltaGini: 0.03, deltaGiniCi: [-0.004, 0.064], championKs: 0.31, challengerKs: 0.335, championPsiFromPrevious: null, challengerPsiFromPrevious: null, signChanged: false, enoughBads: true, note: null },
        { period: '2025-02', accounts: 2_900, bads: 110, championGini: 0.41, challengerGini: 0.4, deltaGini: -0.01, deltaGiniCi: [-0.05, 0.03], championKs: 0.3, challengerKs: 0.29, championPsiFromPrevious: 0.0123, challengerPsiFromPrevious: 0.0456, signChanged: true, enoughBads: true, note: null },
      ],
      psi: null,
    } as unknown as Stability;
    expect(stabilitySignSentence(stability)).toBe('The uplift keeps its sign in every period with at least 50 bads.');
    expect(stabilitySignSentence({ ...stability, signChanges: ['2025-02'] })).toBe('The uplift changes sign in 2025-02 (periods with at least 50 bads).');
    const table = stabilityTable(stability);
    expect(table.rows[0]).toEqual(['2025-01', '3,000', '120', '40.0', '43.0', '+3.0', '−0.4 to +6.4', '31.0 / 33.5', '—', '']);
    expect(table.rows[1].slice(8)).toEqual(['0.012 / 0.046', 'sign changed']);
  });

  it('writes the PSI against its reference and critical value, and by band', () => {
    const side = (psi: number, significant: boolean) => ({
      psi,
      criticalValue: 0.01852,
      criticalAlpha: 0.05,
      significant,
      rating: psi < 0.1 ? 'stable' : 'watch',
      bands: [{ band: 1, scoreMin: 0.0012, scoreMax: 0.0345, referenceShare: 0.1, actualShare: 0.1234, contribution: 0.004957 }],
      referenceSize: 3_000,
      actualSize: 4_000,
      emptyBandsAdjusted: 0,
    });
    const psi = { reference: { kind: 'file', fileName: 'dev.csv', sha256: 'x', rows: 3_000 }, actual: 'the holdout', champion: side(0.0123, false), challenger: side(0.1234, true) } as NonNullable<Stability['psi']>;
    expect(psiSentence(psi)).toBe('Against the development sample dev.csv (3,000 accounts), compared: the holdout. Critical value: Yurdakul & Naranjo; 0.1 / 0.25: common practice, no source.');
    expect(psiTable(psi).rows).toEqual([
      ['Champion', '0.0123', '0.0185', '0.05', '1', 'stable; no significant shift'],
      ['Challenger', '0.1234', '0.0185', '0.05', '1', 'watch; shift beyond sampling noise'],
    ]);
    const bands = psiBandsTable(psi, 'challenger');
    expect(bands.title).toBe('Challenger: PSI by reference band');
    expect(bands.rows[0].slice(3)).toEqual(['10.00%', '12.34%', '0.0050']);
  });
});

describe('the governance record in words (shared/pack/record-words.ts)', () => {
  it('heads the verdict with its policy version and writes each criterion met or not', () => {
    expect(verdictHeading({ policyVersion: 3 })).toBe('Verdict under adoption policy version 3');
    const criteria = [
      { id: 'significance', label: 'Significance', met: true, detail: 'p = 0.003' },
      { id: 'materiality', label: 'Materiality', met: false, detail: 'ΔGini 1.2 < 2' },
    ] as Report['verdict']['criteria'];
    expect(criteriaTable({ criteria }).rows).toEqual([
      ['Significance', 'Met', 'p = 0.003'],
      ['Materiality', 'Not met', 'ΔGini 1.2 < 2'],
    ]);
  });

  it('says the policy in one sentence and what state an undecided comparison is in', () => {
    expect(policyInOneSentence({ ...defaultAdoptionPolicy, quorum: 0 })).toBe(
      'Policy version 2: α = 0.05 (one-sided), materiality 2 Gini points, interval above zero required, swap rule at a 70.0% approval rate, at least 300 bads, quorum none.',
    );
    expect(noDecisionSentence('in-review')).toBe('No committee decision is recorded yet: this comparison is in review.');
  });
});
