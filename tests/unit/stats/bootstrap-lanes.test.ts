import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { bootstrap } from '@server/stats/bootstrap';
import { blockTotalsPay, withChallengerBlocks } from '@server/stats/bootstrap-blocks';
import type { BootstrapPlan } from '@server/stats/bootstrap-kernel';
import { lanesModule, rangeScratch, runReplicateRange } from '@server/stats/bootstrap-lanes';
import { planBootstrap } from '@server/stats/bootstrap-plan';
import { scoreBlocks, weighBlocks } from '@server/stats/order';

/**
 * The WebAssembly kernel (four replicates at a time, wasm/bootstrap-lanes.ts) against the
 * TypeScript kernel, replicate by replicate: the same counts and the same AUC and KS, to the bit
 * (issue 20). Holdouts: continuous scores (cells of one account; the challenger cell by cell),
 * points (cells of up to 255 accounts, Poisson(64) chunks; the challenger by block totals), and
 * PD-like scores rounded to three decimals (many cells per block).
 */
function holdout(n: number, seed: string, kind: 'continuous' | 'points' | 'rounded') {
  const random = seedrandom(seed);
  const bad = new Uint8Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const risk = random();
    bad[i] = random() < 0.05 + 0.3 * risk ? 1 : 0;
    const x = 1 - risk + 0.3 * random();
    const y = 1 - risk + 0.25 * random();
    if (kind === 'points') {
      a[i] = Math.round(6 * x);
      b[i] = Math.round(8 * y);
    } else if (kind === 'rounded') {
      a[i] = Number(x.toFixed(3));
      b[i] = Number(y.toFixed(3));
    } else {
      a[i] = x;
      b[i] = y;
    }
  }
  const champion = scoreBlocks(a, bad);
  const challenger = scoreBlocks(b, bad);
  return { bad, plan: planBootstrap(champion, challenger, bad), a: champion, b: challenger };
}

function runBoth(plan: BootstrapPlan, seed: number, from: number, to: number) {
  const run = (lanes: boolean) => {
    const length = to - from;
    const out = { aucChampion: new Float64Array(length), aucChallenger: new Float64Array(length), ksChampion: new Float64Array(length), ksChallenger: new Float64Array(length) };
    const counts: number[][] = [];
    const scratch = rangeScratch(plan, lanes ? lanesModule() : null);
    expect(scratch.lanes !== null).toBe(lanes);
    runReplicateRange(plan, seed, from, to, out, from, scratch, (r, c) => {
      counts[r - from] = [...c];
    });
    return { out, counts };
  };
  return { lanes: run(true), plain: run(false) };
}

describe('the bootstrap on WebAssembly lanes', () => {
  it('is compiled by the install (npm test builds it too)', () => {
    expect(lanesModule()).not.toBeNull();
  });

  it.each([
    ['continuous', 'cells'],
    ['points', 'block totals'],
    ['rounded', 'block totals'],
  ] as const)('draws the counts and gives the AUC and KS of the TypeScript kernel, replicate by replicate (%s scores, challenger by %s)', (kind, layout) => {
    const { plan } = holdout(kind === 'points' ? 30_000 : 12_000, `lanes-${kind}`, kind);
    const pays = blockTotalsPay(plan);
    expect(pays).toBe(layout === 'block totals');
    const used = pays ? withChallengerBlocks(plan) : plan;
    if (kind === 'points') expect(used.size.includes(255)).toBe(true);
    // 4 … 25: five groups of four and two left over, which run in TypeScript.
    const { lanes, plain } = runBoth(used, 17, 4, 26);
    expect(lanes.counts).toEqual(plain.counts);
    expect(lanes.out).toEqual(plain.out);
    // Both layouts of the challenger, on the lanes, agree too.
    const other = pays ? plan : withChallengerBlocks(plan);
    expect(runBoth(other, 17, 4, 26).lanes.out).toEqual(lanes.out);
  });

  it.each([
    ['weights by outcome', (bad: Uint8Array) => Float64Array.from(bad, (b) => (b ? 1 : 4))],
    ['weights 1–4 at random', (bad: Uint8Array, random: () => number) => Float64Array.from(bad, () => 1 + Math.floor(random() * 4))],
    ['fractional weights', (bad: Uint8Array, random: () => number) => Float64Array.from(bad, () => [0.25, 1.5, 2.75, 3.1, 0.3][Math.floor(random() * 5)])],
    ['a fractional weight per row', (bad: Uint8Array, random: () => number) => Float64Array.from(bad, () => 0.5 + random() * 3)],
  ] as const)('gives the weighted AUC and KS of the TypeScript kernel, replicate by replicate, to the bit (%s)', (_, weighting) => {
    for (const kind of ['continuous', 'points'] as const) {
      const { bad, a, b } = holdout(6000, `lanes-weights-${kind}`, kind);
      const weight = weighting(bad, seedrandom(`weights-${kind}`));
      const plan = planBootstrap(weighBlocks(a, weight), weighBlocks(b, weight), bad, weight);
      expect(blockTotalsPay(plan)).toBe(false);
      const { lanes, plain } = runBoth(plan, 5, 0, 14);
      expect(lanes.counts).toEqual(plain.counts);
      expect(lanes.out).toEqual(plain.out);
    }
  });

  it('gives the same replicates on threads and in this thread, with and without the lanes', async () => {
    const { bad, a, b } = holdout(8000, 'lanes-threads', 'rounded');
    const settings = { replicates: 50, seed: 3, confidence: 0.95 };
    const plain = await bootstrap(a, b, bad, { ...settings, threads: 0, lanes: false });
    for (const threads of [0, 2]) {
      const result = await bootstrap(a, b, bad, { ...settings, threads });
      expect(result.replicates).toEqual(plain.replicates);
    }
  });
});
