import { createHash } from 'node:crypto';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { bootstrap } from '@server/stats/bootstrap';
import { planBootstrapReference, replicateScratch, runReplicates } from '@server/stats/bootstrap-kernel';
import { poissonOneThreshold, poissonTables } from '@server/stats/bootstrap-poisson';
import { planBootstrap } from '@server/stats/bootstrap-plan';
import { stageScatter } from '@server/stats/bootstrap-scatter';
import { scoreCells, scoreCellsReference, scoreCellsWeighted, scoreCellsWeightedReference, scoreScratch } from '@server/stats/bootstrap-score';
import { type ScoreBlocks, scoreBlocks, weighBlocks } from '@server/stats/order';

/**
 * The bootstrap's fast paths against their plain counterparts (issue 20): the replicate values
 * must stay those of the engine before the fast paths, bit for bit, for a given seed.
 */

/** Seeded holdouts: continuous scores (cells of one account, ties on the champion from 3
 * decimals) or points on both models (cells of up to 255 accounts, Poisson(64) chunks). */
function fixture(n: number, seed: string, points: boolean) {
  const random = seedrandom(seed);
  const bad = new Uint8Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const risk = random();
    bad[i] = random() < 0.1 + 0.3 * risk ? 1 : 0;
    a[i] = points ? Math.round(5 * (1 - risk) + 2 * random()) : Number((1 - risk + 0.2 * random()).toFixed(3));
    b[i] = points ? Math.round(6 * (1 - risk) + 2 * random()) : 1 - risk + 0.3 * random();
  }
  return { bad, a: scoreBlocks(a, bad), b: scoreBlocks(b, bad) };
}

/**
 * Sampling weights for the plan and scoring tests: by outcome (goods 4, bads 1), 1–4 at random,
 * fractional (a few values, so rows of equal weight tie within the combinations; and 200 values),
 * one fractional weight per row (so many distinct weights that planBootstrap leaves the plan to
 * the reference), and one weight for every row.
 */
function weightings(bad: Uint8Array, seed: string): [string, Float64Array][] {
  const random = seedrandom(seed);
  const n = bad.length;
  const fractions = [0.25, 1.5, 2.75, 3.1, 0.3];
  return [
    ['weights by outcome', Float64Array.from(bad, (b) => (b ? 1 : 4))],
    ['weights 1–4 at random', Float64Array.from({ length: n }, () => 1 + Math.floor(random() * 4))],
    ['fractional weights', Float64Array.from({ length: n }, () => fractions[Math.floor(random() * fractions.length)])],
    ['200 fractional weights', Float64Array.from({ length: n }, () => 0.5 + Math.floor(random() * 200) / 64)],
    ['a fractional weight per row', Float64Array.from({ length: n }, () => 0.5 + random() * 3)],
    ['one weight', new Float64Array(n).fill(2.5)],
  ];
}

/** The fast plan against the plain one, array for array (the blocks weighed as report.ts weighs them). */
function expectSamePlan(label: string, a: ScoreBlocks, b: ScoreBlocks, bad: Uint8Array, weight: Float64Array | null, more: ScoreBlocks[] = []): void {
  const weigh = (blocks: ScoreBlocks) => (weight === null ? blocks : weighBlocks(blocks, weight));
  const fast = planBootstrap(weigh(a), weigh(b), bad, weight, more.map(weigh));
  const plain = planBootstrapReference(weigh(a), weigh(b), bad, weight, more.map(weigh));
  expect(fast.cells, label).toBe(plain.cells);
  expect([fast.nGood, fast.nBad], label).toEqual([plain.nGood, plain.nBad]);
  for (const key of ['size', 'flagsChampion', 'positionChallenger', 'flagsChallenger', 'goodCells', 'badCells'] as const) {
    expect([...fast[key]], `${label}: ${key}`).toEqual([...plain[key]]);
  }
  for (const key of ['weightChampion', 'weightChallenger'] as const) {
    expect(fast[key] === null ? null : [...fast[key]], `${label}: ${key}`).toEqual(plain[key] === null ? null : [...plain[key]]);
  }
  expect(fast.more.length, label).toBe(plain.more.length);
  fast.more.forEach((layout, m) => {
    expect([...layout.position], `${label}: more[${m}].position`).toEqual([...plain.more[m].position]);
    expect([...layout.flags], `${label}: more[${m}].flags`).toEqual([...plain.more[m].flags]);
    expect(layout.weight === null ? null : [...layout.weight], `${label}: more[${m}].weight`).toEqual(plain.more[m].weight === null ? null : [...plain.more[m].weight]);
  });
}

describe('bootstrap fast paths', () => {
  // SHA-256 of the replicate values (ΔGini, ΔKS, champion KS, challenger KS as float64 bytes),
  // printed by the engine before the fast paths (commit 5543297, engine 1.3.0) on the same
  // fixtures, seed 9, 50 replicates.
  it.each([
    [false, 'd16c95f82d2404904cff73bd5e2c17f0f4e4a128a04568c935629b287b8930b1'],
    [true, '704dd5c222e7d830c53b3e046d3ae6718a5ec8712942b1782d2e278f97c47b4d'],
  ])('give the replicate values of the engine before them, bit for bit (points: %s)', async (points, expected) => {
    const { bad, a, b } = fixture(20_000, 'golden', points);
    const result = await bootstrap(a, b, bad, { replicates: 50, seed: 9, confidence: 0.95, threads: 0 });
    const hash = createHash('sha256');
    const { deltaGini, deltaKs, championKs, challengerKs } = result.replicates!;
    for (const values of [deltaGini, deltaKs, championKs, challengerKs]) hash.update(new Uint8Array(values.buffer));
    expect(hash.digest('hex')).toBe(expected);
  });

  // The same with sampling weights (issue 12): printed by the engine before the weighted fast
  // paths (commit 725ab54) on the same fixtures with weightings()' weights 1–4 at random and
  // fractional weights, seed 9, 50 replicates.
  it.each([
    [false, 1, '38a477a87f5b59b87ef769e239082a4195795d3ff102fe899dc0dfb56d136467'],
    [false, 2, 'b0ad13e851ae60a38f1a78243ed9cbefe64f50a3850a3fc5ed7625364488e988'],
    [true, 1, '3ca256fc67b83bcab5003bd54fad6c23aea638d76d1328edddb7af2052251910'],
    [true, 2, 'caafd8b2c36d92ee125a6fa0bc9906e0701dcf274bd8608a2a492f07d153b281'],
  ])('give the weighted replicate values of the engine before them, bit for bit (points: %s, weighting %i)', async (points, weighting, expected) => {
    const { bad, a, b } = fixture(20_000, 'golden', points);
    const [, weight] = weightings(bad, 'golden-weights')[weighting];
    const result = await bootstrap(weighBlocks(a, weight), weighBlocks(b, weight), bad, { replicates: 50, seed: 9, confidence: 0.95, threads: 0 });
    const hash = createHash('sha256');
    const { deltaGini, deltaKs, championKs, challengerKs } = result.replicates!;
    for (const values of [deltaGini, deltaKs, championKs, challengerKs]) hash.update(new Uint8Array(values.buffer));
    expect(hash.digest('hex')).toBe(expected);
  });

  it('build the plan the plain implementation builds, array for array', () => {
    const random = seedrandom('plan');
    const cases: [string, ReturnType<typeof fixture>][] = [
      ['continuous, champion ties', fixture(20_000, 'plan-continuous', false)],
      // Points: combinations of several hundred accounts, split into cells of MAX_CELL.
      ['points', fixture(20_000, 'plan-points', true)],
      ['small', fixture(7, 'plan-small', false)],
    ];
    // One score value for every account on the champion (one block), random on the challenger.
    const bad = Uint8Array.from({ length: 3000 }, () => (random() < 0.3 ? 1 : 0));
    const same = scoreBlocks(new Float64Array(3000).fill(2), bad);
    const spread = scoreBlocks(Float64Array.from({ length: 3000 }, () => Math.round(random() * 40)), bad);
    cases.push(['one champion block', { bad, a: same, b: spread }], ['one challenger block', { bad, a: spread, b: same }], ['one block each', { bad, a: same, b: same }]);
    for (const [label, { bad: outcome, a, b }] of cases) {
      const fast = planBootstrap(a, b, outcome);
      const plain = planBootstrapReference(a, b, outcome);
      expect(fast.cells, label).toBe(plain.cells);
      for (const key of ['size', 'flagsChampion', 'positionChallenger', 'flagsChallenger', 'goodCells', 'badCells'] as const) {
        expect([...fast[key]], `${label}: ${key}`).toEqual([...plain[key]]);
      }
      expect([fast.nGood, fast.nBad, fast.weightChampion, fast.weightChallenger]).toEqual([plain.nGood, plain.nBad, null, null]);
    }
    // The points fixture does split combinations (cells of MAX_CELL accounts exist).
    expect(planBootstrap(cases[1][1].a, cases[1][1].b, cases[1][1].bad).size.includes(255)).toBe(true);
  });

  it('build the plan the plain implementation builds with sampling weights, array for array', () => {
    const cases: [string, ReturnType<typeof fixture>][] = [
      ['continuous, champion ties', fixture(8000, 'weighted-continuous', false)],
      ['points', fixture(20_000, 'weighted-points', true)],
      ['small', fixture(9, 'weighted-small', false)],
    ];
    const random = seedrandom('weighted-plan');
    const bad = Uint8Array.from({ length: 3000 }, () => (random() < 0.3 ? 1 : 0));
    const same = scoreBlocks(new Float64Array(3000).fill(2), bad);
    const spread = scoreBlocks(Float64Array.from({ length: 3000 }, () => Math.round(random() * 40)), bad);
    cases.push(['one champion block', { bad, a: same, b: spread }], ['one challenger block', { bad, a: spread, b: same }], ['one block each', { bad, a: same, b: same }]);
    for (const [label, { bad: outcome, a, b }] of cases) {
      for (const [kind, weight] of weightings(outcome, `${label}-weights`)) {
        expectSamePlan(`${label}, ${kind}`, a, b, outcome, weight);
      }
    }
    // The points fixture with weights 1–4 at random does split combinations by weight and by size.
    const { bad: outcome, a, b } = cases[1][1];
    const [, random4] = weightings(outcome, 'points-weights')[1];
    const plan = planBootstrap(weighBlocks(a, random4), weighBlocks(b, random4), outcome, random4);
    expect(plan.cells).toBeGreaterThan(planBootstrap(a, b, outcome).cells);
    expect(plan.size.includes(255)).toBe(true);
  });

  it('stage the challenger-order writes of a large plan without changing a count', () => {
    for (const points of [false, true]) {
      const { bad, a, b } = fixture(20_000, `stage-${points}`, points);
      const plan = planBootstrap(a, b, bad);
      // Small windows, so that the staging runs through many of them (the engine's are 32,768 positions).
      const staged = stageScatter(plan, 64);
      expect(staged.scatter!.slot).toHaveLength(plan.cells);
      const replicates = 30;
      const run = (p: typeof plan) => {
        const out = { aucChampion: new Float64Array(replicates), aucChallenger: new Float64Array(replicates), ksChampion: new Float64Array(replicates), ksChallenger: new Float64Array(replicates) };
        const scratch = replicateScratch(p);
        runReplicates(p, 8, 0, replicates, out, 0, scratch);
        return { out, scratch };
      };
      const direct = run(plan);
      const throughStaging = run(staged);
      expect(direct.scratch.staged).toBeNull();
      expect(throughStaging.scratch.staged).not.toBeNull();
      expect(throughStaging.out).toEqual(direct.out);
      // The last replicate's counts in challenger order, after the stratum adjustment.
      expect([...throughStaging.scratch.countsChallenger]).toEqual([...direct.scratch.countsChallenger]);
    }
    expect(() => stageScatter(planBootstrap(fixture(50, 'w', false).a, fixture(50, 'w', false).b, fixture(50, 'w', false).bad), 48)).toThrow('power of two');
  });

  it('stage the writes of a plan with further challengers without changing a replicate, on threads too', async () => {
    const { bad, a, b } = fixture(6000, 'stage-more', false);
    const c = fixture(6000, 'stage-more-c', true).b;
    const d = fixture(6000, 'stage-more-d', false).a;
    const settings = { replicates: 24, seed: 5, confidence: 0.95 };
    const direct = await bootstrap(a, b, bad, { ...settings, threads: 0 }, [c, d]);
    const staged = await bootstrap(a, b, bad, { ...settings, threads: 0, stageFrom: 1 }, [c, d]);
    const stagedOnThreads = await bootstrap(a, b, bad, { ...settings, threads: 2, stageFrom: 1 }, [c, d]);
    for (const result of [staged, stagedOnThreads]) {
      expect(result.replicates).toEqual(direct.replicates);
      expect(result.more).toEqual(direct.more);
    }
    expect(direct.more).toHaveLength(2);
  });

  it('score the cells as the plain one-pass implementation does, to the bit', () => {
    for (const points of [false, true]) {
      const { bad, a, b } = fixture(5000, `score-${points}`, points);
      const plan = planBootstrap(a, b, bad);
      const scratch = replicateScratch(plan);
      const out = { aucChampion: new Float64Array(40), aucChallenger: new Float64Array(40), ksChampion: new Float64Array(40), ksChallenger: new Float64Array(40) };
      const fast = new Float64Array(2);
      const plain = new Float64Array(2);
      const work = scoreScratch(plan.cells);
      let compared = 0;
      runReplicates(plan, 3, 0, 40, out, 0, scratch, (_, counts) => {
        scoreCellsReference(counts, plan.flagsChampion, plan.cells, plan.nGood, plan.nBad, plain);
        scoreCells(counts, plan.flagsChampion, plan.cells, plan.nGood, plan.nBad, fast, work);
        expect([...fast]).toEqual([...plain]);
        compared++;
      });
      expect(compared).toBe(40);
    }
  });

  it('score the cells with sampling weights as the plain implementation does, to the bit, in both orders', () => {
    for (const points of [false, true]) {
      const { bad, a, b } = fixture(5000, `score-weighted-${points}`, points);
      for (const [kind, weight] of weightings(bad, `score-weights-${points}`)) {
        const plan = planBootstrap(weighBlocks(a, weight), weighBlocks(b, weight), bad, weight);
        const scratch = replicateScratch(plan);
        const out = { aucChampion: new Float64Array(30), aucChallenger: new Float64Array(30), ksChampion: new Float64Array(30), ksChallenger: new Float64Array(30) };
        const fast = new Float64Array(2);
        const plain = new Float64Array(2);
        const work = replicateScratch(plan);
        const countsChallenger = new Uint16Array(plan.cells);
        let compared = 0;
        runReplicates(plan, 4, 0, 30, out, 0, scratch, (_, counts) => {
          scoreCellsWeightedReference(counts, plan.flagsChampion, plan.weightChampion!, plan.cells, plain);
          scoreCellsWeighted(counts, plan.flagsChampion, plan.weightChampion!, plan.cells, fast, work.scoreChampion);
          expect([...fast], `${kind} (points: ${points}), champion`).toEqual([...plain]);
          for (let c = 0; c < plan.cells; c++) countsChallenger[plan.positionChallenger[c]] = counts[c];
          scoreCellsWeightedReference(countsChallenger, plan.flagsChallenger, plan.weightChallenger!, plan.cells, plain);
          scoreCellsWeighted(countsChallenger, plan.flagsChallenger, plan.weightChallenger!, plan.cells, fast, work.scoreChallenger);
          expect([...fast], `${kind} (points: ${points}), challenger`).toEqual([...plain]);
          compared++;
        });
        expect(compared).toBe(30);
      }
    }
    // Hand-made: one block, a block of one cell, empty cells, fractional weights.
    const cases: [number[], number[], number[]][] = [
      [[3, 0, 2, 5], [0, 1, 0, 3], [0.5, 1, 2.25, 3]],
      [[1, 1, 1, 1], [2, 3, 2, 3], [1.1, 0.7, 3.3, 0.1]],
      [[0, 4, 0, 2, 7], [2, 3, 0, 1, 2 | 1], [4, 4, 1, 1, 0.3]],
    ];
    for (const [counts, flags, weight] of cases) {
      const plain = new Float64Array(2);
      const fast = new Float64Array(2);
      scoreCellsWeightedReference(Uint16Array.from(counts), Uint8Array.from(flags), Float64Array.from(weight), counts.length, plain);
      scoreCellsWeighted(Uint16Array.from(counts), Uint8Array.from(flags), Float64Array.from(weight), counts.length, fast, scoreScratch(counts.length));
      expect([...fast]).toEqual([...plain]);
    }
  });

  it('score hand-made layouts alike: one block, one cell per block, empty cells', () => {
    const cases: [number[], number[]][] = [
      // counts, flags (bit 0 bad, bit 1 last cell of its block)
      [[3, 0, 2, 5], [0, 1, 0, 3]],
      [[1, 1, 1, 1], [2, 3, 2, 3]],
      [[0, 4, 0, 2, 7], [2, 3, 0, 1, 2 | 1]],
    ];
    for (const [counts, flags] of cases) {
      let nGood = 0;
      let nBad = 0;
      counts.forEach((k, c) => (flags[c] & 1 ? (nBad += k) : (nGood += k)));
      const plain = new Float64Array(2);
      const fast = new Float64Array(2);
      scoreCellsReference(Uint16Array.from(counts), Uint8Array.from(flags), counts.length, nGood, nBad, plain);
      scoreCells(Uint16Array.from(counts), Uint8Array.from(flags), counts.length, nGood, nBad, fast, scoreScratch(counts.length));
      expect([...fast]).toEqual([...plain]);
    }
    // One block: AUC ½ (all ties), KS 0.
    const tie = new Float64Array(2);
    scoreCells(Uint16Array.from([3, 0, 2, 5]), Uint8Array.from([0, 1, 0, 3]), 4, 5, 5, tie, scoreScratch(4));
    expect([...tie]).toEqual([0.5, 0]);
  });

  it('draw Poisson(1) counts with integer thresholds exactly where the floating-point comparisons change', () => {
    const { cdf } = poissonTables();
    for (let i = 0; i < 6; i++) {
      const threshold = (poissonOneThreshold(cdf[i]) ^ 0x80000000) >>> 0;
      for (const x of [threshold - 1, threshold, threshold + 1]) {
        const floating = x * 2 ** -32 >= cdf[i];
        const integer = ((x ^ 0x80000000) | 0) >= poissonOneThreshold(cdf[i]);
        expect(integer).toBe(floating);
      }
      expect(((threshold - 1) * 2 ** -32 >= cdf[i])).toBe(false);
      expect((threshold * 2 ** -32 >= cdf[i])).toBe(true);
    }
  });
});
