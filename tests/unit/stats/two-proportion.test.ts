import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { twoProportionZ } from '@server/stats/two-proportion';
import { relativeError } from './policy-fixtures';

// tests/reference/policy/proportions.json, written by tests/reference/policy/proportions.R:
// R 4.2.2 prop.test(c(x1, x2), c(n1, n2), correct = FALSE): statistic = z², p.value two-sided.
const reference = JSON.parse(readFileSync('tests/reference/policy/proportions.json', 'utf8')) as {
  twoProportion: { x1: number; n1: number; x2: number; n2: number; statistic: number; p: number }[];
};

describe('twoProportionZ', () => {
  it.each(reference.twoProportion)('matches R prop.test for $x1/$n1 vs $x2/$n2', ({ x1, n1, x2, n2, statistic, p }) => {
    const result = twoProportionZ(x1, n1, x2, n2);
    // z² = R's statistic, 1e-12 relative; the sign of z is that of x1/n1 − x2/n2 (by hand).
    expect(relativeError(result.z * result.z, statistic)).toBeLessThan(1e-12);
    expect(Math.sign(result.z)).toBe(Math.sign(x1 / n1 - x2 / n2));
    // p: 1e-8 relative where R's p is above 1e-12 (all cases but 700/1000 vs 20/1000, p = 3.2e-220).
    // Tails are the normal distribution's precision (normal.ts and its own tests), not this test's
    // subject; the transitional jstat body underflows below about 1e-16.
    if (p > 1e-12) expect(relativeError(result.p, p)).toBeLessThan(1e-8);
  });

  it('gives z = 0 and p = 1 when both groups have the same rate', () => {
    // R prop.test(c(100, 100), c(1000, 1000), correct = FALSE): X-squared = 0, p-value = 1.
    expect(twoProportionZ(100, 1000, 100, 1000)).toEqual({ z: 0, p: 1 });
    // Pooled rate 0: the variance is 0; defined here as z = 0, p = 1 (computed by hand: 0/0 avoided).
    expect(twoProportionZ(0, 10, 0, 20)).toEqual({ z: 0, p: 1 });
  });

  it('negates z and keeps p when the groups are swapped', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5000 }), fc.integer({ min: 1, max: 5000 }), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (n1, n2, u1, u2) => {
        const x1 = Math.floor(u1 * n1);
        const x2 = Math.floor(u2 * n2);
        const ab = twoProportionZ(x1, n1, x2, n2);
        const ba = twoProportionZ(x2, n2, x1, n1);
        return ab.z === -ba.z || (ab.z === 0 && ba.z === 0) ? ab.p === ba.p : false;
      }),
    );
  });

  it('rejects an empty group', () => {
    expect(() => twoProportionZ(0, 0, 1, 3)).toThrow(/n ≥ 1/);
  });
});
