import { beforeAll, describe, expect, it } from 'vitest';
import type { Holdout } from '@server/stats/holdout';
import { holm } from '@server/stats/holm';
import { safety, scoreBlocks } from '@server/stats/order';
import { segments, TOO_FEW_BADS } from '@server/stats/segments';
import { cases, loadCase, proc } from './reference-fixtures';

const relative = (value: number, truth: number) => Math.abs(value - truth) / Math.abs(truth);

function segmentRows(holdout: Holdout, sided: 'one-sided' | 'two-sided') {
  const championSafety = safety(holdout.champion, holdout.higherIs.champion);
  const challengerSafety = safety(holdout.challenger, holdout.higherIs.challenger);
  return segments(holdout, {
    champion: scoreBlocks(championSafety, holdout.bad),
    challenger: scoreBlocks(challengerSafety, holdout.bad),
    sided,
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

  it('agrees with pROC within each segment and with p.adjust across them', () => {
    // proc.json: paired roc.test per segment value; Holm by p.adjust over the segment p-values.
    // se, p and Holm p to 1e-10 relative (measured ≤ 4.8e-14).
    for (const sided of ['one-sided', 'two-sided'] as const) {
      const rows = segmentRows(holdout, sided);
      expect(rows.map((row) => row.value)).toEqual(expected.map((segment) => segment.value));
      rows.forEach((row, i) => {
        const segment = expected[i] as (typeof expected)[number] & { pOneSidedHolm: number; pTwoSidedHolm: number };
        expect(row.n).toBe(segment.n);
        expect(row.bads).toBe(segment.bads);
        expect(Math.abs(row.championGini! - (2 * segment.champion.auc - 1))).toBeLessThan(2e-9);
        expect(Math.abs(row.challengerGini! - (2 * segment.challenger.auc - 1))).toBeLessThan(2e-9);
        expect(relative(row.giniSe!, (2 * (segment.challenger.auc - segment.champion.auc)) / segment.z)).toBeLessThan(1e-10);
        const p = sided === 'one-sided' ? segment.pOneSided : segment.pTwoSided;
        const pHolm = sided === 'one-sided' ? segment.pOneSidedHolm : segment.pTwoSidedHolm;
        expect(relative(row.p!, p)).toBeLessThan(1e-10);
        expect(relative(row.pHolm!, pHolm)).toBeLessThan(1e-10);
        expect(row.tooFewBads).toBe(segment.bads < TOO_FEW_BADS);
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
      'one-sided',
    );
    expect(rows.map((row) => row.value)).toEqual(['a', 'b']);
    expect(rows[0]).toMatchObject({ n: 50, goods: 50, bads: 0, championGini: null, p: null, pHolm: null, tooFewBads: true, note: 'only goods in this segment: Gini undefined' });
    expect(rows[1].bads).toBe(21);
    expect(rows[1].tooFewBads).toBe(true);
    expect(rows[1].p).not.toBeNull();
    expect(rows[1].pHolm).toBe(rows[1].p); // one test only: Holm leaves it as is
  });
});
