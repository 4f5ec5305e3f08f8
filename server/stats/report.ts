import type { z } from 'zod';
import { formatCount } from '@shared/format';
import { type AdoptionPolicy, defaultAdoptionPolicy } from '@shared/policy';
import {
  analysisSettingsSchema,
  type ColumnMapping,
  defaultRejectInference,
  maxAmountMagnitude,
  type SegmentRow,
  type Difference,
  type ModelMetrics,
  type Report,
  type SwapSets,
} from '@shared/report';
import { bandTable } from './bands';
import { bootstrap } from './bootstrap';
import { calibrationSection, type ReferenceSample, stabilitySection } from './calibration-stability';
import { curves } from './curves';
import { dataQuality } from './data-quality';
import { pairedDelong } from './delong';
import { economics } from './economics';
import type { Holdout } from './holdout';
import { levelOrder } from './holdout';
import { knownRows, population } from './known-rows';
import { ks } from './ks';
import { safety, scoreBlocks, weighBlocks } from './order';
import { preparePolicyData } from './policy-data';
import { segments } from './segments';
import { StatisticError } from './statistic-error';
import { strategyCurve } from './strategy-curve';
import { swapMatrix } from './swap-matrix';
import { swapSets } from './swap-sets';
import { verdict } from './verdict';

/**
 * The whole comparison of one holdout: every section of shared/report.ts `Report`, from the
 * Holdout in column form. A plain async function over typed arrays, so it runs the same in the
 * CLI, in a test, or inside a job's worker thread (the bootstrap starts its own threads).
 *
 * Order of work: both models sorted once (order.ts) → AUC, paired DeLong and KS (auc.ts,
 * delong.ts, ks.ts) → the bootstrap (bootstrap.ts, most of the time) → swap sets, swap matrix,
 * strategy curve, band tables, curves, economics and data quality on data prepared from the same
 * orders (policy-data.ts and its consumers) → segments (segments.ts) → the verdict under the
 * adoption policy (verdict.ts). Cost: O(n log n) + O(replicates · cells).
 *
 * Sampling weights and applicants without an outcome (holdout.weight, holdout.known): AUC, KS,
 * DeLong, the bootstrap, curves, economics and the segments' Ginis use the rows with a known
 * outcome (known-rows.ts), weighted; approval rates, cut-offs, swap sets, the swap matrix, the
 * strategy curve and the band tables use every row, weighted, with bad rates of the known
 * accounts and the reject inference of the settings (policy-data.ts, swap-sets-weighted.ts). The
 * report then carries `population`. Without either, the report is as before to the byte.
 * Calibration and stability (calibration-stability.ts) come last, on the rows with a known
 * outcome, weighted, before the verdict.
 */

/** Version of the statistics engine, stored with every report (bump when a number can change). */
export const engineVersion = '1.3.0';

export interface AnalysisProgress {
  /** 0 to 1. */
  fraction: number;
  /** What is being done, e.g. "Bootstrap 1,200 of 2,000". */
  stage: string;
}

export interface BuildReportInput {
  holdout: Holdout;
  input: Report['input'];
  mapping: ColumnMapping;
  /** Missing fields take analysisSettingsSchema's defaults. */
  settings?: z.input<typeof analysisSettingsSchema>;
  /** Default: defaultAdoptionPolicy (shared/policy.ts). */
  policy?: AdoptionPolicy;
  /** What the reader counted (reader/load.ts `ReadSummary`); without it the holdout is taken as read. */
  read?: { rowsRead: number; rowsDroppedMissingScore: number; missingByColumn: Record<string, number> };
  onProgress?: (progress: AnalysisProgress) => void;
  /** Bootstrap threads (see bootstrap.ts); default one per core for large jobs. */
  threads?: number;
  /** The development sample's scores, for the PSI (calibration-stability.ts); null or absent: none. */
  reference?: ReferenceSample | null;
}

const count = (value: number) => formatCount(value);

// Share of the progress bar each stage ends at.
const PROGRESS = { ranked: 0.04, delong: 0.06, bootstrap: 0.9, policy: 0.96, segments: 0.99 } as const;

export async function buildReport(request: BuildReportInput): Promise<Report> {
  const { holdout, mapping } = request;
  const settings = analysisSettingsSchema.parse(request.settings ?? {});
  const policy = request.policy ?? defaultAdoptionPolicy;
  let last = 0;
  const report = (fraction: number, stage: string) => {
    last = Math.max(last, Math.min(1, fraction));
    request.onProgress?.({ fraction: last, stage });
  };
  const plain = !holdout.weight && !holdout.known;
  // Sums of amounts and weights must stay finite (the reader refuses such rows, naming them).
  for (const [column, values] of [['exposure', holdout.exposure], ['weight', holdout.weight ?? null]] as const) {
    if (values === null) continue;
    for (let i = 0; i < values.length; i++) {
      if (!(Math.abs(values[i]) <= maxAmountMagnitude)) throw new StatisticError(`${column} of account ${i + 1} is ${values[i]}; amounts and weights must be finite and at most 1e15 in size`);
    }
  }
  const knownHoldout = knownRows(holdout);
  const { n, bad } = knownHoldout;
  let bads = 0;
  for (let i = 0; i < n; i++) bads += bad[i];
  if (bads === 0 || bads === n) throw new StatisticError('a comparison requires at least one good and one bad', 'single_class');
  const inference = settings.rejectInference ?? defaultRejectInference;

  report(0, 'Ranking both models');
  const championSafety = safety(knownHoldout.champion, knownHoldout.higherIs.champion);
  const challengerSafety = safety(knownHoldout.challenger, knownHoldout.higherIs.challenger);
  let championBlocks = scoreBlocks(championSafety, bad);
  let challengerBlocks = scoreBlocks(challengerSafety, bad);
  if (knownHoldout.weight) {
    championBlocks = weighBlocks(championBlocks, knownHoldout.weight);
    challengerBlocks = weighBlocks(challengerBlocks, knownHoldout.weight);
  }
  report(PROGRESS.ranked, 'AUC, DeLong and KS');

  const delong = pairedDelong(championBlocks, challengerBlocks, bad, settings.confidence);
  const championKs = ks(championBlocks, holdout.higherIs.champion);
  const challengerKs = ks(challengerBlocks, holdout.higherIs.challenger);
  report(PROGRESS.delong, settings.bootstrap > 0 ? `Bootstrap 0 of ${count(settings.bootstrap)}` : 'Swap sets, strategy curve and bands');

  const span = PROGRESS.bootstrap - PROGRESS.delong;
  const boot = await bootstrap(championBlocks, challengerBlocks, bad, {
    replicates: settings.bootstrap,
    seed: settings.seed,
    confidence: settings.confidence,
    threads: request.threads,
    onProgress: (done, total) => report(PROGRESS.delong + (span * done) / total, `Bootstrap ${count(done)} of ${count(total)}`),
  });
  report(PROGRESS.bootstrap, 'Swap sets, strategy curve and bands');

  const knownOrders = { champion: championBlocks.order, challenger: challengerBlocks.order };
  const data = preparePolicyData(holdout, {
    bands: settings.bands,
    orders: knownHoldout === holdout ? knownOrders : undefined,
    inference,
  });
  // Curves and economics need an outcome: the rows with one (the same data when all are known).
  const knownData = knownHoldout === holdout ? data : preparePolicyData(knownHoldout, { bands: settings.bands, orders: knownOrders });
  const swap = swapSets(
    data,
    settings.cutoffs === null
      ? { basis: 'approval-rate', approvalRate: settings.approvalRate }
      : { basis: 'cutoffs', cutoffs: settings.cutoffs },
    settings.confidence,
  );
  let swapAtPolicyRate: SwapSets | null = null;
  if (policy.swapRule.enabled) {
    swapAtPolicyRate =
      swap.basis === 'approval-rate' && swap.requestedApprovalRate === policy.swapRule.approvalRate
        ? swap
        : swapSets(data, { basis: 'approval-rate', approvalRate: policy.swapRule.approvalRate }, settings.confidence);
  }
  const matrix = swapMatrix(data);
  const strategy = strategyCurve(data, settings.approvalRate);
  const bands = { champion: bandTable(data, 'champion'), challenger: bandTable(data, 'challenger') };
  const curvePoints = curves(knownData);
  const profit = settings.economics === null ? null : economics(knownData, settings.economics);
  const quality = dataQuality(holdout, data, request.read ?? { rowsRead: n, rowsDroppedMissingScore: 0, missingByColumn: {} });
  report(PROGRESS.policy, 'Segments');

  const segmentRows = segments(knownHoldout, {
    champion: championBlocks,
    challenger: challengerBlocks,
    policy,
    confidence: settings.confidence,
  });
  if (!plain) addSegmentPopulation(segmentRows, holdout);
  report(PROGRESS.segments, 'Verdict');

  const model = (name: 'champion' | 'challenger', ksResult: { ks: number; score: number }, ksCi: [number, number] | null): ModelMetrics => {
    const { auc, aucSe, aucCi, gini, giniCi } = delong[name];
    return { higherIs: holdout.higherIs[name], auc, aucSe, aucCi, gini, giniCi, ks: ksResult.ks, ksScore: ksResult.score, ksCi };
  };
  const difference: Difference = {
    ...delong.difference,
    giniBootstrapCi: boot.deltaGiniCi,
    ks: challengerKs.ks - championKs.ks,
    ksCi: boot.deltaKsCi,
  };
  const result: Report = {
    engineVersion,
    input: request.input,
    mapping,
    settings,
    policy,
    rows: n,
    goods: n - bads,
    bads,
    badRate: plain ? bads / n : data.bads / data.knownAccounts,
    ...(plain ? {} : { population: population(holdout) }),
    champion: model('champion', championKs, boot.championKsCi),
    challenger: model('challenger', challengerKs, boot.challengerKsCi),
    difference,
    bootstrap: boot.section,
    swap,
    swapMatrix: matrix,
    strategyCurve: strategy,
    bands,
    segments: segmentRows,
    dataQuality: quality,
    curves: curvePoints,
    economics: profit,
    verdict: { outcome: 'not-proven', policyVersion: policy.version, criteria: [], summary: '' },
  };
  // On the rows with a known outcome (their own bands), with their sampling weights.
  const weights: Float64Array | null = knownHoldout.weight ?? null;
  const sectionInput = {
    holdout: knownHoldout,
    data: knownData,
    settings,
    policy,
    pd: { champion: mapping.probabilityOfDefault?.champion === true, challenger: mapping.probabilityOfDefault?.challenger === true },
    columns: { champion: mapping.champion, challenger: mapping.challenger },
    weights,
    overallDeltaGini: difference.gini,
    reference: request.reference ?? null,
  };
  result.calibration = calibrationSection(sectionInput);
  result.stability = stabilitySection(sectionInput);
  result.verdict = verdict(result, policy, swapAtPolicyRate);
  report(1, 'Done');
  return result;
}

/** Each segment row's applicants (weighted, every row) and those without an outcome. O(n) per column. */
function addSegmentPopulation(rows: SegmentRow[], holdout: Holdout): void {
  const weight = holdout.weight ?? null;
  const known = holdout.known ?? null;
  for (const column of holdout.segments) {
    const accounts = new Float64Array(column.levels.length);
    const unknown = new Float64Array(column.levels.length);
    for (let i = 0; i < holdout.n; i++) {
      const w = weight === null ? 1 : weight[i];
      accounts[column.codes[i]] += w;
      if (known !== null && !known[i]) unknown[column.codes[i]] += w;
    }
    for (const level of levelOrder(column.levels)) {
      const row = rows.find((candidate) => candidate.column === column.column && candidate.value === column.levels[level]);
      if (row) {
        row.accounts = accounts[level];
        row.unknown = unknown[level];
      }
    }
  }
}
