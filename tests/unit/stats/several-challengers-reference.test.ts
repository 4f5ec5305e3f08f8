import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { HigherIs } from '@shared/report';
import { chiSquareSf } from '@server/stats/chi-square';
import { pairedDelong } from '@server/stats/delong';
import { delongCovariance } from '@server/stats/delong-covariance';
import { jointDelongTest } from '@server/stats/joint-delong';
import { safety, scoreBlocks, type ScoreBlocks } from '@server/stats/order';
import { severalChallengers } from '@server/stats/several-challengers';
import { symmetricEigen } from '@server/stats/symmetric-eigen';

// Expected values: tests/reference/challengers/joint.json, printed by joint.R (R 4.2.2,
// pROC 1.18.0, MASS::ginv) on the CSVs written by generate.py (numpy PCG64, fixed seeds).
// Tolerances near the measured agreement: AUC 1e-12 absolute (measured ≤ 4.5e-16); covariance
// entries, χ², p, z, one- and two-sided p (Holm too) and intervals 1e-12 relative (measured
// ≤ 1.2e-13 over the four cases; the joint test's required bound is 1e-9).
const directory = new URL('../../reference/challengers/', import.meta.url);
const json = (name: string) => JSON.parse(readFileSync(new URL(name, directory), 'utf8'));
interface Test {
  z: number;
  pTwoSided: number;
  pOneSided: number;
  ciLower: number;
  ciUpper: number;
}
interface Expected {
  file: string;
  columns: string[];
  goods: number;
  bads: number;
  auc: number[];
  covariance: number[][];
  joint: { chi2: number; df: number; p: number };
  vsChampion: (Test & { pOneSidedHolm: number; pTwoSidedHolm: number })[];
  pairwise: (Test & { a: number; b: number })[];
}
const cases = json('cases.json') as { file: string; columns?: string[]; higherIs: HigherIs[] }[];
const expectedCases = Object.values((json('joint.json') as { cases: Record<string, Expected> }).cases);
const relative = (value: number, truth: number) => (truth === 0 ? Math.abs(value) : Math.abs(value - truth) / Math.abs(truth));

function load(file: string, columns: string[] | undefined, higherIs: HigherIs[]) {
  const [header, ...lines] = readFileSync(new URL(file, directory), 'utf8').trim().split('\n');
  const names = header.split(',');
  const wanted = columns ?? names.slice(1);
  const rows = lines.map((line) => line.split(',').map(Number));
  const bad = Uint8Array.from(rows, (row) => row[0]);
  const blocks = wanted.map((name, m) => {
    const at = names.indexOf(name);
    return scoreBlocks(safety(Float64Array.from(rows, (row) => row[at]), higherIs[m]), bad);
  });
  return { bad, blocks };
}

describe.each(cases.map((c, index) => ({ ...c, expected: expectedCases[index], label: `${c.file} ${(c.columns ?? []).join('+')}` })))(
  'several challengers, reference $label',
  ({ file, columns, higherIs, expected }) => {
    const { bad, blocks } = load(file, columns, higherIs);
    const [champion, ...challengers] = blocks as [ScoreBlocks, ...ScoreBlocks[]];

    it('reads the same accounts as R', () => {
      expect(expected.file).toBe(file);
      expect(champion.nGood).toBe(expected.goods);
      expect(champion.nBad).toBe(expected.bads);
    });

    it('agrees with pROC var() and cov() on every entry of the covariance matrix', () => {
      const result = delongCovariance(blocks, bad);
      result.auc.forEach((value, m) => expect(Math.abs(value - expected.auc[m])).toBeLessThan(1e-12));
      result.covariance.forEach((row, r) => row.forEach((value, s) => expect(relative(value, expected.covariance[r][s])).toBeLessThan(1e-12)));
    });

    it('agrees with the R contrast computation: χ², degrees of freedom and p of the joint test', () => {
      const { joint } = severalChallengers(champion, challengers, bad, 0.95);
      expect(joint).not.toBeNull();
      expect(joint!.df).toBe(expected.joint.df);
      expect(relative(joint!.chi2, expected.joint.chi2)).toBeLessThan(1e-12);
      expect(relative(joint!.p, expected.joint.p)).toBeLessThan(1e-12);
    });

    it('agrees with roc.test for each challenger against the champion, and with p.adjust(holm)', () => {
      const { vsChampion } = severalChallengers(champion, challengers, bad, 0.95);
      vsChampion.forEach(({ delong, pOneSidedHolm, pTwoSidedHolm }, k) => {
        const truth = expected.vsChampion[k];
        expect(relative(delong.difference.z!, truth.z)).toBeLessThan(1e-12);
        expect(relative(delong.difference.pTwoSided!, truth.pTwoSided)).toBeLessThan(1e-12);
        expect(relative(delong.difference.pOneSided!, truth.pOneSided)).toBeLessThan(1e-12);
        expect(relative(delong.difference.aucCi![0], truth.ciLower)).toBeLessThan(1e-12);
        expect(relative(delong.difference.aucCi![1], truth.ciUpper)).toBeLessThan(1e-12);
        expect(relative(pOneSidedHolm!, truth.pOneSidedHolm)).toBeLessThan(1e-12);
        expect(relative(pTwoSidedHolm!, truth.pTwoSidedHolm)).toBeLessThan(1e-12);
      });
    });

    it('agrees with roc.test for each pair of challengers', () => {
      const { pairwise } = severalChallengers(champion, challengers, bad, 0.95);
      expect(pairwise.map(({ a, b }) => [a + 1, b + 1])).toEqual(expected.pairwise.map(({ a, b }) => [a, b]));
      pairwise.forEach((pair, index) => {
        const truth = expected.pairwise[index];
        // The same model named twice (case 4): pROC and this give Δ = 0, z = 0, p = 1.
        expect(relative(pair.z!, truth.z)).toBeLessThan(1e-12);
        expect(relative(pair.pTwoSided!, truth.pTwoSided)).toBeLessThan(1e-12);
      });
    });
  },
);

describe('several challengers: one challenger is the two-model comparison', () => {
  it('gives the paired DeLong figures to the bit, and a joint χ² equal to z²', () => {
    const { file, higherIs } = cases[1];
    const { bad, blocks } = load(file, ['champion', 'c2'], [higherIs[0], higherIs[2]]);
    const two = pairedDelong(blocks[0], blocks[1], bad, 0.95);
    const several = severalChallengers(blocks[0], [blocks[1]], bad, 0.95);
    expect(several.vsChampion[0].delong).toEqual(two);
    expect(several.vsChampion[0].pOneSidedHolm).toBe(two.difference.pOneSided);
    expect(several.pairwise).toEqual([]);
    // With one contrast, χ² = Δ² / Var(Δ) = z², from V1 + V2 − 2C rather than the placement differences.
    expect(several.joint!.df).toBe(1);
    expect(relative(several.joint!.chi2, two.difference.z! ** 2)).toBeLessThan(1e-12);
    expect(relative(several.joint!.p, two.difference.pTwoSided!)).toBeLessThan(1e-8);
  });

  it('refuses more than five challengers and has no joint test with a single bad', () => {
    const bad = Uint8Array.from([1, 0, 0, 0, 0]);
    const block = scoreBlocks(Float64Array.from([1, 2, 3, 4, 5]), bad);
    expect(() => severalChallengers(block, Array(6).fill(block), bad, 0.95)).toThrow(/1 to 5 challengers/);
    const result = severalChallengers(block, [block, block], bad, 0.95);
    expect(result.joint).toBeNull();
    expect(result.inference).toMatch(/only 1 bad/);
  });
});

describe('the pieces of the joint test', () => {
  it('χ² upper tail agrees with R 4.2.2 pchisq(lower.tail = FALSE), far into the tail', () => {
    // Printed by R 4.2.2: options(digits = 17); pchisq(c(200, 3.841458820694124), c(5, 1), lower.tail = FALSE)
    // → 2.8406228986415315e-41 4.9999999999999975e-02
    expect(relative(chiSquareSf(200, 5), 2.8406228986415315e-41)).toBeLessThan(1e-12);
    expect(relative(chiSquareSf(3.841458820694124, 1), 4.9999999999999975e-2)).toBeLessThan(1e-12);
  });

  it('eigen-decomposition of a symmetric matrix reconstructs it', () => {
    const m = [
      [4, 1, 0.5],
      [1, 3, 0.25],
      [0.5, 0.25, 2],
    ];
    const { values, vectors } = symmetricEigen(m);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        const rebuilt = values.reduce((sum, value, k) => sum + value * vectors[k][i] * vectors[k][j], 0);
        expect(Math.abs(rebuilt - m[i][j])).toBeLessThan(1e-14);
      }
    }
  });

  it('a singular contrast covariance loses a degree of freedom instead of exploding', () => {
    const auc = [0.7, 0.75, 0.75];
    const s = [
      [1e-4, 8e-5, 8e-5],
      [8e-5, 1e-4, 1e-4],
      [8e-5, 1e-4, 1e-4],
    ];
    const result = jointDelongTest(auc, s)!;
    expect(result.df).toBe(1);
    // One contrast 0.05 with variance 1e-4 + 1e-4 − 2·8e-5 = 4e-5: χ² = 0.0025 / 4e-5 = 62.5.
    expect(relative(result.chi2, 62.5)).toBeLessThan(1e-12);
  });
});
