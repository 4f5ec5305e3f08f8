import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { pairedDelong } from '@server/stats/delong';
import { safety, scoreBlocks } from '@server/stats/order';
import { StatisticError } from '@server/stats/statistic-error';

const blocks = (scores: number[], bad: number[], higherIs: 'safer' | 'riskier' = 'safer') =>
  scoreBlocks(safety(Float64Array.from(scores), higherIs), Uint8Array.from(bad));

function run(champion: number[], challenger: number[], bad: number[], confidence = 0.95) {
  return pairedDelong(blocks(champion, bad), blocks(challenger, bad), Uint8Array.from(bad), confidence);
}

function finiteEverywhere(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (value === null) return true;
  if (Array.isArray(value)) return value.every(finiteEverywhere);
  if (typeof value === 'object') return Object.values(value as object).every(finiteEverywhere);
  return true;
}

const pairedArbitrary = fc
  .array(fc.tuple(fc.integer({ min: 0, max: 6 }), fc.integer({ min: 0, max: 6 }), fc.boolean()), { minLength: 4, maxLength: 80 })
  .filter((rows) => rows.filter(([, , b]) => b).length >= 2 && rows.filter(([, , b]) => !b).length >= 2);

describe('paired DeLong', () => {
  it('gives Δ = 0, se = 0, z = 0, p = 1 (one-sided 0.5) for identical models', () => {
    // docs/design.md: identical models → Δ = 0, se = 0 → z = 0, p = 1; one-sided P(Z > 0) = 0.5.
    const scores = [1, 2, 2, 3, 5, 8, 8, 9];
    const bad = [1, 1, 0, 1, 0, 0, 1, 0];
    const result = run(scores, scores, bad);
    expect(result.difference).toMatchObject({ auc: 0, gini: 0, se: 0, z: 0, pTwoSided: 1, pOneSided: 0.5 });
    expect(result.difference.aucCi).toEqual([0, 0]);
    expect(result.difference.correlation).toBeCloseTo(1, 12);
  });

  it('treats a PD model and its points twin (same ranking, opposite orientation) as identical', () => {
    const points = [600, 640, 580, 700, 610, 555];
    const pd = points.map((p) => 1 / (1 + Math.exp((p - 600) / 30)));
    const bad = [1, 0, 1, 0, 0, 1];
    const result = pairedDelong(blocks(points, bad, 'safer'), blocks(pd, bad, 'riskier'), Uint8Array.from(bad), 0.95);
    expect(result.difference.z).toBe(0);
    expect(result.difference.pTwoSided).toBe(1);
  });

  it('negates Δ and z, and keeps se, when the models are swapped', () => {
    fc.assert(
      fc.property(pairedArbitrary, (rows) => {
        const a = rows.map(([x]) => x);
        const b = rows.map(([, y]) => y);
        const bad = rows.map(([, , flag]) => (flag ? 1 : 0));
        const forward = run(a, b, bad).difference;
        const backward = run(b, a, bad).difference;
        expect(backward.auc + forward.auc).toBe(0);
        expect(Math.abs(backward.se! - forward.se!)).toBeLessThanOrEqual(1e-15);
        expect(Math.abs(backward.z! + forward.z!)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(forward.z!)));
        expect(Math.abs(backward.pTwoSided! - forward.pTwoSided!)).toBeLessThan(1e-12);
        expect(Math.abs(backward.pOneSided! + forward.pOneSided! - 1)).toBeLessThan(1e-12);
      }),
    );
  });

  it('never gives NaN or an infinity, even for constant scores, a single bad or perfect separation', () => {
    fc.assert(
      fc.property(pairedArbitrary, (rows) => {
        const bad = rows.map(([, , flag]) => (flag ? 1 : 0));
        expect(finiteEverywhere(run(rows.map(([x]) => x), rows.map(([, y]) => y), bad))).toBe(true);
      }),
    );
    // constant champion, constant challenger
    expect(finiteEverywhere(run([5, 5, 5, 5], [5, 5, 5, 5], [0, 1, 0, 1]))).toBe(true);
    // perfect separation against constant scores: se = 0 with Δ ≠ 0
    const perfect = run([5, 5, 5, 5], [1, 2, 3, 4], [1, 1, 0, 0]);
    expect(perfect.difference.auc).toBe(0.5);
    expect(perfect.difference.se).toBe(0);
    expect(perfect.difference.pTwoSided).toBe(0);
    expect(perfect.difference.pOneSided).toBe(0);
    expect(finiteEverywhere(perfect)).toBe(true);
  });

  it('gives no variance, test or interval with fewer than 2 bads or 2 goods, and says why', () => {
    // A sample variance needs two observations (issue 13: one bad used to give z = 1.8e308).
    const single = run([1, 2, 3, 4, 5], [2, 1, 3, 5, 4], [1, 0, 0, 0, 0]);
    expect(single.difference).toMatchObject({ se: null, giniSe: null, z: null, pTwoSided: null, pOneSided: null, aucCi: null, giniCi: null });
    expect(single.champion).toMatchObject({ variance: null, aucSe: null, aucCi: null, giniCi: null });
    expect(single.difference.inference).toBe('only 1 bad: a variance needs at least 2 goods and 2 bads, so there is no standard error, test or interval');
    // the AUCs are still given: champion ranks the bad lowest (AUC 1), challenger second lowest (0.75)
    expect(single.champion.auc).toBe(1);
    expect(single.challenger.auc).toBe(0.75);
    const oneGood = run([1, 2, 3, 4], [2, 1, 3, 4], [1, 1, 1, 0]);
    expect(oneGood.difference.inference).toMatch(/^only 1 good:/);
    expect(oneGood.difference.pTwoSided).toBeNull();
    expect(run([1, 2, 3, 4], [2, 1, 4, 3], [1, 1, 0, 0]).difference.inference).toBeNull();
  });

  it('uses the confidence level for every interval', () => {
    const champion = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
    const challenger = [2, 1, 4, 3, 6, 5, 8, 7, 12, 11, 9, 10];
    const bad = [1, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 0];
    const at95 = run(champion, challenger, bad, 0.95);
    const at99 = run(champion, challenger, bad, 0.99);
    // half-widths scale with qnorm(0.975) = 1.959963984540054 and qnorm(0.995) = 2.5758293035489 (R)
    const width = (r: typeof at95) => r.difference.aucCi![1] - r.difference.aucCi![0];
    expect(width(at99) / width(at95)).toBeCloseTo(2.5758293035489 / 1.959963984540054, 12);
    expect(at95.difference.giniCi![0]).toBeCloseTo(2 * at95.difference.aucCi![0], 15);
  });

  it('clamps the AUC interval to [0, 1]', () => {
    const result = run([1, 2, 3, 4], [1, 2, 4, 3], [1, 1, 0, 0]);
    expect(result.champion.auc).toBe(1);
    expect(result.champion.aucCi![1]).toBeLessThanOrEqual(1);
    expect(result.challenger.aucCi![1]).toBeLessThanOrEqual(1);
  });

  it('refuses models scored on different accounts or a single class', () => {
    expect(() => pairedDelong(blocks([1, 2, 3], [0, 1, 0]), blocks([1, 2], [0, 1]), Uint8Array.from([0, 1, 0]), 0.95)).toThrow(StatisticError);
    expect(() => run([1, 2], [2, 1], [0, 0])).toThrow('auc requires at least one good and one bad');
  });
});
