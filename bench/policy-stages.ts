import type { Holdout } from '@server/stats/holdout';
import { bandTable } from '@server/stats/bands';
import { curves } from '@server/stats/curves';
import { dataQuality } from '@server/stats/data-quality';
import { economics } from '@server/stats/economics';
import { argsortAscending, safety } from '@server/stats/order';
import { preparePolicyData, type PreparedHoldout } from '@server/stats/policy-data';
import { strategyCurve } from '@server/stats/strategy-curve';
import { swapMatrix } from '@server/stats/swap-matrix';
import { swapSets } from '@server/stats/swap-sets';

/**
 * Timings of the decision-facing stages (swap sets, swap matrix, strategy curve, band tables and
 * the rest of server/stats/policy-data.ts's consumers) on a holdout the caller generates; the
 * benchmark (bench/index.ts) prints them. Each stage runs `runs` times; the median is reported.
 *
 * Targets (issue 3 and the engine brief): swap sets + matrix + strategy curve + bands < 500 ms at
 * 1,000,000 rows; the on-demand recomputation (swap sets + matrix + strategy curve on prepared
 * data) < 300 ms.
 */

export interface StageTiming {
  stage: string;
  medianMs: number;
  runsMs: number[];
}

export interface PolicyBenchOptions {
  runs?: number;
  bands?: number;
  approvalRate?: number;
  confidence?: number;
  /** Orders by safety the engine already has from the AUC/KS stage; computed here (untimed) if absent. */
  orders?: { champion: Uint32Array; challenger: Uint32Array };
}

export function benchPolicyStages(holdout: Holdout, options: PolicyBenchOptions = {}): StageTiming[] {
  const runs = options.runs ?? 5;
  const bands = options.bands ?? 10;
  const approvalRate = options.approvalRate ?? 0.7;
  const confidence = options.confidence ?? 0.95;
  const orders = options.orders ?? {
    champion: argsortAscending(safety(holdout.champion, holdout.higherIs.champion)),
    challenger: argsortAscending(safety(holdout.challenger, holdout.higherIs.challenger)),
  };
  const timings: StageTiming[] = [];
  const time = <T>(stage: string, run: () => T): T => {
    const runsMs: number[] = [];
    let result: T | undefined;
    for (let r = 0; r < runs; r++) {
      const start = performance.now();
      result = run();
      runsMs.push(performance.now() - start);
    }
    const sorted = [...runsMs].sort((a, b) => a - b);
    timings.push({ stage, medianMs: sorted[Math.floor(sorted.length / 2)], runsMs });
    return result as T;
  };

  time('policy: prepare, sorting both models', () => preparePolicyData(holdout, { bands }));
  const data: PreparedHoldout = time('policy: prepare, orders given', () => preparePolicyData(holdout, { bands, orders }));
  const atRate = { basis: 'approval-rate', approvalRate } as const;
  const swap = time('policy: swap sets at a matched approval rate', () => swapSets(data, atRate, confidence));
  time('policy: swap sets at given cut-offs', () =>
    swapSets(data, { basis: 'cutoffs', cutoffs: { champion: swap.champion.cutoff, challenger: swap.challenger.cutoff } }, confidence),
  );
  time('policy: swap matrix', () => swapMatrix(data));
  time('policy: strategy curve', () => strategyCurve(data, approvalRate));
  time('policy: band tables, both models', () => [bandTable(data, 'champion'), bandTable(data, 'challenger')]);
  time('policy: swap sets + matrix + strategy curve + bands (target < 500 ms)', () => [
    swapSets(data, atRate, confidence),
    swapMatrix(data),
    strategyCurve(data, approvalRate),
    bandTable(data, 'champion'),
    bandTable(data, 'challenger'),
  ]);
  time('policy: on demand, swap sets + matrix + strategy curve (target < 300 ms)', () => [
    swapSets(data, atRate, confidence),
    swapMatrix(data),
    strategyCurve(data, approvalRate),
  ]);
  time('policy: curves (ROC, CAP, KS chart)', () => curves(data));
  time('policy: data quality', () =>
    dataQuality(holdout, data, { rowsRead: holdout.n, rowsDroppedMissingScore: 0, missingByColumn: {} }),
  );
  if (holdout.exposure) {
    time('policy: economics, LGD × exposure', () => economics(data, { profitPerGood: 120, lossPerBad: null, lgd: 0.45 }));
  }
  return timings;
}
