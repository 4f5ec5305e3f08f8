import { describe, expect, it } from 'vitest';
import { defaultAdoptionPolicy } from '@shared/policy';
import type { Holdout } from '@server/stats/holdout';
import { preparePolicyData } from '@server/stats/policy-data';
import { buildReport } from '@server/stats/report';
import { swapSets } from '@server/stats/swap-sets';

// Applicants without an outcome and reject inference, on a holdout small enough to count by hand.
// Ten rows; champion and challenger in points (higher = safer); rows 8–10 have no outcome.
//   row        1   2   3   4   5   6   7   8   9   10
//   champion  90  80  70  60  50  40  30  20  15  10
//   challenger 85 75  65  55  45  35  25  95  12   8
//   bad        0   0   0   1   0   1   1   ?   ?   ?
//   weight     2   2   2   1   2   1   1   3   1   1
const holdout: Holdout = {
  n: 10,
  bad: Uint8Array.from([0, 0, 0, 1, 0, 1, 1, 0, 0, 0]),
  champion: Float64Array.from([90, 80, 70, 60, 50, 40, 30, 20, 15, 10]),
  challenger: Float64Array.from([85, 75, 65, 55, 45, 35, 25, 95, 12, 8]),
  higherIs: { champion: 'safer', challenger: 'safer' },
  exposure: null,
  ids: null,
  segments: [],
  weight: Float64Array.from([2, 2, 2, 1, 2, 1, 1, 3, 1, 1]),
  known: Uint8Array.from([1, 1, 1, 1, 1, 1, 1, 0, 0, 0]),
  inferredBad: Float64Array.from([NaN, NaN, NaN, NaN, NaN, NaN, NaN, 0.4, 0.6, 0.9]),
};
// Cut-offs: champion accepts ≥ 30 (rows 1–7), challenger ≥ 25 plus row 8 (95): swap-in = row 8
// (3 accounts, unknown), swap-out = none; both reject = rows 9, 10.
const cutoffs = { basis: 'cutoffs' as const, cutoffs: { champion: 30, challenger: 25 } };

describe('swap cells with applicants without an outcome', () => {
  it('counts accounts, known, unknown, bounds, in weights; bad rates of known accounts only', () => {
    const data = preparePolicyData(holdout, { bands: 2 });
    const swap = swapSets(data, cutoffs, 0.95);
    expect(swap.swapIn).toMatchObject({ count: 1, accounts: 3, known: 0, unknown: 3, bads: 0, badRate: null, badRateCi: null, badRateBounds: [0, 1], inferred: null });
    expect(swap.bothAccept).toMatchObject({ count: 7, accounts: 11, known: 11, unknown: 0, bads: 3, badRate: 3 / 11 });
    expect(swap.bothAccept.badRateBounds).toEqual([3 / 11, 3 / 11]);
    expect(swap.bothReject).toMatchObject({ count: 2, accounts: 2, unknown: 2, badRateBounds: [0, 1] });
    expect(swap.bothAccept.share).toBe(11 / 16);
    // approval in accounts: champion accepts 11 of 16, challenger 14 of 16
    expect(swap.champion.approvalRate).toBe(11 / 16);
    expect(swap.challenger.approvalRate).toBe(14 / 16);
  });

  it('infers by column: the unknown rows\u2019 probabilities, weighted', () => {
    const data = preparePolicyData(holdout, { bands: 2, inference: { method: 'column', parcelFactor: 1 } });
    const swap = swapSets(data, cutoffs, 0.95);
    expect(swap.swapIn.inferred).toEqual({ method: 'column', bads: 3 * 0.4, badRate: (3 * 0.4) / 3 });
    expect(swap.bothReject.inferred!.bads).toBeCloseTo(0.6 + 0.9, 15);
  });

  it('infers by parcel: K times the known bad rate of the champion band, nearest band with known rows', () => {
    // Two champion bands by accounts over all rows (policy-data.ts); the unknown rows 8–10 are the
    // riskiest, so their band is band 1, whose known rows are counted here.
    const data = preparePolicyData(holdout, { bands: 2, inference: { method: 'parcel', parcelFactor: 1.5 } });
    const band = data.champion.band;
    // The band of the unknown rows and its known bad rate, counted here by hand.
    let knownW = 0;
    let badW = 0;
    for (let i = 0; i < 7; i++) {
      if (band[i] === band[7]) {
        knownW += holdout.weight![i];
        badW += holdout.bad[i] * holdout.weight![i];
      }
    }
    expect(knownW).toBeGreaterThan(0);
    const swap = swapSets(data, cutoffs, 0.95);
    expect(swap.swapIn.inferred!.bads).toBeCloseTo(3 * Math.min(1, (1.5 * badW) / knownW), 14);
  });
});

describe('the report with applicants without an outcome', () => {
  it('AUC and KS on the known rows, population and approval on every row', async () => {
    const report = await buildReport({
      holdout,
      input: { fileName: 'x.csv', sha256: 'x', bytes: 1 },
      mapping: { outcome: 'bad', badValue: '1', champion: 'champion', challenger: 'challenger', higherIs: { champion: 'safer', challenger: 'safer' }, weight: 'w', keepUnknown: true, inferredBad: 'pb' },
      settings: { bootstrap: 50, cutoffs: { champion: 30, challenger: 25 }, rejectInference: { method: 'column', parcelFactor: 1 } },
      policy: { ...defaultAdoptionPolicy, swapRule: { enabled: true, approvalRate: 0.7, worstCase: true } },
      threads: 0,
    });
    expect(report.rows).toBe(7);
    expect(report.bads).toBe(3);
    expect(report.badRate).toBe(3 / 11);
    expect(report.population).toEqual({ rows: 10, accounts: 16, known: { rows: 7, accounts: 11, goods: 8, bads: 3 }, unknown: { rows: 3, accounts: 5 } });
    // Champion on the known rows: every good is safer than every bad except row 5 (50) vs row 4 (60).
    // Weighted pairs: goods 1,2,3 (w 2 each) beat all bads; good 5 (w 2) beats bads 6, 7 (w 1 each), not 4.
    const wins = 6 * 3 + 2 * 2;
    expect(report.champion.auc).toBeCloseTo(wins / (8 * 3), 15);
    expect(report.settings.rejectInference).toEqual({ method: 'column', parcelFactor: 1 });
    const criterion = report.verdict.criteria.find((c) => c.id === 'swap-bad-rate')!;
    expect(criterion.label).toContain('inferred-bad column');
    expect(criterion.label).toContain('worst case');
  });
});
