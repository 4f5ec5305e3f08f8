import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fisherExactTwoSided } from '@server/stats/fisher-exact';
import { relativeError } from './policy-fixtures';

type Table = { a: number; b: number; c: number; d: number; p: number };
// R 4.2.2 fisher.test(matrix(c(a, c, b, d), 2))$p.value — tests/reference/policy/proportions.R.
const fromR = (JSON.parse(readFileSync('tests/reference/policy/proportions.json', 'utf8')) as { fisher: Table[] }).fisher;
// scipy 1.10.1 fisher_exact([[a, b], [c, d]])[1] — tests/reference/policy/fisher_scipy.py.
const fromScipy = (JSON.parse(readFileSync('tests/reference/policy/fisher-scipy.json', 'utf8')) as { fisher: Table[] }).fisher;

describe('fisherExactTwoSided', () => {
  it.each(fromR)('matches R fisher.test for [[$a, $b], [$c, $d]]', ({ a, b, c, d, p }) => {
    // Tolerance: 1e-9 relative (R prints 15 digits; R and scipy themselves differ by up to 2e-11
    // on the 100,000-row tables).
    expect(relativeError(fisherExactTwoSided(a, b, c, d), p)).toBeLessThan(1e-9);
  });

  it.each(fromScipy)('matches scipy.stats.fisher_exact for [[$a, $b], [$c, $d]]', ({ a, b, c, d, p }) => {
    expect(relativeError(fisherExactTwoSided(a, b, c, d), p)).toBeLessThan(1e-9);
  });

  it('gives the tea-tasting p-value of Fisher (1935)', () => {
    // Fisher's lady tasting tea, table [[3, 1], [1, 3]]: two-sided p = 34/70 = 0.4857142857
    // (computed by hand: (1 + 16 + 16 + 1) / 70; also R fisher.test above). Tolerance 1e-14.
    expect(fisherExactTwoSided(3, 1, 1, 3)).toBeCloseTo(34 / 70, 14);
  });

  it('stays finite and positive at very large counts', () => {
    // No reference value: checks the log-space sums neither overflow nor underflow to NaN.
    const p = fisherExactTwoSided(200000, 2000000, 260000, 1940000);
    expect(p).toBeGreaterThanOrEqual(0);
    expect(Number.isNaN(p)).toBe(false);
    const q = fisherExactTwoSided(150000, 1850000, 150100, 1849900);
    expect(q).toBeGreaterThan(0.5);
    expect(q).toBeLessThanOrEqual(1);
  });

  it('does not depend on which row or column comes first', () => {
    // The two-sided test is symmetric in rows and columns (its support and probabilities are).
    fc.assert(
      fc.property(fc.nat(30), fc.nat(30), fc.nat(30), fc.nat(30), (a, b, c, d) => {
        const p = fisherExactTwoSided(a, b, c, d);
        const others = [fisherExactTwoSided(c, d, a, b), fisherExactTwoSided(b, a, d, c), fisherExactTwoSided(a, c, b, d)];
        return p > 0 && p <= 1 && others.every((q) => Math.abs(q - p) <= 1e-12 * p);
      }),
    );
  });

  it('rejects counts that are not non-negative integers', () => {
    expect(() => fisherExactTwoSided(-1, 2, 3, 4)).toThrow(/non-negative integer/);
  });
});
