import { availableParallelism } from 'node:os';
import type { Worker } from 'node:worker_threads';
import type { Bootstrap, Histogram, Interval } from '@shared/report';
import { startWorker } from '@server/runtime';
import type { BootstrapPlan, ReplicateOutput } from './bootstrap-kernel';
import { type CompiledLanes, lanesModule, rangeScratch, runReplicateRange, runsInLanes } from './bootstrap-lanes';
import { blockTotalsPay, withChallengerBlocks } from './bootstrap-blocks';
import { planBootstrap } from './bootstrap-plan';
import { SCATTER_CELLS, stageScatter } from './bootstrap-scatter';
import type { ScoreBlocks } from './order';
import { StatisticError } from './statistic-error';

/**
 * Paired, stratified bootstrap of both models' AUC (as Gini) and KS (Efron & Tibshirani 1993,
 * "An Introduction to the Bootstrap", ch. 6 and 13; percentile intervals as in Carpenter &
 * Bithell 2000, Statistics in Medicine 19:1141–1164).
 *
 * Each replicate resamples the accounts with replacement, goods and bads separately (stratified
 * by outcome, so every replicate keeps the holdout's n_good and n_bad), and scores the same
 * resampled accounts with both models (paired). Per replicate: AUC and KS of each model, ΔGini =
 * 2·(AUC_challenger − AUC_champion) and ΔKS. Intervals are the percentile interval at the
 * report's confidence (R's quantile type 7 of the replicate values); the replicate distributions
 * are kept binned for histograms.
 *
 * Speed: the accounts are grouped once into (champion score, challenger score, outcome) cells
 * and each replicate draws the multinomial cell counts exactly, never re-sorting
 * (bootstrap-kernel.ts); AUC and KS of each model then come from its totals at its blocks of equal
 * scores, taken in the same pass as the draw for the champion, and for the challenger either from
 * its cell counts in its order or, where its blocks hold many cells, from block totals added up
 * during the draw (bootstrap-blocks.ts). Cost per replicate O(cells + √n); the
 * replicates run on worker threads (bootstrap-worker.ts), in fixed blocks, each replicate with
 * its own seeded stream: the same seed gives identical output for any number of threads.
 *
 * Sampling weights (the blocks carry them): the same paired, stratified resampling of rows, each
 * drawn row keeping its weight; AUC and KS of a replicate are the weighted ones
 * (bootstrap-kernel.ts).
 */

export interface BootstrapOptions {
  replicates: number;
  seed: number;
  confidence: number;
  /** Worker threads; 0 runs in this thread. Default: one per core, none for small jobs. */
  threads?: number;
  /** Replicates done so far, and the total. */
  onProgress?: (done: number, total: number) => void;
  /** Stops the threads; the promise then rejects with the signal's reason. */
  signal?: AbortSignal;
  /** Cells from which the challenger-order writes are staged (default SCATTER_CELLS; tests set it low). */
  stageFrom?: number;
  /** false: every replicate on the TypeScript kernel, none on the WebAssembly lanes (tests compare them). */
  lanes?: boolean;
}

export interface BootstrapResult {
  section: Bootstrap;
  /** Percentile intervals; null when replicates = 0. */
  deltaGiniCi: Interval | null;
  deltaKsCi: Interval | null;
  championKsCi: Interval | null;
  challengerKsCi: Interval | null;
  /** The replicate values, for callers that want more than the intervals. */
  replicates: { deltaGini: Float64Array; deltaKs: Float64Array; championKs: Float64Array; challengerKs: Float64Array } | null;
  /**
   * Further challengers (several challengers), in the order given: each against the champion on
   * the same resampled rows. Empty for two models.
   */
  more: MoreChallengerBootstrap[];
}

export interface MoreChallengerBootstrap {
  deltaGiniCi: Interval | null;
  deltaKsCi: Interval | null;
  challengerKsCi: Interval | null;
  histograms: { deltaGini: Histogram; deltaKs: Histogram; challengerKs: Histogram } | null;
  replicates: { deltaGini: Float64Array; deltaKs: Float64Array; challengerKs: Float64Array } | null;
}

/** Replicates per task handed to a thread (a multiple of four, bootstrap-four.ts). Fixed, so the split never depends on thread count. */
export const BLOCK = 24;
const HISTOGRAM_BINS = 40;
/**
 * Blocks handed to each thread ahead of its results: a thread keeps working while the calling
 * thread is busy with other stages (report.ts runs them beside the bootstrap) and cannot answer.
 */
const AHEAD = 3;
/** Below this many cell visits (cells × replicates) threads cost more than they save. */
const THREAD_THRESHOLD = 4_000_000;

/** R's quantile(type = 7) of sorted values. */
function quantile(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

function percentileInterval(values: Float64Array, confidence: number): Interval {
  const sorted = Float64Array.from(values).sort();
  const alpha = 1 - confidence;
  return [quantile(sorted, alpha / 2), quantile(sorted, 1 - alpha / 2)];
}

/** Equal-width bins from the smallest to the largest value; one bin when all are equal. */
export function histogram(values: Float64Array, bins = HISTOGRAM_BINS): Histogram {
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!(max > min)) return { edges: [min, max], counts: [values.length] };
  const width = (max - min) / bins;
  const edges = Array.from({ length: bins + 1 }, (_, i) => (i === bins ? max : min + i * width));
  const counts = new Array<number>(bins).fill(0);
  for (const v of values) counts[Math.min(bins - 1, Math.floor((v - min) / width))]++;
  return { edges, counts };
}

function allocate(length: number, more: number): ReplicateOutput {
  return {
    aucChampion: new Float64Array(length),
    aucChallenger: new Float64Array(length),
    ksChampion: new Float64Array(length),
    ksChallenger: new Float64Array(length),
    aucMore: Array.from({ length: more }, () => new Float64Array(length)),
    ksMore: Array.from({ length: more }, () => new Float64Array(length)),
  };
}

async function runOnThreads(plan: BootstrapPlan, lanes: CompiledLanes | null, options: BootstrapOptions, threads: number, out: ReplicateOutput): Promise<void> {
  const total = options.replicates;
  const blocks = Math.ceil(total / BLOCK);
  let nextBlock = 0;
  let done = 0;
  const workers: Worker[] = [];
  const { signal } = options;
  let onAbort: (() => void) | null = null;
  try {
    signal?.throwIfAborted();
    const aborted = new Promise<never>((_, reject) => {
      onAbort = () => reject(signal!.reason);
      signal?.addEventListener('abort', onAbort, { once: true });
    });
    aborted.catch(() => {});
    const run = Promise.all(
      Array.from({ length: Math.min(threads, blocks) }, async () => {
        const worker = startWorker('server/stats/bootstrap-worker', { workerData: { plan, seed: options.seed, lanes } });
        workers.push(worker);
        let pending = 0;
        await new Promise<void>((resolve, reject) => {
          const dispatch = () => {
            while (pending < AHEAD && nextBlock < blocks) {
              const from = nextBlock++ * BLOCK;
              pending++;
              worker.postMessage({ from, to: Math.min(total, from + BLOCK) });
            }
            if (pending === 0) resolve();
          };
          worker.on('message', (message: { from: number; to: number; result: ReplicateOutput }) => {
            const { from, to, result } = message;
            out.aucChampion.set(result.aucChampion, from);
            out.aucChallenger.set(result.aucChallenger, from);
            out.ksChampion.set(result.ksChampion, from);
            out.ksChallenger.set(result.ksChallenger, from);
            result.aucMore?.forEach((values, m) => out.aucMore![m].set(values, from));
            result.ksMore?.forEach((values, m) => out.ksMore![m].set(values, from));
            pending--;
            done += to - from;
            options.onProgress?.(done, total);
            dispatch();
          });
          worker.on('error', reject);
          worker.on('exit', (code) => {
            if (code !== 0) reject(new Error(`bootstrap worker stopped with exit code ${code}`));
          });
          dispatch();
        });
      }),
    );
    // After an abort the threads are stopped below, which fails `run`: nobody waits for it then.
    run.catch(() => {});
    await Promise.race([run, aborted]);
  } finally {
    if (onAbort) signal?.removeEventListener('abort', onAbort);
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
}

async function runHere(plan: BootstrapPlan, lanes: CompiledLanes | null, options: BootstrapOptions, out: ReplicateOutput): Promise<void> {
  const scratch = rangeScratch(plan, lanes);
  const total = options.replicates;
  for (let from = 0; from < total; from += BLOCK) {
    const to = Math.min(total, from + BLOCK);
    options.signal?.throwIfAborted();
    runReplicateRange(plan, options.seed, from, to, out, 0, scratch);
    options.onProgress?.(to, total);
    // Let the event loop breathe (progress messages, cancellation) between blocks.
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
}

export async function bootstrap(
  champion: ScoreBlocks,
  challenger: ScoreBlocks,
  bad: Uint8Array,
  options: BootstrapOptions,
  /** Further challengers, scored on the same resampled rows (cells of every model's blocks). */
  moreModels: readonly ScoreBlocks[] = [],
): Promise<BootstrapResult> {
  const { replicates, seed, confidence } = options;
  const section: Bootstrap = { replicates, seed, confidence, method: 'paired-stratified-percentile', histograms: null };
  if (!Number.isInteger(replicates) || replicates < 0) throw new StatisticError(`bootstrap replicates must be a whole number ≥ 0, got ${replicates}`);
  if (replicates === 0) {
    const none = { deltaGiniCi: null, deltaKsCi: null, challengerKsCi: null, histograms: null, replicates: null };
    return { section, deltaGiniCi: null, deltaKsCi: null, championKsCi: null, challengerKsCi: null, replicates: null, more: moreModels.map(() => none) };
  }
  if (champion.nGood === 0 || champion.nBad === 0) throw new StatisticError('the bootstrap requires at least one good and one bad');

  const planned = planBootstrap(champion, challenger, bad, champion.weights?.row ?? null, moreModels);
  // On the WebAssembly lanes the challenger goes by block totals where its blocks hold many cells
  // (bootstrap-blocks.ts); the TypeScript kernel stages its challenger-order writes in large plans
  // (bootstrap-scatter.ts). The same replicates every way.
  const lanes = options.lanes === false ? null : lanesModule();
  const plan =
    lanes !== null && runsInLanes(planned)
      ? blockTotalsPay(planned)
        ? withChallengerBlocks(planned)
        : planned
      : planned.cells >= (options.stageFrom ?? SCATTER_CELLS)
        ? stageScatter(planned)
        : planned;
  const out = allocate(replicates, moreModels.length);
  const cores = Math.max(1, availableParallelism());
  const threads = options.threads ?? (plan.cells * replicates >= THREAD_THRESHOLD ? cores : 0);
  if (threads > 0) await runOnThreads(plan, lanes, options, threads, out);
  else await runHere(plan, lanes, options, out);

  const deltaGini = new Float64Array(replicates);
  const deltaKs = new Float64Array(replicates);
  for (let r = 0; r < replicates; r++) {
    deltaGini[r] = 2 * (out.aucChallenger[r] - out.aucChampion[r]);
    deltaKs[r] = out.ksChallenger[r] - out.ksChampion[r];
  }
  section.histograms = {
    deltaGini: histogram(deltaGini),
    deltaKs: histogram(deltaKs),
    championKs: histogram(out.ksChampion),
    challengerKs: histogram(out.ksChallenger),
  };
  return {
    section,
    deltaGiniCi: percentileInterval(deltaGini, confidence),
    deltaKsCi: percentileInterval(deltaKs, confidence),
    championKsCi: percentileInterval(out.ksChampion, confidence),
    challengerKsCi: percentileInterval(out.ksChallenger, confidence),
    replicates: { deltaGini, deltaKs, championKs: out.ksChampion, challengerKs: out.ksChallenger },
    more: moreModels.map((_, m) => {
      const auc = out.aucMore![m];
      const ks = out.ksMore![m];
      const moreGini = new Float64Array(replicates);
      const moreKs = new Float64Array(replicates);
      for (let r = 0; r < replicates; r++) {
        moreGini[r] = 2 * (auc[r] - out.aucChampion[r]);
        moreKs[r] = ks[r] - out.ksChampion[r];
      }
      return {
        deltaGiniCi: percentileInterval(moreGini, confidence),
        deltaKsCi: percentileInterval(moreKs, confidence),
        challengerKsCi: percentileInterval(ks, confidence),
        histograms: { deltaGini: histogram(moreGini), deltaKs: histogram(moreKs), challengerKs: histogram(ks) },
        replicates: { deltaGini: moreGini, deltaKs: moreKs, challengerKs: ks },
      };
    }),
  };
}
