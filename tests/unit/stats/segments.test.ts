import { beforeAll, describe, expect, it } from 'vitest';
import type { Holdout } from '@server/stats/holdout';
import { holm } from '@server/stats/holm';
import { safety, scoreBlocks } from '@server/stats/order';
import { defaultAdoptionPolicy } from '@shared/policy';
import { segments } from '@server/stats/segments';
import { cases, loadCase, proc } from './reference-fixtures';

const relative = (value: number, truth: number) => Math.abs(value - truth) / Math.abs(truth);

const TOO_FEW_BADS = defaultAdoptionPolicy.segmentRule.minBads;

function segmentRows(holdout: Holdout) {
  const championSafety = safety(holdout.champion, holdout.higherIs.champion);
  const challengerSafety = safety(holdout.challenger, holdout.higherIs.challenger);
  return segments(holdout, {
    champion: scoreBlocks(championSafety, holdout.bad),
    challenger: scoreBlocks(challengerSafety, holdout.bad),
    policy: defaultAdoptionPolicy,
    confidence: 0.95,
  });
}

describe('holm', () => {
  it("matches R's p.adjust(method = \"holm\") on a vector with ties and a cap at 1", () => {
    // proc.json: p.adjust(c(0.01, 0.04, 0.03, 0.04, 0.2, 0.5), "holm") = 0.06 0.16 0.15 0.16 0.4 0.5
    const { input, adjusted } = (proc as unknown as { holm: { input: number[]; adjusted: number[] } }).holm;
    holm(input).forEach((p, i) => expect(p).toBeCloseTo(adjusted[i], 14));
    expect(holm([0.9, 0.8])).toEqual([1, 1]);
  });

  it('leaves untested rows out of the count', () => {
    // computed by hand: m = 2 → 2·0.01 = 0.02, max(0.02, 1·0.3) = 0.3
    expect(holm([0.01, null, 0.3])).toEqual([0.02, null, 0.3]);
  });
});

describe('segments', () => {
  const referenceCase = cases.find((c) => c.segment)!;
  const expected = proc.cases[referenceCase.file].segments!;
  let holdout: Holdout;
  beforeAll(async () => {
    holdout = await loadCase(referenceCase);
  });

  it('agrees with pROC within each segment (two-sided p and interval) and with p.adjust across them', () => {
    // proc.json: paired roc.test per segment value (two-sided p, ΔAUC interval); Holm by p.adjust
    // over the two-sided segment p-values. The one-sided p in the policy's direction could never
    // show harm (issue 13): the segment p is two-sided now.
    {
      const rows = segmentRows(holdout);
      expect(rows.map((row) => row.value)).toEqual(expected.map((segment) => segment.value));
      rows.forEach((row, i) => {
        const segment = expected[i] as (typeof expected)[number] & { pOneSidedHolm: number; pTwoSidedHolm: number };
        expect(row.n).toBe(segment.n);
        expect(row.bads).toBe(segment.bads);
        expect(Math.abs(row.championGini! - (2 * segment.champion.auc - 1))).toBeLessThan(2e-9);
        expect(Math.abs(row.challengerGini! - (2 * segment.challenger.auc - 1))).toBeLessThan(2e-9);
        expect(relative(row.giniSe!, (2 * (segment.challenger.auc - segment.champion.auc)) / segment.z)).toBeLessThan(1e-10);
        expect(relative(row.p!, segment.pTwoSided)).toBeLessThan(1e-12);
        expect(row.pTwoSided).toBe(row.p);
        expect(relative(row.pHolm!, segment.pTwoSidedHolm)).toBeLessThan(1e-12);
        // ΔGini interval = 2 × pROC's ΔAUC interval (ci of roc.test, Δ ± qnorm(0.975)·se)
        expect(relative(row.giniCi![0], 2 * segment.ciLower)).toBeLessThan(1e-10);
        expect(relative(row.giniCi![1], 2 * segment.ciUpper)).toBeLessThan(1e-10);
        expect(row.tooFewBads).toBe(segment.bads < TOO_FEW_BADS);
        // significantly worse: Holm-adjusted two-sided p < 0.05 with ΔGini < 0 (from pROC's numbers)
        const worse = segment.bads >= TOO_FEW_BADS && segment.pTwoSidedHolm < defaultAdoptionPolicy.alpha && segment.z < 0;
        expect(row.flags.includes('significantly-worse')).toBe(worse);
      });
    }
  });

  it('explains a segment with one class and flags one with few bads', () => {
    const n = 200;
    const bad = new Uint8Array(n);
    const codes = new Uint32Array(n);
    const champion = new Float64Array(n);
    const challenger = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      codes[i] = i < 50 ? 1 : 0; // level "a" (code 1): rows 0–49, all good; level "b" (code 0): the rest
      bad[i] = i >= 50 && i % 7 === 0 ? 1 : 0;
      champion[i] = (i * 37) % 101;
      challenger[i] = (i * 53) % 103;
    }
    const rows = segmentRows(
      { n, bad, champion, challenger, higherIs: { champion: 'safer', challenger: 'safer' }, exposure: null, ids: null, segments: [{ column: 'channel', levels: ['b', 'a'], codes }] },
    );
    expect(rows.map((row) => row.value)).toEqual(['a', 'b']);
    expect(rows[0]).toMatchObject({ n: 50, goods: 50, bads: 0, championGini: null, p: null, pHolm: null, tooFewBads: true, flags: [], note: 'only goods in this segment: Gini undefined' });
    expect(rows[1].bads).toBe(21);
    expect(rows[1].tooFewBads).toBe(true);
    expect(rows[1].p).not.toBeNull();
    expect(rows[1].pHolm).toBe(rows[1].p); // one test only: Holm leaves it as is
  });

  it('flags a value significantly worse when the challenger is worse there, even under a one-sided policy', () => {
    // The reference case's "branch" value: pROC z = −4.48, two-sided p = 7.4e-6, Holm 2.2e-5 (proc.json).
    const rows = segmentRows(holdout);
    const branch = rows.find((row) => row.value === 'branch')!;
    expect(branch.deltaGini!).toBeLessThan(0);
    expect(branch.flags).toContain('significantly-worse');
    expect(branch.pHolm!).toBeLessThan(0.05);
  });

  it('gives a segment with a single bad no test, no interval and a reason', () => {
    const n = 40;
    const bad = new Uint8Array(n);
    bad[3] = 1;
    bad[20] = 1;
    bad[30] = 1;
    const codes = new Uint32Array(n);
    for (let i = 0; i < n; i++) codes[i] = i < 20 ? 0 : 1; // level a: rows 0–19, one bad; level b: two bads
    const score = Float64Array.from({ length: n }, (_, i) => (i * 7) % 11);
    const rows = segments(
      { n, bad, champion: score, challenger: score.map((v) => 10 - v), higherIs: { champion: 'safer', challenger: 'safer' }, exposure: null, ids: null, segments: [{ column: 'c', levels: ['a', 'b'], codes }] },
      { champion: scoreBlocks(safety(score, 'safer'), bad), challenger: scoreBlocks(safety(score.map((v) => 10 - v), 'safer'), bad), policy: defaultAdoptionPolicy, confidence: 0.95 },
    );
    expect(rows[0]).toMatchObject({ bads: 1, p: null, pTwoSided: null, giniCi: null, giniSe: null, pHolm: null, flags: [] });
    expect(rows[0].note).toMatch(/only 1 bad: a variance needs at least 2 goods and 2 bads/);
    expect(rows[0].deltaGini).not.toBeNull();
    expect(rows[1].p).not.toBeNull();
  });
});
