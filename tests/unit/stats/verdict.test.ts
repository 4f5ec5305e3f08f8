import { defaultAdoptionPolicy, type AdoptionPolicy } from '@shared/policy';
import { analysisSettingsSchema, verdictSchema, type SegmentRow, type SwapCell, type SwapSets } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { verdict, type VerdictEvidence } from '@server/stats/verdict';

const cell = (count: number, bads: number): SwapCell => ({
  count,
  share: count / 10000,
  bads,
  badRate: count > 0 ? bads / count : null,
  badRateCi: null,
  amount: null,
});

function swap(rate: number, swapIn: [number, number], swapOut: [number, number]): SwapSets {
  return {
    basis: 'approval-rate',
    requestedApprovalRate: rate,
    champion: { cutoff: 600, approvalRate: rate },
    challenger: { cutoff: 0.2, approvalRate: rate },
    bothAccept: cell(6000, 300),
    swapIn: cell(...swapIn),
    swapOut: cell(...swapOut),
    bothReject: cell(2000, 500),
    test: { method: 'two-proportion-z', z: -3.1, p: 0.0019, reason: null },
    bySegment: [],
  };
}

/** The evidence of a report whose ΔGini is `gini` with interval `ci` and one-sided p. */
function evidence(options: { gini: number; ci: [number, number]; z: number; pOne: number; pTwo: number; bads?: number; swap?: SwapSets; segments?: SegmentRow[] }): VerdictEvidence {
  const se = 0.01;
  return {
    bads: options.bads ?? 412,
    settings: analysisSettingsSchema.parse({}),
    swap: options.swap ?? swap(0.7, [812, 25], [812, 52]),
    difference: {
      auc: options.gini / 2,
      gini: options.gini,
      se: se / 2,
      giniSe: se,
      z: options.z,
      pTwoSided: options.pTwo,
      pOneSided: options.pOne,
      aucCi: [options.ci[0] / 2, options.ci[1] / 2],
      giniCi: options.ci,
      giniBootstrapCi: null,
      ks: 0.03,
      ksCi: null,
      varianceChampion: 1e-4,
      varianceChallenger: 1e-4,
      covariance: 9e-5,
      correlation: 0.9,
      inference: null,
    },
    segments: options.segments ?? [],
  };
}

const strong = evidence({ gini: 0.041, ci: [0.02, 0.062], z: 3.43, pOne: 0.0003, pTwo: 0.0006 });

describe('verdict', () => {
  it('supports adoption when every criterion is met, with the numbers in each detail', () => {
    const result = verdict(strong, defaultAdoptionPolicy);
    expect(verdictSchema.parse(result)).toEqual(result);
    expect(result.outcome).toBe('supported');
    expect(result.policyVersion).toBe(2);
    expect(result.criteria.map((c) => [c.id, c.met])).toEqual([
      ['significance', true],
      ['materiality', true],
      ['interval', true],
      ['swap-bad-rate', true],
      ['minimum-bads', true],
      ['segments', true],
    ]);
    const detail = Object.fromEntries(result.criteria.map((c) => [c.id, c.detail]));
    expect(detail.significance).toMatch(/^one-sided p = 3\.0 × 10⁻⁴ < α = 0\.05/);
    expect(detail.materiality).toBe('ΔGini = 4.1 points, at least the 2.0 points required');
    expect(detail.interval).toBe('the 95% interval of ΔGini is 2.0 to 6.2 points: its lower bound is above 0');
    expect(detail['swap-bad-rate']).toMatch(/^at the policy's 70% approval rate the swap-in is 812 accounts with a 3\.1% bad rate and the swap-out 812 accounts with a 6\.4% bad rate: the swap-in bad rate is not above/);
    expect(detail['minimum-bads']).toBe('412 bads in the holdout, at least the 300 required');
    // The sentence of the brief, with p below 0.001 in scientific notation.
    expect(result.summary).toBe(
      "The challenger's Gini is 4.1 points higher (95% interval 2.0 to 6.2, one-sided p = 3.0 × 10⁻⁴); at the policy's 70% approval rate it swaps in 812 accounts with a 3.1% bad rate for 812 with a 6.4% bad rate.",
    );
  });

  it('is not proven when a criterion fails, and says which', () => {
    const small = verdict(evidence({ gini: 0.012, ci: [0.001, 0.023], z: 2.1, pOne: 0.018, pTwo: 0.036, bads: 120 }), defaultAdoptionPolicy);
    expect(small.outcome).toBe('not-proven');
    expect(small.criteria.filter((c) => !c.met).map((c) => c.id)).toEqual(['materiality', 'minimum-bads']);
    expect(small.criteria.find((c) => c.id === 'materiality')!.detail).toBe('ΔGini = 1.2 points, below the 2.0 points required');
    expect(small.criteria.find((c) => c.id === 'minimum-bads')!.detail).toBe('only 120 bads in the holdout; the policy requires at least 300');
    expect(small.summary).toMatch(/^The challenger's Gini is 1\.2 points higher \(95% interval 0\.1 to 2\.3, one-sided p = 0\.018\)/);
    // Swap-in worse than swap-out fails the swap rule.
    const worseSwap = verdict({ ...strong, swap: swap(0.7, [800, 60], [800, 40]) }, defaultAdoptionPolicy);
    expect(worseSwap.outcome).toBe('not-proven');
    expect(worseSwap.criteria.find((c) => c.id === 'swap-bad-rate')).toMatchObject({ met: false, detail: expect.stringMatching(/swap-in bad rate is above the swap-out's \(two-sided p = 0\.0019/) });
  });

  it('shows two decimals when ΔGini is within rounding of the materiality threshold', () => {
    const near = verdict(evidence({ gini: 0.01996, ci: [0.005, 0.035], z: 2.6, pOne: 0.005, pTwo: 0.01 }), defaultAdoptionPolicy);
    expect(near.criteria.find((c) => c.id === 'materiality')!.detail).toBe('ΔGini = 2.00 points, below the 2.00 points required');
    const exact = verdict(evidence({ gini: 0.02, ci: [0.005, 0.035], z: 2.6, pOne: 0.005, pTwo: 0.01 }), defaultAdoptionPolicy);
    expect(exact.criteria.find((c) => c.id === 'materiality')!.met).toBe(true);
  });

  it('finds the champion better when the challenger is significantly worse or the interval is below 0', () => {
    // z = −3: the opposite one-sided p is Φ(−3) = 0.00135 < 0.05 (normal table).
    const worse = verdict(evidence({ gini: -0.03, ci: [-0.05, -0.01], z: -3, pOne: 0.99865, pTwo: 0.0027 }), defaultAdoptionPolicy);
    expect(worse.outcome).toBe('champion-better');
    expect(worse.criteria.find((c) => c.id === 'interval')!.detail).toMatch(/−5\.0 to −1\.0 points: it lies entirely below 0/);
    expect(worse.summary).toMatch(/^The challenger's Gini is 3\.0 points lower \(95% interval −5\.0 to −1\.0, one-sided p = 1\)/);
    // Slightly worse but not significantly: not proven.
    expect(verdict(evidence({ gini: -0.004, ci: [-0.02, 0.012], z: -0.5, pOne: 0.69, pTwo: 0.62 }), defaultAdoptionPolicy).outcome).toBe('not-proven');
  });

  it('treats identical models as not proven, never as champion-better', () => {
    // Δ = 0, se = 0 → z = 0, p = 1 (docs/design.md numerical care).
    const same = verdict(evidence({ gini: 0, ci: [0, 0], z: 0, pOne: 1, pTwo: 1 }), defaultAdoptionPolicy);
    expect(same.outcome).toBe('not-proven');
    expect(same.summary).toMatch(/^The challenger's Gini is the same as the champion's to one decimal \(95% interval 0\.0 to 0\.0, one-sided p = 1\)/);
  });

  it('applies a two-sided policy in both directions', () => {
    const policy: AdoptionPolicy = { ...defaultAdoptionPolicy, version: 3, sided: 'two-sided' };
    const up = verdict(strong, policy);
    expect(up.criteria[0]).toMatchObject({ met: true, detail: expect.stringMatching(/^two-sided p = 6\.0 × 10⁻⁴ < α = 0\.05 \(DeLong test\) and the challenger's Gini is higher/) });
    expect(up.summary).toContain('two-sided p = 6.0 × 10⁻⁴');
    const down = verdict(evidence({ gini: -0.03, ci: [-0.07, 0.001], z: -2.2, pOne: 0.986, pTwo: 0.028 }), policy);
    expect(down.outcome).toBe('champion-better');
    expect(down.criteria[0].met).toBe(false);
  });

  it('re-judges a stored report under a new policy version, using swap sets at the policy’s rate', () => {
    const policy: AdoptionPolicy = { ...defaultAdoptionPolicy, version: 2, swapRule: { enabled: true, approvalRate: 0.75 } };
    // The stored report holds swap sets at 70%; without those at 75% the rule cannot be checked.
    const without = verdict(strong, policy);
    expect(without.policyVersion).toBe(2);
    expect(without.outcome).toBe('not-proven');
    expect(without.criteria.find((c) => c.id === 'swap-bad-rate')).toMatchObject({ met: false, detail: expect.stringMatching(/at the policy's 75% approval rate were not computed/) });
    const at75 = swap(0.75, [900, 36], [900, 54]);
    const withSwap = verdict(strong, policy, at75);
    expect(withSwap.outcome).toBe('supported');
    expect(withSwap.summary).toMatch(/at the policy's 75% approval rate it swaps in 900 accounts with a 4\.0% bad rate for 900 with a 6\.0% bad rate \(the run's own swap sets are at 70%\)\.$/);
    expect(() => verdict(strong, policy, swap(0.7, [1, 0], [1, 0]))).toThrow(/75% approval rate/);
  });

  it('leaves out criteria the policy switches off', () => {
    const policy: AdoptionPolicy = {
      ...defaultAdoptionPolicy,
      requireIntervalAboveZero: false,
      swapRule: { enabled: false, approvalRate: 0.7 },
      segmentRule: { enabled: false, minBads: 30 },
    };
    const result = verdict(evidence({ gini: 0.03, ci: [-0.001, 0.061], z: 1.9, pOne: 0.029, pTwo: 0.058 }), policy);
    expect(result.criteria.map((c) => c.id)).toEqual(['significance', 'materiality', 'minimum-bads']);
    expect(result.outcome).toBe('supported');
    expect(result.summary.endsWith('one-sided p = 0.029).')).toBe(true);
  });

  it('handles empty swap sides and an underflowed p-value', () => {
    const noSwapIn = verdict({ ...strong, swap: swap(0.7, [0, 0], [15, 3]) }, defaultAdoptionPolicy);
    expect(noSwapIn.criteria.find((c) => c.id === 'swap-bad-rate')).toMatchObject({ met: true, detail: expect.stringMatching(/there is no swap-in/) });
    expect(noSwapIn.summary).toContain('it swaps in no accounts for 15 with a 20.0% bad rate');
    const noSwapOut = verdict({ ...strong, swap: swap(0.7, [15, 3], [0, 0]) }, defaultAdoptionPolicy);
    expect(noSwapOut.criteria.find((c) => c.id === 'swap-bad-rate')!.met).toBe(false);
    const same = verdict({ ...strong, swap: swap(0.7, [0, 0], [0, 0]) }, defaultAdoptionPolicy);
    expect(same.summary).toContain("at the policy's 70% approval rate both models accept the same accounts.");
    const tiny = verdict(evidence({ gini: 0.2, ci: [0.18, 0.22], z: 40, pOne: 0, pTwo: 0 }), defaultAdoptionPolicy);
    expect(tiny.criteria[0].detail).toMatch(/^one-sided p < 1 × 10⁻³⁰⁰ < α/);
  });

  it('is a pure function of its inputs', () => {
    const frozen = structuredClone(strong);
    const deepFreeze = (o: object) => {
      Object.values(o).forEach((v) => v && typeof v === 'object' && deepFreeze(v));
      return Object.freeze(o);
    };
    deepFreeze(frozen);
    expect(verdict(frozen, defaultAdoptionPolicy)).toEqual(verdict(strong, defaultAdoptionPolicy));
  });

  it('is not proven with fewer than 2 bads, and champion-better needs the minimum bads', () => {
    // issue 13: one bad gave z = 1.8e308 and "champion better".
    const none = evidence({ gini: -0.4, ci: [0, 0], z: 0, pOne: 1, pTwo: 1, bads: 1 });
    const reason = 'only 1 bad: a variance needs at least 2 goods and 2 bads, so there is no standard error, test or interval';
    none.difference = { ...none.difference, se: null, giniSe: null, z: null, pOneSided: null, pTwoSided: null, aucCi: null, giniCi: null, inference: reason };
    const result = verdict(none, defaultAdoptionPolicy);
    expect(result.outcome).toBe('not-proven');
    expect(result.criteria.find((c) => c.id === 'significance')).toMatchObject({ met: false, detail: `no DeLong test: ${reason}` });
    expect(result.criteria.find((c) => c.id === 'interval')).toMatchObject({ met: false, detail: `no interval of ΔGini: ${reason}` });
    expect(result.summary).toContain(`(no interval or test: ${reason})`);
    // Significantly worse on 120 bads, below the policy's 300: not proven, not champion-better.
    const fewBads = verdict(evidence({ gini: -0.03, ci: [-0.05, -0.01], z: -3, pOne: 0.99865, pTwo: 0.0027, bads: 120 }), defaultAdoptionPolicy);
    expect(fewBads.outcome).toBe('not-proven');
  });

  it('fails the segment rule for a value significantly worse, naming it in the detail and the sentence', () => {
    const row = (value: string, bads: number, deltaGini: number, pHolm: number): SegmentRow => ({
      column: 'region',
      value,
      n: bads * 10,
      goods: bads * 9,
      bads,
      championGini: 0.5,
      challengerGini: 0.5 + deltaGini,
      deltaGini,
      giniSe: 0.02,
      p: pHolm / 3,
      pTwoSided: pHolm / 3,
      giniCi: [deltaGini - 0.04, deltaGini + 0.04],
      pHolm,
      tooFewBads: bads < 30,
      flags: [],
      note: null,
    });
    // ΔGini −11.1 on 870 bads with Holm p 2e-7 (the region); a small value worse but with 12 bads.
    const rows = [row('north', 870, -0.111, 2e-7), row('south', 900, 0.06, 0.001), row('islands', 12, -0.2, 0.001)];
    const result = verdict({ ...strong, segments: rows }, defaultAdoptionPolicy);
    expect(result.outcome).toBe('not-proven');
    const criterion = result.criteria.find((c) => c.id === 'segments')!;
    expect(criterion).toMatchObject({ met: false, label: 'No segment value significantly worse' });
    expect(criterion.detail).toBe(
      'significantly worse in region = north (ΔGini −11.1 points, Holm-adjusted p = 2.0 × 10⁻⁷) (Holm-adjusted two-sided DeLong test, α = 0.05); 1 value with fewer than 30 bads left out',
    );
    expect(result.summary).toContain('; it is significantly worse in region = north (ΔGini −11.1 points, Holm-adjusted p = 2.0 × 10⁻⁷).');
    // Not worse once the value's Holm p is above α.
    const fine = verdict({ ...strong, segments: [row('north', 870, -0.111, 0.2)] }, defaultAdoptionPolicy);
    expect(fine.criteria.find((c) => c.id === 'segments')!.met).toBe(true);
    // A policy version from before the rule (segmentRule off) does not check it.
    expect(verdict({ ...strong, segments: rows }, { ...defaultAdoptionPolicy, segmentRule: { enabled: false, minBads: 30 } }).outcome).toBe('supported');
  });

  it("says the approval rate is the policy's, and the run's own rate when it differs", () => {
    const at55 = { ...strong, swap: swap(0.55, [700, 20], [700, 40]) };
    const result = verdict(at55, defaultAdoptionPolicy, swap(0.7, [812, 25], [812, 52]));
    expect(result.summary).toContain("at the policy's 70% approval rate it swaps in 812 accounts");
    expect(result.summary).toContain("(the run's own swap sets are at 55%)");
    expect(verdict(strong, defaultAdoptionPolicy).summary).not.toContain("run's own");
  });
});
