import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { wilsonInterval } from '@server/stats/wilson';
import { relativeError } from './policy-fixtures';

// tests/reference/policy/proportions.json, written by tests/reference/policy/proportions.R:
// R 4.2.2 prop.test(x, n, correct = FALSE, conf.level)$conf.int (15 significant digits printed).
const reference = JSON.parse(readFileSync('tests/reference/policy/proportions.json', 'utf8')) as {
  wilson: { x: number; n: number; confidence: number; lower: number; upper: number }[];
};

describe('wilsonInterval', () => {
  it.each(reference.wilson)('matches R prop.test for x = $x, n = $n at $confidence', ({ x, n, confidence, lower, upper }) => {
    const ci = wilsonInterval(x, n, confidence);
    expect(ci).not.toBeNull();
    // Tolerance: 1e-8 relative. R prints 15 digits and the formula is exact; the slack is for the
    // normal quantile, which comes from normal.ts (its precision is tested there). Measured with
    // the transitional jstat quantile: below 1e-12.
    expect(relativeError(ci![0], lower)).toBeLessThan(1e-8);
    expect(relativeError(ci![1], upper)).toBeLessThan(1e-8);
  });

  it('is exactly 0 at the bottom when there are no events and exactly 1 at the top when all are events', () => {
    // R prop.test sets these ends exactly (see proportions.json: x = 0 → lower 0; x = n → upper 1).
    expect(wilsonInterval(0, 37, 0.95)![0]).toBe(0);
    expect(wilsonInterval(37, 37, 0.95)![1]).toBe(1);
  });

  it('returns null for an empty group instead of NaN', () => {
    expect(wilsonInterval(0, 0, 0.95)).toBeNull();
  });

  it('rejects counts that are not a proportion', () => {
    expect(() => wilsonInterval(5, 3, 0.95)).toThrow(/0 ≤ x ≤ n/);
    expect(() => wilsonInterval(1.5, 3, 0.95)).toThrow(/integers/);
    expect(() => wilsonInterval(1, 3, 1)).toThrow(/confidence/);
  });

  it('always holds the observed rate and stays inside [0, 1], widening with the confidence', () => {
    // Property of the Wilson interval (Wilson 1927): the centre is pulled towards 1/2 but the
    // interval always covers x / n.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 100000 }), fc.double({ min: 0, max: 1, noNaN: true }), (n, u) => {
        const x = Math.floor(u * n);
        const narrow = wilsonInterval(x, n, 0.9)!;
        const wide = wilsonInterval(x, n, 0.99)!;
        const p = x / n;
        return (
          narrow[0] >= 0 && narrow[1] <= 1 && narrow[0] <= p + 1e-15 && narrow[1] >= p - 1e-15 &&
          wide[0] <= narrow[0] + 1e-15 && wide[1] >= narrow[1] - 1e-15
        );
      }),
    );
  });
});
