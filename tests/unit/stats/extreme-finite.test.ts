import { describe, expect, it } from 'vitest';
import { pearson } from '@server/stats/data-quality';

/**
 * Finite scores at the edge of the double range give finite statistics. The regression case is the
 * reader property test's seed 959281728, path "15": one score of 1.7976931348623151e+308 made
 * dataQuality.scoreCorrelation.pearson NaN. Expected values: the correlation is unchanged by
 * scaling a series (a property of the definition), so each extreme case is compared with the same
 * data scaled into ordinary numbers.
 */

describe('pearson at the edge of the double range', () => {
  const base = [1, 2, 3, 4, 5, 6, 7, 8];
  const other = [2, 1, 4, 3, 6, 5, 8, 9];
  const plain = pearson(Float64Array.from(base), Float64Array.from(other))!;

  it('is finite and equal to the unscaled value for scores near ±1.8e308 (seed 959281728, path "15")', () => {
    for (const factor of [1.7976931348623151e308 / 8, -1.7976931348623151e308 / 8, 1e300]) {
      const scaled = pearson(Float64Array.from(base, (v) => v * factor), Float64Array.from(other))!;
      expect(Number.isFinite(scaled), String(factor)).toBe(true);
      expect(Math.abs(scaled - Math.sign(factor) * plain)).toBeLessThan(1e-12);
    }
    // One extreme score among ordinary ones, as the property test found.
    const one = Float64Array.from(base);
    one[3] = 1.7976931348623151e308;
    expect(Number.isFinite(pearson(one, Float64Array.from(other)))).toBe(true);
  });

  it('is finite for denormals and −0', () => {
    const tiny = pearson(Float64Array.from(base, (v) => v * 5e-324 * 1e3), Float64Array.from(other))!;
    expect(Number.isFinite(tiny)).toBe(true);
    const zeros = Float64Array.from(base, (v, i) => (i === 0 ? -0 : v));
    expect(Number.isFinite(pearson(zeros, Float64Array.from(other))!)).toBe(true);
  });
});
