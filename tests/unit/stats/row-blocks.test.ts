import fc from 'fast-check';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { rawMidranks, spearman, pearson } from '@server/stats/data-quality';
import { delongCovariance } from '@server/stats/delong-covariance';
import { pairedDelong, placements, placementsReference } from '@server/stats/delong';
import { duplicateIds, duplicateIdsReference, repeatedHashes } from '@server/stats/duplicate-ids';
import type { Holdout } from '@server/stats/holdout';
import { argsortAscending, decimalKeys, rowBlocks, safety, scoreBlocks, scoreBlocksReference, weighBlocks } from '@server/stats/order';
import { preparePolicyData } from '@server/stats/policy-data';
import { rankOnTwoThreads } from '@server/stats/rank';
import { segments, segmentsReference } from '@server/stats/segments';
import { defaultAdoptionPolicy } from '@shared/policy';

/**
 * The fast paths of the analysis stages against their plain references: the keyed sort (scores on
 * a decimal grid) and each row's block number (rowBlocks), and what reads it — DeLong placements
 * and covariance, segments, Spearman, the policy data's bands — plus the duplicate-id hashes.
 * Every number must be the same to the bit (toEqual compares with Object.is: −0 ≠ +0).
 */

/** A seeded holdout: scores with `decimals` decimals (PDs, higher = riskier) or points, segments with empty and one-class levels. */
function holdoutOf(seed: string, n: number, decimals: number | 'points', levels = 5): Holdout {
  const random = seedrandom(seed);
  const score = () => {
    if (decimals === 'points') return Math.round(500 + 100 * (random() - random()));
    return Number(random().toFixed(decimals));
  };
  const bad = Uint8Array.from({ length: n }, () => (random() < 0.2 ? 1 : 0));
  const champion = Float64Array.from({ length: n }, score);
  const challenger = Float64Array.from({ length: n }, (_, i) => (random() < 0.3 ? champion[i] : score()));
  // Level 0 empty; the last level has goods only; the rest at random.
  const codes = Uint32Array.from({ length: n }, (_, i) => (bad[i] ? 1 + Math.floor(random() * (levels - 2)) : 1 + Math.floor(random() * (levels - 1))));
  const higherIs = decimals === 'points' ? 'safer' : 'riskier';
  return {
    n,
    bad,
    champion,
    challenger,
    higherIs: { champion: higherIs, challenger: higherIs },
    exposure: null,
    ids: null,
    segments: [{ column: 'region', levels: Array.from({ length: levels }, (_, k) => `r${k}`), codes }],
  };
}

function blocksOf(holdout: Holdout) {
  return {
    champion: scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad),
    challenger: scoreBlocks(safety(holdout.challenger, holdout.higherIs.challenger), holdout.bad),
  };
}

/** rowBlocks the plain way: each block's rows in sorted order. */
function rowBlocksByOrder(blocks: { order: Uint32Array; start: Uint32Array; count: number }): Uint32Array {
  const out = new Uint32Array(blocks.order.length);
  for (let k = 0; k < blocks.count; k++) for (let at = blocks.start[k]; at < blocks.start[k + 1]; at++) out[blocks.order[at]] = k;
  return out;
}

describe('the keyed sort (scores on a decimal grid)', () => {
  it('gives the radix sort’s blocks, and each row’s block number', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 9 }),
        fc.array(fc.tuple(fc.integer({ min: -3_000_000, max: 3_000_000 }), fc.boolean()), { maxLength: 400 }),
        (decimals, rows) => {
          const values = Float64Array.from(rows.map(([k]) => k / 10 ** decimals));
          const bad = Uint8Array.from(rows.map(([, b]) => (b ? 1 : 0)));
          const keyed = scoreBlocks(values, bad);
          expect(keyed).toEqual(scoreBlocksReference(values, bad));
          expect(rowBlocks(keyed)).toEqual(rowBlocksByOrder(keyed));
          expect(argsortAscending(values)).toEqual(keyed.order);
        },
      ),
      { numRuns: 100 },
    );
  });

  it('takes six-decimal PDs, −0 with +0, and two radix passes beyond 2^16 blocks', () => {
    const random = seedrandom('keys');
    const pd = Float64Array.from({ length: 600_000 }, () => -Number(random().toFixed(6)));
    pd[3] = -0;
    pd[4] = 0;
    expect(decimalKeys(pd)).toMatchObject({ scale: 1e6 });
    const bad = Uint8Array.from({ length: pd.length }, () => (random() < 0.1 ? 1 : 0));
    const keyed = scoreBlocks(pd, bad);
    expect(keyed.count).toBeGreaterThan(1 << 16);
    // Byte for byte (toEqual on arrays this long is slow).
    const reference = scoreBlocksReference(pd, bad);
    const bytes = (array: ArrayBufferView) => Buffer.from(array.buffer, array.byteOffset, array.byteLength);
    for (const field of ['order', 'sortedBad', 'start', 'value', 'goods', 'bads'] as const) expect(bytes(keyed[field]).equals(bytes(reference[field]))).toBe(true);
    expect([keyed.count, keyed.nGood, keyed.nBad]).toEqual([reference.count, reference.nGood, reference.nBad]);
    expect(bytes(rowBlocks(keyed)).equals(bytes(rowBlocksByOrder(keyed)))).toBe(true);
    // Off the grid, or too wide a range: no keys (the radix sort).
    expect(decimalKeys(Float64Array.from([0.1, 1 / 3]))).toBeNull();
    expect(decimalKeys(Float64Array.from([0, 1e300]))).toBeNull();
    expect(decimalKeys(Float64Array.from([0.5, Infinity]))).toBeNull();
  });

  it('shares its row blocks with the weighed blocks, and makes them for blocks of a given order', () => {
    const holdout = holdoutOf('weighed', 3000, 2);
    const values = safety(holdout.champion, 'riskier');
    const keyed = scoreBlocks(values, holdout.bad);
    const weighed = weighBlocks(keyed, Float64Array.from({ length: holdout.n }, (_, i) => 1 + (i % 3)));
    expect(rowBlocks(weighed)).toBe(rowBlocks(keyed));
    const ordered = scoreBlocks(values, holdout.bad, keyed.order);
    expect([...rowBlocks(ordered)]).toEqual([...rowBlocks(keyed)]);
  });
});

describe('ranking on two threads', () => {
  it('gives the blocks and row blocks of ranking on this thread (keyed and radix sorts)', async () => {
    for (const decimals of [6, 'points'] as const) {
      const holdout = holdoutOf(`threads-${decimals}`, 20_000, decimals);
      const champion = safety(holdout.champion, holdout.higherIs.champion);
      // The challenger off any grid: the radix sort in the worker.
      const challenger = Float64Array.from(holdout.challenger, (v, i) => v + i * 1e-12);
      const here = [scoreBlocks(champion, holdout.bad), scoreBlocks(challenger, holdout.bad)];
      const copy = Float64Array.from(challenger);
      const ranked = await rankOnTwoThreads(champion, challenger, holdout.bad, false);
      expect(ranked.champion).toEqual(here[0]);
      expect(ranked.challenger).toEqual(here[1]);
      expect(rowBlocks(ranked.challenger)).toEqual(rowBlocksByOrder(here[1]));
      expect(ranked.challengerValues).toBe(challenger);
      // Lent: the scores come back on their buffer, the same values.
      const lent = await rankOnTwoThreads(champion, challenger, holdout.bad, true);
      expect(challenger.length).toBe(0);
      expect(lent.challengerValues).toEqual(copy);
      expect(lent.challenger).toEqual(here[1]);
    }
  });
});

describe('DeLong from the row blocks', () => {
  it('places every account as the sorted-order pass does, weighted or not', () => {
    for (const decimals of [3, 6, 'points'] as const) {
      const holdout = holdoutOf(`placements-${decimals}`, 5000, decimals);
      const { champion } = blocksOf(holdout);
      expect(placements(champion, holdout.n, holdout.bad)).toEqual(placementsReference(champion, holdout.n));
      const weighed = weighBlocks(champion, Float64Array.from({ length: holdout.n }, (_, i) => 0.5 + (i % 7) / 3));
      expect(placements(weighed, holdout.n, holdout.bad)).toEqual(placementsReference(weighed, holdout.n));
    }
  });

  it('gives the covariance whose pair sums are the paired test’s to the bit', () => {
    const holdout = holdoutOf('covariance', 8000, 4);
    const { champion, challenger } = blocksOf(holdout);
    const all = delongCovariance([champion, challenger], holdout.bad);
    const paired = pairedDelong(champion, challenger, holdout.bad, 0.95);
    expect(all.covariance[0][0]).toBe(paired.difference.varianceChampion);
    expect(all.covariance[1][1]).toBe(paired.difference.varianceChallenger);
    expect(all.covariance[0][1]).toBe(paired.difference.covariance);
    expect(paired.difference.se).toBe(Math.sqrt(all.differenceVariance[0][1]));
  });
});

describe('segments from the row blocks', () => {
  it('equal the plain path’s rows (empty and one-class levels, few bads, ties)', () => {
    for (const [seed, n, decimals] of [
      ['a', 4000, 6],
      ['b', 20_000, 2],
      ['c', 3000, 'points'],
      ['d', 60, 1],
      ['e', 12, 'points'],
    ] as const) {
      const holdout = holdoutOf(seed, n, decimals);
      const options = { ...blocksOf(holdout), policy: defaultAdoptionPolicy, confidence: 0.95 };
      const fast = segments(holdout, options);
      expect(fast).toEqual(segmentsReference(holdout, options));
      expect(fast.some((row) => row.note === 'no accounts')).toBe(true);
    }
  });
});

describe('Spearman from the row blocks', () => {
  it('equals Pearson of the midranks written in sorted order', () => {
    for (const decimals of [6, 1, 'points'] as const) {
      const holdout = holdoutOf(`spearman-${decimals}`, 6000, decimals);
      const blocks = blocksOf(holdout);
      const given = { champion: safety(holdout.champion, holdout.higherIs.champion), challenger: safety(holdout.challenger, holdout.higherIs.challenger) };
      const data = preparePolicyData(holdout, { bands: 10, blocks, safety: given });
      const plain = pearson(rawMidranks(data.champion), rawMidranks(data.challenger));
      expect(spearman(data.champion, data.challenger, blocks)).toBe(plain);
      expect(spearman(data.champion, data.challenger)).toBe(plain);
      // The bands looked up by block equal those written in sorted order (preparePolicyData without blocks).
      const sorted = preparePolicyData(holdout, { bands: 10 });
      expect(data.champion.band).toEqual(sorted.champion.band);
      expect(data.challenger.band).toEqual(sorted.challenger.band);
    }
  });
});

describe('repeated hashes', () => {
  it('are the values that occur more than once', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.integer({ min: 0, max: 40 }), fc.integer({ min: 0, max: 2 ** 52 - 1 })), { maxLength: 300 }), (list) => {
        const counts = new Map<number, number>();
        for (const v of list) counts.set(v, (counts.get(v) ?? 0) + 1);
        const expected = [...counts].filter(([, c]) => c > 1).map(([v]) => v).sort((a, b) => a - b);
        expect([...repeatedHashes(Float64Array.from(list))].sort((a, b) => a - b)).toEqual(expected);
      }),
    );
    const ids = Array.from({ length: 50_000 }, (_, i) => `ID${i % 40_000}`);
    expect(duplicateIds(ids)).toBe(duplicateIdsReference(ids));
  });
});
