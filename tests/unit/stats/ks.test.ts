import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ks } from '@server/stats/ks';
import { safety, scoreBlocks } from '@server/stats/order';

const run = (scores: number[], bad: number[], higherIs: 'safer' | 'riskier' = 'safer') =>
  ks(scoreBlocks(safety(Float64Array.from(scores), higherIs), Uint8Array.from(bad)), higherIs);

describe('ks', () => {
  it('takes each block of equal scores whole', () => {
    // computed by hand: bads at 1, 2, 2; goods at 2, 3. After score 1: 1/3 − 0; after 2 (whole
    // block): 3/3 − 1/2 = 0.5; splitting the block would wrongly reach 2/3 after the two bads.
    expect(run([1, 2, 2, 2, 3], [1, 1, 1, 0, 0])).toEqual({ ks: 0.5, score: 2 });
  });

  it('is 1 for perfect separation and 0 for constant scores', () => {
    expect(run([1, 2, 3, 4], [1, 1, 0, 0])).toEqual({ ks: 1, score: 2 });
    expect(run([5, 5, 5], [1, 0, 0]).ks).toBe(0);
  });

  it('reports the location in the model own units for PD-like scores', () => {
    // PD 0.9, 0.8 bad; 0.2, 0.1 good: the split "PD ≥ 0.8 declined" separates perfectly.
    expect(run([0.9, 0.8, 0.2, 0.1], [1, 1, 0, 0], 'riskier')).toEqual({ ks: 1, score: 0.8 });
  });

  it('does not depend on the orientation (the statistic) and keeps the block as location', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: -4, max: 4 }), fc.boolean()), { minLength: 2, maxLength: 50 }).filter(
          (rows) => rows.some(([, b]) => b) && rows.some(([, b]) => !b),
        ),
        (rows) => {
          const scores = rows.map(([s]) => s);
          const bad = rows.map(([, b]) => (b ? 1 : 0));
          const up = run(scores, bad, 'safer');
          const down = run(scores, bad, 'riskier');
          expect(down.ks).toBe(up.ks);
          expect(up.ks).toBeGreaterThanOrEqual(0);
          expect(up.ks).toBeLessThanOrEqual(1);
          expect(scores).toContain(up.score);
        },
      ),
    );
  });

  it('refuses one class', () => {
    expect(() => run([1, 2], [0, 0])).toThrow('ks requires at least one good and one bad');
  });
});
