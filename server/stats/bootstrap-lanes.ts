import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { projectRoot } from '@server/runtime';
import { adjustStratum, blockEnds, type BootstrapPlan, type ReplicateOutput, type ReplicateScratch, replicateScratch, replicateState, runReplicates } from './bootstrap-kernel';
import { poissonTables } from './bootstrap-poisson';

/**
 * Four bootstrap replicates at a time, on WebAssembly with SIMD (issue 20).
 *
 * At millions of cells a replicate costs what its passes over the cells cost: the draw (a random
 * number and a Poisson count per cell), its counts laid out in challenger order or added to the
 * challenger's block totals (a scattered write or update per cell), and each model's running
 * totals at its block ends. JavaScript spends some twenty machine instructions per cell and pass,
 * whatever the memory does; four replicates side by side in the four 32-bit lanes of a 128-bit
 * vector do each step for all four with one instruction. The kernel is wasm/bootstrap-lanes.ts
 * (AssemblyScript, compiled by scripts/build-wasm.mjs when the packages are installed); this file
 * lays out its memory, runs the steps that stay in TypeScript (each replicate's stratum
 * adjustment, a few thousand changes, and the sums over the blocks) and falls back to the
 * TypeScript kernel one replicate at a time where the lanes do not apply.
 *
 * Lane l of replicates r … r + 3 is replicate r + l with its own generator stream
 * (replicateState), drawn cell by cell in the same order and with the same integer thresholds and
 * tables as bootstrap-poisson.ts, so every count is the one the TypeScript kernel draws; the
 * totals are integers and the sums the same exact sums (bootstrap-score.ts). So the replicate
 * values are the same to the bit, and the tests compare both kernels replicate by replicate.
 *
 * With sampling weights each model's block weights are the double-precision sums of
 * scoreCellsWeighted, made with the same operations in the same order in each lane, so the same
 * bits. Used for plans of two models; with further challengers, for replicates left over from a
 * block (fewer than four), and wherever the compiled kernel is missing, replicates run one at a
 * time in TypeScript (bootstrap-kernel.ts). Memory per thread: 14 bytes per cell for the counts
 * and plan (22 more with the cell-by-cell challenger layout, 16 more with weights), and 32 bytes
 * per block (64 with weights).
 */

export const LANES = 4;

/** The compiled kernel's exports (wasm/bootstrap-lanes.ts). */
interface LaneKernel {
  drawFour(
    cells: number, size: number, flags: number, counts: number, state: number, work: number, totals: number,
    cdf: number, offset: number, guide: number,
    t0: number, t1: number, t2: number, t3: number, t4: number, t5: number,
  ): void;
  totalsFour(cells: number, flags: number, counts: number, good: number, bad: number): number;
  scatterFour(cells: number, position: number, counts: number, target: number): void;
  blockTotalsFour(cells: number, key: number, counts: number, totals: number): void;
  sumsFour(blocks: number, good: number, bad: number, nGood: number, nBad: number, out: number): void;
  blockSumsFour(blocks: number, totals: number, nGood: number, nBad: number, out: number): void;
  weightedTotalsFour(cells: number, flags: number, counts: number, weight: number, good: number, bad: number, totals: number): number;
  weightedSumsFour(blocks: number, good: number, bad: number, totals: number, out: number): void;
}

/** A compiled kernel (a WebAssembly.Module; worker threads receive it through workerData). */
export interface CompiledLanes {
  readonly compiledLanes: never;
}

/**
 * The few WebAssembly names used here. The server's TypeScript settings have no DOM library,
 * where the standard declarations live.
 */
interface WebAssemblyApi {
  Module: new (bytes: Uint8Array) => CompiledLanes;
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer };
  Instance: new (module: CompiledLanes, imports: object) => { exports: object };
}
const wasm = (globalThis as unknown as { WebAssembly: WebAssemblyApi }).WebAssembly;

const LANES_FILE = join(projectRoot, 'wasm', 'build', 'bootstrap-lanes.wasm');
let compiled: CompiledLanes | null | undefined;

/**
 * The compiled kernel, or null when its file is missing (the packages were installed without
 * running scripts) or this runtime cannot compile it. Compiled once per thread; the module can be
 * handed to worker threads.
 */
export function lanesModule(): CompiledLanes | null {
  if (compiled !== undefined) return compiled;
  try {
    compiled = new wasm.Module(readFileSync(LANES_FILE));
  } catch {
    compiled = null;
  }
  return compiled;
}

/** Whether the plan can run four replicates at a time: two models (no further challengers). */
export function runsInLanes(plan: BootstrapPlan): boolean {
  return plan.more.length === 0;
}

/** One thread's instance of the kernel, with the plan copied into its memory. */
export class FourLanes {
  private readonly kernel: LaneKernel;
  private readonly at: Record<'work' | 'state' | 'totals' | 'cdf' | 'offset' | 'guide' | 'size' | 'flagsA' | 'flagsB' | 'index' | 'weightA' | 'weightB' | 'counts' | 'target' | 'good' | 'bad', number>;
  private readonly thresholds: number[];
  private readonly counts: Uint16Array;
  private readonly stateWords: Int32Array;
  private readonly drawTotals: Int32Array;
  private readonly ratio: Float64Array;
  private readonly blockTotals: Uint32Array | null;
  /** The kernel's sums: per lane 2·wins, the largest and the smallest KS gap (sumsFour). */
  private readonly sums: Float64Array;
  /** With weights: per lane the total good and bad weights (weightedTotalsFour), then wins and gap. */
  private readonly weightedTotals: Float64Array;
  private readonly weightedSums: Float64Array;

  constructor(
    module: CompiledLanes,
    private readonly plan: BootstrapPlan,
  ) {
    const { cells } = plan;
    const byBlocks = plan.challengerBlocks ?? null;
    const tables = poissonTables();
    const blocks = Math.max(blockEnds(plan.flagsChampion, cells), byBlocks ? 0 : blockEnds(plan.flagsChallenger, cells)) + 1;
    const weighted = plan.weightChampion !== null && plan.weightChallenger !== null;
    let end = 0;
    const take = (bytes: number) => {
      const from = end;
      end = from + Math.ceil(bytes / 16) * 16;
      return from;
    };
    this.at = {
      // drawFour's scratch (32 bytes); the sums (96 from 128); weighted totals (64 from 256) and sums (64 from 320).
      work: take(384),
      state: take(64),
      totals: take(80),
      cdf: take(8 * tables.cdf.length),
      offset: take(4 * tables.offset.length),
      guide: take(4 * tables.guide.length),
      size: take(cells),
      flagsA: take(cells),
      flagsB: take(byBlocks ? 0 : cells),
      // The challenger's block-total keys, or its positions (cell-by-cell layout).
      index: take(4 * cells),
      weightA: take(weighted ? 8 * cells : 0),
      weightB: take(weighted ? 8 * cells : 0),
      counts: take(8 * cells),
      // The block totals (2 per block), or the counts in challenger order.
      target: take(byBlocks ? 32 * byBlocks.blocks : 8 * cells),
      // Four running totals per block (i32), or with weights four block weights (f64).
      good: take((weighted ? 32 : 16) * blocks),
      bad: take((weighted ? 32 : 16) * blocks),
    };
    const memory = new wasm.Memory({ initial: Math.ceil(end / 65536) });
    const instance = new wasm.Instance(module, {
      env: {
        memory,
        abort: () => {
          throw new Error('bootstrap lanes: the WebAssembly kernel stopped');
        },
      },
    });
    this.kernel = instance.exports as unknown as LaneKernel;
    const { buffer } = memory;
    new Float64Array(buffer, this.at.cdf, tables.cdf.length).set(tables.cdf);
    new Uint32Array(buffer, this.at.offset, tables.offset.length).set(tables.offset);
    new Uint32Array(buffer, this.at.guide, tables.guide.length).set(tables.guide);
    new Uint8Array(buffer, this.at.size, cells).set(plan.size);
    new Uint8Array(buffer, this.at.flagsA, cells).set(plan.flagsChampion);
    if (!byBlocks) new Uint8Array(buffer, this.at.flagsB, cells).set(plan.flagsChallenger);
    new Uint32Array(buffer, this.at.index, cells).set(byBlocks ? byBlocks.key : plan.positionChallenger);
    if (weighted) {
      new Float64Array(buffer, this.at.weightA, cells).set(plan.weightChampion!);
      new Float64Array(buffer, this.at.weightB, cells).set(plan.weightChallenger!);
    }
    // ⌈cdf_k·2^32⌉ for Poisson(1), k = 0 … 5: the draw's integer thresholds (poissonOneThreshold
    // in bootstrap-poisson.ts, without its sign flip: WebAssembly compares unsigned).
    this.thresholds = Array.from({ length: 6 }, (_, k) => Math.ceil(tables.cdf[k] * 4294967296));
    this.counts = new Uint16Array(buffer, this.at.counts, LANES * cells);
    this.stateWords = new Int32Array(buffer, this.at.state, 16);
    this.drawTotals = new Int32Array(buffer, this.at.totals, 12);
    this.ratio = new Float64Array(buffer, this.at.totals + 48, LANES);
    this.blockTotals = byBlocks ? new Uint32Array(buffer, this.at.target, LANES * 2 * byBlocks.blocks) : null;
    this.sums = new Float64Array(buffer, this.at.work + 128, 3 * LANES);
    this.weightedTotals = new Float64Array(buffer, this.at.work + 256, 2 * LANES);
    this.weightedSums = new Float64Array(buffer, this.at.work + 320, 2 * LANES);
  }

  /** Scores of lane `lane` with sampling weights: [AUC, KS], as scoreCellsWeighted computes them. */
  private weightedScoresOf(lane: number, scores: Float64Array): void {
    const pairs = this.weightedTotals[lane] * this.weightedTotals[LANES + lane];
    scores[0] = this.weightedSums[2 * lane] / pairs;
    scores[1] = this.weightedSums[2 * lane + 1] / pairs;
  }

  /** One model's weighted scores for the four lanes, from its counts in its order. */
  private scoreWeighted(flags: number, counts: number, weight: number, out: Float64Array[], r: number, offset: number): void {
    const { kernel, at } = this;
    const blocks = kernel.weightedTotalsFour(this.plan.cells, flags, counts, weight, at.good, at.bad, at.work + 256);
    kernel.weightedSumsFour(blocks, at.good, at.bad, at.work + 256, at.work + 320);
    const scores = new Float64Array(2);
    for (let lane = 0; lane < LANES; lane++) {
      this.weightedScoresOf(lane, scores);
      out[0][r + lane - offset] = scores[0];
      out[1][r + lane - offset] = scores[1];
    }
  }

  /** Scores of lane `lane` from the kernel's sums: [AUC, KS], as blockSums computes them. */
  private scoresOf(lane: number, pairs: number, scores: Float64Array): void {
    const wins2 = this.sums[3 * lane];
    const high = this.sums[3 * lane + 1];
    const low = this.sums[3 * lane + 2];
    scores[0] = (wins2 * 0.5) / pairs;
    scores[1] = Math.max(high, -low) / pairs;
  }

  /** Replicates r … r + 3, their results written at r − offset … r + 3 − offset of `out`. */
  run(seed: number, r: number, out: ReplicateOutput, offset: number, inspect?: (replicate: number, counts: Uint16Array) => void): void {
    const { plan, kernel, at, counts } = this;
    const { cells, nGood, nBad, size, positionChallenger, goodCells, badCells } = plan;
    // 1. The four generators, lane by lane: word w of lane l at 4w + l.
    const states = Array.from({ length: LANES }, (_, lane) => replicateState(seed, r + lane));
    for (let lane = 0; lane < LANES; lane++) for (let w = 0; w < 4; w++) this.stateWords[4 * w + lane] = states[lane][w];
    const [t0, t1, t2, t3, t4, t5] = this.thresholds;
    kernel.drawFour(cells, at.size, at.flagsA, at.counts, at.state, at.work, at.totals, at.cdf, at.offset, at.guide, t0, t1, t2, t3, t4, t5);
    // 2. Each replicate's strata brought to size, from where its generator stopped.
    for (let lane = 0; lane < LANES; lane++) {
      const state = Int32Array.from({ length: 4 }, (_, w) => this.stateWords[4 * w + lane]);
      const goods = this.drawTotals[lane];
      const bads = this.drawTotals[4 + lane];
      const bound = Math.max(this.drawTotals[8 + lane], this.ratio[lane]) * (1 + 1e-12);
      adjustStratum(goodCells, nGood, goods, bound, size, positionChallenger, counts, null, state, LANES, lane);
      adjustStratum(badCells, nBad, bads, bound, size, positionChallenger, counts, null, state, LANES, lane);
      if (inspect) inspect(r + lane, Uint16Array.from({ length: cells }, (_, c) => counts[LANES * c + lane]));
    }
    // 3. and 4. With sampling weights: each model's weighted sums from its counts in its order.
    if (plan.weightChampion !== null) {
      this.scoreWeighted(at.flagsA, at.counts, at.weightA, [out.aucChampion, out.ksChampion], r, offset);
      kernel.scatterFour(cells, at.index, at.counts, at.target);
      this.scoreWeighted(at.flagsB, at.target, at.weightB, [out.aucChallenger, out.ksChallenger], r, offset);
      return;
    }
    // 3. The champion: four running totals per block, then each replicate's sums.
    const scores = new Float64Array(2);
    const pairs = nGood * nBad;
    const sumsAt = at.work + 128;
    const blocksA = kernel.totalsFour(cells, at.flagsA, at.counts, at.good, at.bad);
    kernel.sumsFour(blocksA, at.good, at.bad, nGood, nBad, sumsAt);
    for (let lane = 0; lane < LANES; lane++) {
      this.scoresOf(lane, pairs, scores);
      out.aucChampion[r + lane - offset] = scores[0];
      out.ksChampion[r + lane - offset] = scores[1];
    }
    // 4. The challenger: block totals, or the counts in its order and its running totals.
    const byBlocks = plan.challengerBlocks ?? null;
    if (byBlocks && this.blockTotals) {
      this.blockTotals.fill(0);
      kernel.blockTotalsFour(cells, at.index, at.counts, at.target);
      kernel.blockSumsFour(byBlocks.blocks, at.target, nGood, nBad, sumsAt);
    } else {
      kernel.scatterFour(cells, at.index, at.counts, at.target);
      const blocksB = kernel.totalsFour(cells, at.flagsB, at.target, at.good, at.bad);
      kernel.sumsFour(blocksB, at.good, at.bad, nGood, nBad, sumsAt);
    }
    for (let lane = 0; lane < LANES; lane++) {
      this.scoresOf(lane, pairs, scores);
      out.aucChallenger[r + lane - offset] = scores[0];
      out.ksChallenger[r + lane - offset] = scores[1];
    }
  }
}

/** Scratch for runReplicateRange: the lanes where they apply, and the TypeScript kernel's (made
 * when first needed: with the lanes, only for replicates left over from a group of four). */
export interface RangeScratch {
  single: ReplicateScratch | null;
  lanes: FourLanes | null;
}

/**
 * `module`: the compiled kernel (lanesModule(), handed to worker threads), or null to run every
 * replicate in TypeScript (the tests compare the two).
 */
export function rangeScratch(plan: BootstrapPlan, module: CompiledLanes | null = lanesModule()): RangeScratch {
  const lanes = module !== null && runsInLanes(plan) ? new FourLanes(module, plan) : null;
  return { single: lanes === null ? replicateScratch(plan) : null, lanes };
}

/**
 * Replicates [from, to), written at [from − offset, to − offset) of `out`: four at a time where the
 * lanes apply, the rest one at a time (runReplicates in bootstrap-kernel.ts). Same values either way.
 */
export function runReplicateRange(
  plan: BootstrapPlan,
  seed: number,
  from: number,
  to: number,
  out: ReplicateOutput,
  offset: number,
  scratch: RangeScratch,
  /** Tests only: sees each replicate's cell counts (champion order) before they are used. */
  inspect?: (replicate: number, counts: Uint16Array) => void,
): void {
  let r = from;
  if (scratch.lanes !== null) for (; r + LANES <= to; r += LANES) scratch.lanes.run(seed, r, out, offset, inspect);
  if (r < to) {
    scratch.single ??= replicateScratch(plan);
    runReplicates(plan, seed, r, to, out, offset, scratch.single, inspect);
  }
}
