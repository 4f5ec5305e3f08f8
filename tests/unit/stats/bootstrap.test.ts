import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { bootstrap, histogram } from '@server/stats/bootstrap';
import { nextUint32, replicateScratch, replicateState, runReplicates } from '@server/stats/bootstrap-kernel';
import { planBootstrap } from '@server/stats/bootstrap-plan';
import { auc } from '@server/stats/auc';
import { ks } from '@server/stats/ks';
import { scoreBlocks } from '@server/stats/order';

/** A small seeded holdout: points with ties for the champion, continuous for the challenger. */
function holdout(n: number, seed: string) {
  const random = seedrandom(seed);
  const bad = new Uint8Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const risk = random();
    bad[i] = random() < 0.15 + 0.4 * risk ? 1 : 0;
    a[i] = Math.round(10 * (1 - risk) + 4 * random());
    b[i] = 1 - risk + 0.3 * random();
  }
  return { bad, a: scoreBlocks(a, bad), b: scoreBlocks(b, bad), rawA: a, rawB: b };
}

const binomial = (n: number, k: number) => {
  let value = 1;
  for (let i = 1; i <= k; i++) value = (value * (n - k + i)) / i;
  return value;
};

describe('bootstrap cell counts', () => {
  it('are exactly multinomial within each outcome (chi-square against the exact law)', () => {
    // Goods: three cells of sizes 1, 2, 3 (n_good = 6); bads: two cells of size 1.
    const scores = Float64Array.from([1, 2, 2, 3, 3, 3, 1, 2]);
    const bad = Uint8Array.from([0, 0, 0, 0, 0, 0, 1, 1]);
    const blocks = scoreBlocks(scores, bad);
    const plan = planBootstrap(blocks, blocks, bad);
    expect(plan.cells).toBe(5);
    const replicates = 30_000;
    const seen = new Map<string, number>();
    const out = { aucChampion: new Float64Array(replicates), aucChallenger: new Float64Array(replicates), ksChampion: new Float64Array(replicates), ksChallenger: new Float64Array(replicates) };
    const goodCells: number[] = [];
    for (let c = 0; c < plan.cells; c++) if (!(plan.flagsChampion[c] & 1)) goodCells.push(c);
    runReplicates(plan, 7, 0, replicates, out, 0, replicateScratch(plan), (_, counts) => {
      const key = goodCells.map((c) => counts[c]).join(',');
      seen.set(key, (seen.get(key) ?? 0) + 1);
    });
    // Multinomial(6; 1/6, 2/6, 3/6): P(x, y, z) = 6!/(x! y! z!) (1/6)^x (2/6)^y (3/6)^z.
    let chi = 0;
    let outcomes = 0;
    const sizes = goodCells.map((c) => plan.size[c]);
    for (let x = 0; x <= 6; x++) {
      for (let y = 0; x + y <= 6; y++) {
        const z = 6 - x - y;
        const p = binomial(6, x) * binomial(6 - x, y) * (sizes[0] / 6) ** x * (sizes[1] / 6) ** y * (sizes[2] / 6) ** z;
        const expected = p * replicates;
        const observed = seen.get(`${x},${y},${z}`) ?? 0;
        chi += (observed - expected) ** 2 / expected;
        outcomes++;
      }
    }
    expect(outcomes).toBe(28);
    // 0.999 quantile of chi-square with 27 degrees of freedom: 55.48 (R: qchisq(0.999, 27)).
    expect(chi).toBeLessThan(55.48);
    // Every replicate keeps n_good = 6 and n_bad = 2 (stratified).
    expect([...seen.keys()].every((key) => key.split(',').reduce((s, v) => s + Number(v), 0) === 6)).toBe(true);
  });

  it('keep the multinomial mean and variance for large combinations (split cells, Poisson(64) chunks)', () => {
    // One good combination of 600 accounts (split into cells of 255, 255 and 90) and one of 150;
    // 400 bads in one combination. Draws of the 600: Binomial(750, 0.8), mean 600, variance 120.
    // 4,000 replicates: the mean within 4 standard errors (4·√(120/4000) = 0.69), the variance
    // within 15%.
    const n = 1150;
    const scores = new Float64Array(n);
    const bad = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      scores[i] = i < 600 ? 2 : i < 750 ? 3 : 1;
      bad[i] = i >= 750 ? 1 : 0;
    }
    const blocks = scoreBlocks(scores, bad);
    const plan = planBootstrap(blocks, blocks, bad);
    expect([...plan.size]).toEqual([255, 145, 255, 255, 90, 150]);
    const big = [2, 3, 4]; // the cells of the 600-account combination, in champion order
    const replicates = 4000;
    const values: number[] = [];
    const out = { aucChampion: new Float64Array(replicates), aucChallenger: new Float64Array(replicates), ksChampion: new Float64Array(replicates), ksChallenger: new Float64Array(replicates) };
    runReplicates(plan, 3, 0, replicates, out, 0, replicateScratch(plan), (_, counts) => values.push(big.reduce((s, c) => s + counts[c], 0)));
    const mean = values.reduce((s, v) => s + v, 0) / replicates;
    const variance = values.reduce((s, v) => s + (v - mean) ** 2, 0) / (replicates - 1);
    expect(Math.abs(mean - 600)).toBeLessThan(0.69);
    expect(Math.abs(variance / 120 - 1)).toBeLessThan(0.15);
  });

  it('score each replicate exactly as AUC and KS of the resampled holdout would', () => {
    const { bad, a, b, rawA, rawB } = holdout(300, 'replicate-check');
    const plan = planBootstrap(a, b, bad);
    const replicates = 30;
    const out = { aucChampion: new Float64Array(replicates), aucChallenger: new Float64Array(replicates), ksChampion: new Float64Array(replicates), ksChallenger: new Float64Array(replicates) };
    // Rebuild each replicate as a weighted sample: cell c's accounts repeated by its count.
    const cellOf = new Map<string, number>();
    const firstRowOfCell: number[] = [];
    {
      // cells are (champion score, challenger score, outcome) combinations
      const keys = [...rawA.keys()].map((i) => `${rawA[i]}|${rawB[i]}|${bad[i]}`);
      const sorted = [...new Set(keys)].sort((x, y) => {
        const [a1, b1, o1] = x.split('|').map(Number);
        const [a2, b2, o2] = y.split('|').map(Number);
        return a1 - a2 || b1 - b2 || o1 - o2;
      });
      sorted.forEach((key, c) => cellOf.set(key, c));
      for (const [i, key] of keys.entries()) if (firstRowOfCell[cellOf.get(key)!] === undefined) firstRowOfCell[cellOf.get(key)!] = i;
    }
    const rebuilt: { aucA: number; aucB: number; ksA: number; ksB: number }[] = [];
    runReplicates(plan, 11, 0, replicates, out, 0, replicateScratch(plan), (_, counts) => {
      const sa: number[] = [];
      const sb: number[] = [];
      const sbad: number[] = [];
      for (let c = 0; c < plan.cells; c++) {
        const row = firstRowOfCell[c];
        for (let k = 0; k < counts[c]; k++) {
          sa.push(rawA[row]);
          sb.push(rawB[row]);
          sbad.push(bad[row]);
        }
      }
      const flags = Uint8Array.from(sbad);
      const ba = scoreBlocks(Float64Array.from(sa), flags);
      const bb = scoreBlocks(Float64Array.from(sb), flags);
      rebuilt.push({ aucA: auc(ba), aucB: auc(bb), ksA: ks(ba, 'safer').ks, ksB: ks(bb, 'safer').ks });
    });
    expect(plan.cells).toBe(cellOf.size);
    for (let r = 0; r < replicates; r++) {
      expect(Math.abs(out.aucChampion[r] - rebuilt[r].aucA)).toBeLessThan(1e-12);
      expect(Math.abs(out.aucChallenger[r] - rebuilt[r].aucB)).toBeLessThan(1e-12);
      expect(out.ksChampion[r]).toBe(rebuilt[r].ksA);
      expect(out.ksChallenger[r]).toBe(rebuilt[r].ksB);
    }
  });
});

describe('bootstrap', () => {
  it('repeats exactly with the same seed and differs with another', async () => {
    const { bad, a, b } = holdout(500, 'seed-check');
    const options = { replicates: 120, seed: 42, confidence: 0.95, threads: 0 };
    const first = await bootstrap(a, b, bad, options);
    const again = await bootstrap(a, b, bad, options);
    const other = await bootstrap(a, b, bad, { ...options, seed: 43 });
    expect(again).toEqual(first);
    expect(other.replicates!.deltaGini).not.toEqual(first.replicates!.deltaGini);
  });

  it('gives identical output on worker threads and in this thread', async () => {
    const { bad, a, b } = holdout(2000, 'thread-check');
    const options = { replicates: 110, seed: 5, confidence: 0.9 };
    const here = await bootstrap(a, b, bad, { ...options, threads: 0 });
    const progress: number[] = [];
    const two = await bootstrap(a, b, bad, { ...options, threads: 2, onProgress: (done) => progress.push(done) });
    expect(two).toEqual(here);
    expect(progress.at(-1)).toBe(110);
    expect([...progress].sort((x, y) => x - y)).toEqual(progress);
    // A plan with staged challenger-order writes (large plans; bootstrap-scatter.ts), on threads.
    expect(await bootstrap(a, b, bad, { ...options, threads: 2, stageFrom: 0 })).toEqual(here);
  });

  it('stops when its signal aborts, on threads and in this thread', async () => {
    const { bad, a, b } = holdout(2000, 'abort-check');
    for (const threads of [2, 0]) {
      const stop = new AbortController();
      let seen = 0;
      const running = bootstrap(a, b, bad, {
        replicates: 5000,
        seed: 3,
        confidence: 0.95,
        threads,
        signal: stop.signal,
        onProgress: (done) => {
          seen = done;
          if (done >= 50) stop.abort(new Error('stopped by the test'));
        },
      });
      await expect(running).rejects.toThrow('stopped by the test');
      // Stopped long before the end (a thread may still report the blocks it had been handed).
      expect(seen).toBeLessThan(1000);
    }
    const aborted = AbortSignal.abort(new Error('already stopped'));
    await expect(bootstrap(a, b, bad, { replicates: 100, seed: 3, confidence: 0.95, threads: 2, signal: aborted })).rejects.toThrow('already stopped');
  });

  it('brackets the point estimates with percentile intervals and bins every replicate', async () => {
    const { bad, a, b } = holdout(3000, 'interval-check');
    const result = await bootstrap(a, b, bad, { replicates: 400, seed: 1, confidence: 0.95, threads: 0 });
    const deltaGini = 2 * (auc(b) - auc(a));
    expect(result.deltaGiniCi![0]).toBeLessThan(deltaGini);
    expect(result.deltaGiniCi![1]).toBeGreaterThan(deltaGini);
    expect(result.championKsCi![0]).toBeLessThan(ks(a, 'safer').ks);
    expect(result.championKsCi![1]).toBeGreaterThan(ks(a, 'safer').ks);
    const { histograms } = result.section;
    for (const h of Object.values(histograms!)) {
      expect(h.counts.reduce((s, c) => s + c, 0)).toBe(400);
      expect(h.edges).toHaveLength(h.counts.length + 1);
    }
    expect(result.section).toMatchObject({ replicates: 400, seed: 1, confidence: 0.95, method: 'paired-stratified-percentile' });
  });

  it('is skipped with 0 replicates', async () => {
    const { bad, a, b } = holdout(50, 'skip');
    const result = await bootstrap(a, b, bad, { replicates: 0, seed: 1, confidence: 0.95 });
    expect(result.section.histograms).toBeNull();
    expect(result.deltaGiniCi).toBeNull();
  });
});

describe('bootstrap helpers', () => {
  it('seeds each replicate from seedrandom and never with an all-zero state', () => {
    const state = replicateState(1, 0);
    const arc4 = seedrandom('1:0');
    expect([...state]).toEqual([arc4.int32(), arc4.int32(), arc4.int32(), arc4.int32()]);
    expect(replicateState(1, 1)).not.toEqual(state);
  });

  it('generates xoshiro128** (reference sequence from the authors C code, seed 1, 2, 3, 4)', () => {
    // xoshiro128starstar.c (Blackman & Vigna) with s = {1, 2, 3, 4}: first outputs computed by hand
    // from the recurrence: 11520, 0, 5927040, 70819200, 2031721883 (checked with Python integers).
    const state = Int32Array.from([1, 2, 3, 4]);
    expect([0, 1, 2, 3, 4].map(() => nextUint32(state))).toEqual([11520, 0, 5927040, 70819200, 2031721883]);
  });

  it('bins into equal widths, or one bin when all values are equal', () => {
    expect(histogram(Float64Array.from([1, 1, 1]))).toEqual({ edges: [1, 1], counts: [3] });
    const h = histogram(Float64Array.from([0, 1, 2, 3]), 3);
    expect(h.counts).toEqual([1, 1, 2]);
    expect(h.edges).toEqual([0, 1, 2, 3]);
  });
});
