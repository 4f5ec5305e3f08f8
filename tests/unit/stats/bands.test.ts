import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { bandTableSchema, type HigherIs } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { bandTable } from '@server/stats/bands';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

// tests/reference/policy/bands_sklearn.py → bands-sklearn.json: band numbers assigned with numpy
// by the documented rule, and scikit-learn 1.2.1 roc_auc_score(good, band) → 2·AUC − 1.
const reference = JSON.parse(readFileSync('tests/reference/policy/bands-sklearn.json', 'utf8')) as {
  cases: {
    name: string;
    higherIs: HigherIs;
    bands: number;
    scores: number[];
    bad: number[];
    rows: { band: number; count: number; bads: number; scoreMin: number; scoreMax: number }[];
    giniOnBands: number;
  }[];
};

describe('bandTable', () => {
  it.each(reference.cases)('matches the numpy bands and the scikit-learn Gini on band numbers: $name', (c) => {
    const data = preparePolicyData(makeHoldout({ champion: c.scores, challenger: c.scores, bad: c.bad, higherIs: { champion: c.higherIs, challenger: c.higherIs } }), { bands: c.bands });
    const table = bandTable(data, 'champion');
    expect(bandTableSchema.parse(table)).toEqual(table);
    // Band membership exact (counts, bads, score ranges).
    expect(table.rows.map(({ band, count, bads, scoreMin, scoreMax }) => ({ band, count, bads, scoreMin, scoreMax }))).toEqual(c.rows);
    // Trapezoid Gini = 2·AUC − 1 on band numbers with ties ½ (Engelmann, Hayden & Tasche 2003);
    // tolerance 1e-12 absolute.
    expect(Math.abs(table.giniTrapezoid - c.giniOnBands)).toBeLessThan(1e-12);
  });

  it('fills every column of a small table, computed by hand', () => {
    // Eight accounts, B = 4, distinct scores: two per band. Scores 1…8 (higher = safer),
    // bads at 1, 2, 3, 6.
    const data = preparePolicyData(makeHoldout({ champion: [1, 2, 3, 4, 5, 6, 7, 8], challenger: [1, 2, 3, 4, 5, 6, 7, 8], bad: [1, 1, 1, 0, 0, 1, 0, 0] }), { bands: 4 });
    const table = bandTable(data, 'champion');
    expect(table.rows).toEqual([
      { band: 1, scoreMin: 1, scoreMax: 2, count: 2, goods: 0, bads: 2, badRate: 1, cumBadShare: 0.5, cumGoodShare: 0, ks: 0.5, odds: 0 },
      { band: 2, scoreMin: 3, scoreMax: 4, count: 2, goods: 1, bads: 1, badRate: 0.5, cumBadShare: 0.75, cumGoodShare: 0.25, ks: 0.5, odds: 1 },
      { band: 3, scoreMin: 5, scoreMax: 6, count: 2, goods: 1, bads: 1, badRate: 0.5, cumBadShare: 1, cumGoodShare: 0.5, ks: 0.5, odds: 1 },
      { band: 4, scoreMin: 7, scoreMax: 8, count: 2, goods: 2, bads: 0, badRate: 0, cumBadShare: 1, cumGoodShare: 1, ks: 0, odds: null },
    ]);
    // 1 − Σ (B_i − B_{i−1})(G_i + G_{i−1}) = 1 − [0.5·0 + 0.25·0.25 + 0.25·0.75 + 0·1.5] = 0.75 (by hand).
    expect(table.giniTrapezoid).toBeCloseTo(0.75, 15);
  });

  it('reports PD bands riskiest (highest PD) first with ranges in the model’s own units', () => {
    const data = preparePolicyData(
      makeHoldout({ champion: [1, 2, 3, 4], challenger: [0.4, 0.3, 0.2, 0.1], bad: [1, 0, 1, 0], higherIs: { champion: 'safer', challenger: 'riskier' } }),
      { bands: 2 },
    );
    expect(bandTable(data, 'challenger').rows.map((r) => [r.scoreMin, r.scoreMax])).toEqual([
      [0.3, 0.4],
      [0.1, 0.2],
    ]);
  });

  it('gives one band and a Gini of 0 for a constant score', () => {
    const data = preparePolicyData(makeHoldout({ champion: [3, 3, 3, 3], challenger: [1, 2, 3, 4], bad: [1, 0, 0, 1] }), { bands: 10 });
    const table = bandTable(data, 'champion');
    expect(table.rows).toHaveLength(1);
    expect(table.giniTrapezoid).toBe(0);
    expect(table.rows[0]).toMatchObject({ count: 4, ks: 0, cumBadShare: 1, cumGoodShare: 1, odds: 1 });
  });

  it('requires both outcomes', () => {
    const data = preparePolicyData(makeHoldout({ champion: [1, 2], challenger: [1, 2], bad: [0, 0] }), { bands: 2 });
    expect(() => bandTable(data, 'champion')).toThrow('band table requires at least one good and one bad');
  });

  it('never splits a score value between bands, and bands run riskiest to safest', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 15 }), { minLength: 2, maxLength: 120 }), fc.integer({ min: 2, max: 12 }), (scores, bands) => {
        const bad = scores.map((s, i) => (i === 0 ? 1 : i === 1 ? 0 : s % 3 === 0 ? 1 : 0));
        const data = preparePolicyData(makeHoldout({ champion: scores, challenger: scores, bad }), { bands });
        const table = bandTable(data, 'champion');
        for (let r = 1; r < table.rows.length; r++) {
          if (!(table.rows[r].scoreMin > table.rows[r - 1].scoreMax)) return false;
        }
        return table.rows.length <= bands && table.rows.reduce((s, r) => s + r.count, 0) === scores.length;
      }),
    );
  });
});
