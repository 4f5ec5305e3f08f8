import fc from 'fast-check';
import { swapMatrixSchema } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { bandTable } from '@server/stats/bands';
import { preparePolicyData } from '@server/stats/policy-data';
import { swapMatrix } from '@server/stats/swap-matrix';
import { makeHoldout } from './policy-fixtures';

describe('swapMatrix', () => {
  it('cross-tabulates champion and challenger bands, riskiest first, computed by hand', () => {
    // Six accounts, two bands each. Champion (safer) 1…6 → band 1 = accounts 1–3, band 2 = 4–6.
    // Challenger PDs (riskier) → band 1 (riskiest: 0.9, 0.8, 0.7) = accounts 2, 3, 5.
    const data = preparePolicyData(
      makeHoldout({
        champion: [1, 2, 3, 4, 5, 6],
        challenger: [0.1, 0.9, 0.8, 0.2, 0.7, 0.3],
        bad: [1, 1, 0, 0, 1, 0],
        higherIs: { champion: 'safer', challenger: 'riskier' },
      }),
      { bands: 2 },
    );
    const matrix = swapMatrix(data);
    expect(swapMatrixSchema.parse(matrix)).toEqual(matrix);
    expect(matrix.championBands).toEqual([
      { band: 1, scoreMin: 1, scoreMax: 3 },
      { band: 2, scoreMin: 4, scoreMax: 6 },
    ]);
    expect(matrix.challengerBands).toEqual([
      { band: 1, scoreMin: 0.7, scoreMax: 0.9 },
      { band: 2, scoreMin: 0.1, scoreMax: 0.3 },
    ]);
    // Champion band 1 (1, 2, 3) × challenger band 1 (2, 3, 5) = {2, 3}: 1 bad. Band 1 × 2 = {1}: bad.
    // Band 2 (4, 5, 6) × 1 = {5}: bad. Band 2 × 2 = {4, 6}: no bad.
    expect(matrix.cells).toEqual([
      [
        { count: 2, bads: 1, badRate: 0.5 },
        { count: 1, bads: 1, badRate: 1 },
      ],
      [
        { count: 1, bads: 1, badRate: 1 },
        { count: 2, bads: 0, badRate: 0 },
      ],
    ]);
  });

  it('has one row for a constant model, and null bad rates in empty cells', () => {
    const data = preparePolicyData(makeHoldout({ champion: [7, 7, 7, 7], challenger: [1, 2, 3, 4], bad: [1, 0, 1, 0] }), { bands: 4 });
    const matrix = swapMatrix(data);
    expect(matrix.bands).toBe(4);
    expect(matrix.championBands).toEqual([{ band: 1, scoreMin: 7, scoreMax: 7 }]);
    expect(matrix.cells).toHaveLength(1);
    expect(matrix.cells[0]).toHaveLength(4);
    const sparse = swapMatrix(preparePolicyData(makeHoldout({ champion: [1, 2], challenger: [1, 2], bad: [1, 0] }), { bands: 2 }));
    expect(sparse.cells[0][1]).toEqual({ count: 0, bads: 0, badRate: null });
  });

  it('has margins equal to each model’s band table', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: 0, max: 20 }), fc.integer({ min: 0, max: 20 })), { minLength: 2, maxLength: 80 }), (pairs) => {
        const bad = pairs.map((_, i) => (i === 0 ? 1 : i === 1 ? 0 : (pairs[i][0] + i) % 2));
        const data = preparePolicyData(makeHoldout({ champion: pairs.map((p) => p[0]), challenger: pairs.map((p) => p[1]), bad }), { bands: 5 });
        const matrix = swapMatrix(data);
        const rowSums = matrix.cells.map((row) => row.reduce((s, c) => s + c.count, 0));
        const columnSums = matrix.cells[0].map((_, j) => matrix.cells.reduce((s, row) => s + row[j].count, 0));
        expect(rowSums).toEqual(bandTable(data, 'champion').rows.map((r) => r.count));
        expect(columnSums).toEqual(bandTable(data, 'challenger').rows.map((r) => r.count));
      }),
    );
  });
});
