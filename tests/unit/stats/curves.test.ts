import { curvesSchema } from '@shared/report';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { curves } from '@server/stats/curves';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

describe('curves', () => {
  it('takes one point after each block of equal scores, computed by hand', () => {
    // Champion 1 (bad), 2 (bad), 2 (good), 3 (good); challenger the same as PDs 0.3, 0.2, 0.2, 0.1.
    const data = preparePolicyData(
      makeHoldout({ champion: [1, 2, 2, 3], challenger: [0.3, 0.2, 0.2, 0.1], bad: [1, 1, 0, 0], higherIs: { champion: 'safer', challenger: 'riskier' } }),
      { bands: 2 },
    );
    const result = curves(data);
    expect(curvesSchema.parse(result)).toEqual(result);
    const roc = [
      { x: 0, y: 0 },
      { x: 0, y: 0.5 },
      { x: 0.5, y: 1 },
      { x: 1, y: 1 },
    ];
    expect(result.roc.champion).toEqual(roc);
    expect(result.roc.challenger).toEqual(roc);
    expect(result.cap.champion).toEqual([
      { x: 0, y: 0 },
      { x: 0.25, y: 0.5 },
      { x: 0.75, y: 1 },
      { x: 1, y: 1 },
    ]);
    expect(result.ks.champion).toEqual([
      { score: 1, cumBad: 0.5, cumGood: 0 },
      { score: 2, cumBad: 1, cumGood: 0.5 },
      { score: 3, cumBad: 1, cumGood: 1 },
    ]);
    expect(result.ks.challenger.map((p) => p.score)).toEqual([0.3, 0.2, 0.1]);
  });

  it('downsamples to at most 500 points on evenly spaced x, keeping the ends and the KS point', () => {
    const random = seedrandom('curves');
    const n = 20000;
    const champion: number[] = [];
    const challenger: number[] = [];
    const bad: number[] = [];
    for (let i = 0; i < n; i++) {
      const latent = random() * 4 - 2;
      bad.push(random() < 1 / (1 + Math.exp(1.5 + 1.5 * latent)) ? 1 : 0);
      champion.push(latent + random());
      challenger.push(Math.round((latent + random() * 0.5) * 100) / 100);
    }
    const data = preparePolicyData(makeHoldout({ champion, challenger, bad }), { bands: 10 });
    const result = curves(data);
    for (const model of ['champion', 'challenger'] as const) {
      // The widest single block, in each curve's x: a gap can be one grid step plus one block.
      const m = data[model];
      let widestGoods = 0;
      let widestAccounts = 0;
      let start = 0;
      for (const end of m.blockEnds) {
        const blockBads = m.badsBefore[end] - m.badsBefore[start];
        widestGoods = Math.max(widestGoods, (end - start - blockBads) / data.goods);
        widestAccounts = Math.max(widestAccounts, (end - start) / n);
        start = end;
      }
      for (const [points, widest] of [
        [result.roc[model], widestGoods],
        [result.cap[model], widestAccounts],
      ] as const) {
        expect(points.length).toBeLessThanOrEqual(500);
        expect(points.length).toBeGreaterThan(400);
        expect(points[0]).toEqual({ x: 0, y: 0 });
        expect(points.at(-1)).toEqual({ x: 1, y: 1 });
        for (let i = 1; i < points.length; i++) {
          expect(points[i].x).toBeGreaterThanOrEqual(points[i - 1].x);
          expect(points[i].y).toBeGreaterThanOrEqual(points[i - 1].y);
          // Evenly spaced x: no gap wider than one grid step (1/498) plus the widest block.
          expect(points[i].x - points[i - 1].x).toBeLessThanOrEqual(1 / 498 + widest + 1e-12);
        }
      }
      // The KS point: the largest cumBad − cumGood over every block (computed directly here).
      const model_ = data[model];
      let ks = 0;
      for (const end of model_.blockEnds) {
        const cumBad = model_.badsBefore[end];
        ks = Math.max(ks, cumBad / data.bads - (end - cumBad) / data.goods);
      }
      const ksPoints = result.ks[model];
      expect(ksPoints.length).toBeLessThanOrEqual(500);
      expect(Math.max(...ksPoints.map((p) => p.cumBad - p.cumGood))).toBe(ks);
      expect(Math.max(...result.roc[model].map((p) => p.y - p.x))).toBe(ks);
      expect(ksPoints.at(-1)).toMatchObject({ cumBad: 1, cumGood: 1 });
    }
  });

  it('is the diagonal for a constant score', () => {
    const result = curves(preparePolicyData(makeHoldout({ champion: [4, 4, 4], challenger: [1, 2, 3], bad: [1, 0, 0] }), { bands: 2 }));
    expect(result.roc.champion).toEqual([
      { x: 0, y: 0 },
      { x: 1, y: 1 },
    ]);
    expect(result.ks.champion).toEqual([{ score: 4, cumBad: 1, cumGood: 1 }]);
  });

  it('requires both outcomes', () => {
    expect(() => curves(preparePolicyData(makeHoldout({ champion: [1, 2], challenger: [1, 2], bad: [1, 1] }), { bands: 2 }))).toThrow(/one good and one bad/);
  });
});
