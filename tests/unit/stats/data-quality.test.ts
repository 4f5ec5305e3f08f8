import { readFileSync } from 'node:fs';
import { dataQualitySchema } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { dataQuality } from '@server/stats/data-quality';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

const read = (rowsRead: number) => ({ rowsRead, rowsDroppedMissingScore: 0, missingByColumn: { bad: 0, champion: 0, challenger: 0 } });

// tests/reference/policy/correlation_scipy.py → correlation-scipy.json (scipy 1.10.1 pearsonr, spearmanr).
const reference = JSON.parse(readFileSync('tests/reference/policy/correlation-scipy.json', 'utf8')) as {
  cases: { name: string; champion: number[]; challenger: number[]; pearson: number; spearman: number }[];
};

describe('dataQuality', () => {
  it.each(reference.cases)('matches scipy pearsonr and spearmanr of the scores as given: $name', (c) => {
    const bad = c.champion.map((_, i) => (i % 5 === 0 ? 1 : 0));
    const holdout = makeHoldout({ champion: c.champion, challenger: c.challenger, bad, higherIs: { champion: 'safer', challenger: 'riskier' } });
    const result = dataQuality(holdout, preparePolicyData(holdout, { bands: 10 }), read(c.champion.length));
    // Tolerance 1e-12 absolute.
    expect(Math.abs(result.scoreCorrelation.pearson! - c.pearson)).toBeLessThan(1e-12);
    expect(Math.abs(result.scoreCorrelation.spearman! - c.spearman)).toBeLessThan(1e-12);
  });

  it('summarises rows, scores and ids, computed by hand', () => {
    const holdout = makeHoldout({
      champion: [500, 520, 520, 610],
      challenger: [0.3, 0.2, 0.2, 0.1],
      bad: [1, 0, 1, 0],
      higherIs: { champion: 'safer', challenger: 'riskier' },
      ids: ['a', 'b', 'a', 'a'],
    });
    const result = dataQuality(holdout, preparePolicyData(holdout, { bands: 2 }), { rowsRead: 6, rowsDroppedMissingScore: 2, missingByColumn: { champion: 2, challenger: 0, bad: 0 } });
    expect(dataQualitySchema.parse(result)).toEqual(result);
    expect(result).toMatchObject({ rowsRead: 6, rowsUsed: 4, rowsDroppedMissingScore: 2, missingByColumn: { champion: 2 }, duplicateIds: 2 });
    expect(result.champion).toEqual({ min: 500, max: 610, mean: 537.5, distinct: 3 });
    expect(result.challenger).toMatchObject({ min: 0.1, max: 0.3, distinct: 3 });
    expect(result.challenger.mean).toBeCloseTo(0.2, 15); // 0.8 / 4 in floating point
    // The PD is an exact reversal of the points ranking: Spearman −1 (by hand).
    expect(result.scoreCorrelation.spearman).toBeCloseTo(-1, 14);
    expect(result.warnings).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^Only 2 bads/),
        expect.stringMatching(/^Only 2 goods/),
        expect.stringMatching(/^2 rows were left out/),
        expect.stringMatching(/champion score has only 3 distinct values/),
        expect.stringMatching(/^2 accounts repeat an earlier account id/),
      ]),
    );
  });

  it('warns when a score looks reversed, and not when it does not', () => {
    // Points where bads score higher than goods, declared higher = safer: AUC 0 (by hand).
    const reversed = makeHoldout({ champion: [9, 8, 7, 1, 2, 3], challenger: [1, 2, 3, 7, 8, 9], bad: [1, 1, 1, 0, 0, 0] });
    const warnings = dataQuality(reversed, preparePolicyData(reversed, { bands: 2 }), read(6)).warnings;
    expect(warnings).toContainEqual(expect.stringMatching(/champion's AUC is 0\.000 with higher = safer.*check the orientation/));
    expect(warnings.some((w) => w.includes("challenger's AUC"))).toBe(false);
  });

  it('gives null correlations and a warning for a constant score, and null duplicate ids without ids', () => {
    const holdout = makeHoldout({ champion: [0.1, 0.1, 0.1], challenger: [1, 2, 3], bad: [1, 0, 0] });
    const result = dataQuality(holdout, preparePolicyData(holdout, { bands: 2 }), read(3));
    expect(result.scoreCorrelation).toEqual({ pearson: null, spearman: null });
    expect(result.duplicateIds).toBeNull();
    expect(result.warnings).toContainEqual('The champion score is constant: it does not rank the accounts.');
  });

  it('notices identical models, one outcome only, and negative exposures', () => {
    const holdout = makeHoldout({ champion: [1, 2, 3], challenger: [1, 2, 3], bad: [0, 0, 0], exposure: [10, -5, 3] });
    const warnings = dataQuality(holdout, preparePolicyData(holdout, { bands: 2 }), read(3)).warnings;
    expect(warnings).toEqual(
      expect.arrayContaining([
        'The champion and challenger scores are identical on every account.',
        expect.stringMatching(/^Only one outcome is present/),
        '1 account has a negative exposure.',
      ]),
    );
  });
});
