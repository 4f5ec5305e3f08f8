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
import { economics } from './economics';
import type { Holdout } from './holdout';
import { knownRows, population } from './known-rows';
import { ks } from './ks';
import { safety, scoreBlocks, weighBlocks } from './order';
import { preparePolicyData } from './policy-data';
import { rankBoth } from './rank';
import { addChallengerSections } from './report-challengers';
import { segments } from './segments';
import { addSegmentPopulation } from './segment-population';
import { severalChallengers } from './several-challengers';
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
 * Order of work: both models sorted once (order.ts) → the bootstrap (bootstrap.ts, most of the
 * time) started on its threads, and beside it AUC, paired DeLong and KS (auc.ts, delong.ts,
 * ks.ts) → swap sets, swap matrix, strategy curve, band tables, curves, economics and data
 * quality on data prepared from the same orders (policy-data.ts and its consumers) → segments
 * (segments.ts) → calibration and stability → the bootstrap's results awaited → the verdict under
 * the adoption policy (verdict.ts). Cost: O(n log n) + O(replicates · cells).
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
export const engineVersion = '1.4.0';

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
  /** Told as each stage of this thread starts, the bootstrap running beside it or not (the benchmark's time and memory per stage). */
  onStage?: (stage: string) => void;
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
  request.onStage?.('ranking both models');
  const championSafety = safety(knownHoldout.champion, knownHoldout.higherIs.champion);
  // The challenger's safety scores may be lent to a thread (rank.ts) when they are a new array.
  const ranked = await rankBoth(championSafety, safety(knownHoldout.challenger, knownHoldout.higherIs.challenger), bad, {
    threads: request.threads,
    lend: knownHoldout.higherIs.challenger !== 'safer',
  });
  const challengerSafety = ranked.challengerValues;
  let championBlocks = ranked.champion;
  let challengerBlocks = ranked.challenger;
  if (knownHoldout.weight) {
    championBlocks = weighBlocks(championBlocks, knownHoldout.weight);
    challengerBlocks = weighBlocks(challengerBlocks, knownHoldout.weight);
  }
  // Several challengers: the further ones ranked the same way (one sort each).
  const moreBlocks = (knownHoldout.moreChallengers ?? []).map((extra) => {
    const blocks = scoreBlocks(safety(extra.scores, extra.higherIs), bad);
    return knownHoldout.weight ? weighBlocks(blocks, knownHoldout.weight) : blocks;
  });
  // With replicates, the bootstrap's threads run beside every later stage until its results are
  // needed (the difference's intervals and the verdict): both cores work on every stage. Those
  // stages then report nothing until it ends (its share of the bar is the largest), and an error
  // in one of them stops the threads.
  const beside = settings.bootstrap > 0;
  report(PROGRESS.ranked, beside ? `Bootstrap 0 of ${count(settings.bootstrap)}` : 'AUC, DeLong and KS');
  const span = PROGRESS.bootstrap - PROGRESS.ranked;
  const stop = new AbortController();
  let bootstrapDone = !beside;
  const booting = bootstrap(championBlocks, challengerBlocks, bad, {
    replicates: settings.bootstrap,
    seed: settings.seed,
    confidence: settings.confidence,
    threads: request.threads,
    signal: stop.signal,
    onProgress: (done, total) => report(PROGRESS.ranked + (span * done) / total, `Bootstrap ${count(done)} of ${count(total)}`),
  }, moreBlocks);
  booting.then(
    () => (bootstrapDone = true),
    () => {},
  );
  const stage = (fraction: number, label: string) => {
    if (bootstrapDone) report(fraction, label);
  };
  // Between stages, the event loop hands the threads their next blocks.
  const breathe = () => (beside ? new Promise<void>((resolve) => setImmediate(resolve)) : Promise.resolve());

  let boot: Awaited<typeof booting>;
  let several: ReturnType<typeof severalChallengers>;
  let delong: ReturnType<typeof severalChallengers>['vsChampion'][number]['delong'];
  let moreKs: ReturnType<typeof ks>[];
  let championKs: ReturnType<typeof ks>;
  let challengerKs: ReturnType<typeof ks>;
  let data: ReturnType<typeof preparePolicyData>;
  let knownData: ReturnType<typeof preparePolicyData>;
  let swap: SwapSets;
  let swapAtPolicyRate: SwapSets | null = null;
  let matrix: ReturnType<typeof swapMatrix>;
  let strategy: ReturnType<typeof strategyCurve>;
  let bands: { champion: ReturnType<typeof bandTable>; challenger: ReturnType<typeof bandTable> };
  let curvePoints: ReturnType<typeof curves>;
  let profit: ReturnType<typeof economics> | null;
  let quality: ReturnType<typeof dataQuality>;
  let segmentRows: SegmentRow[];
  let calibration: ReturnType<typeof calibrationSection>;
  let stability: ReturnType<typeof stabilitySection>;
  try {
    // Each challenger against the champion (the primary's is the two-model paired DeLong, unchanged),
    // Holm across them, every pair, and the joint test.
    request.onStage?.('AUC, DeLong and KS');
    several = severalChallengers(championBlocks, [challengerBlocks, ...moreBlocks], bad, settings.confidence);
    delong = several.vsChampion[0].delong;
    championKs = ks(championBlocks, holdout.higherIs.champion);
    challengerKs = ks(challengerBlocks, holdout.higherIs.challenger);
    moreKs = moreBlocks.map((blocks, index) => ks(blocks, holdout.moreChallengers![index].higherIs));
    stage(PROGRESS.delong, 'Swap sets, strategy curve and bands');
    await breathe();

    request.onStage?.('policy data (sorted positions, bands)');
    const knownOrders = { champion: championBlocks.order, challenger: challengerBlocks.order };
    data = preparePolicyData(holdout, {
      bands: settings.bands,
      orders: knownHoldout === holdout ? knownOrders : undefined,
      blocks: knownHoldout === holdout ? { champion: championBlocks, challenger: challengerBlocks } : undefined,
      moreOrders: knownHoldout === holdout ? moreBlocks.map((blocks) => blocks.order) : undefined,
      safety: knownHoldout === holdout ? { champion: championSafety, challenger: challengerSafety } : undefined,
      inference,
    });
    // Curves and economics need an outcome: the rows with one (the same data when all are known).
    knownData =
      knownHoldout === holdout ? data : preparePolicyData(knownHoldout, { bands: settings.bands, orders: knownOrders, moreOrders: moreBlocks.map((blocks) => blocks.order) });
    request.onStage?.('swap sets, swap matrix, strategy curve, bands');
    swap = swapSets(
      data,
      settings.cutoffs === null
        ? { basis: 'approval-rate', approvalRate: settings.approvalRate }
        : { basis: 'cutoffs', cutoffs: settings.cutoffs },
      settings.confidence,
    );
    if (policy.swapRule.enabled) {
      swapAtPolicyRate =
        swap.basis === 'approval-rate' && swap.requestedApprovalRate === policy.swapRule.approvalRate
          ? swap
          : swapSets(data, { basis: 'approval-rate', approvalRate: policy.swapRule.approvalRate }, settings.confidence);
    }
    await breathe();
    matrix = swapMatrix(data);
    strategy = strategyCurve(data, settings.approvalRate);
    bands = { champion: bandTable(data, 'champion'), challenger: bandTable(data, 'challenger') };
    await breathe();
    request.onStage?.('curves and economics');
    curvePoints = curves(knownData);
    profit = settings.economics === null ? null : economics(knownData, settings.economics);
    await breathe();
    request.onStage?.('data quality');
    quality = dataQuality(
      holdout,
      data,
      request.read ?? { rowsRead: n, rowsDroppedMissingScore: 0, missingByColumn: {} },
      knownHoldout === holdout ? { champion: championBlocks, challenger: challengerBlocks } : undefined,
    );
    stage(PROGRESS.policy, 'Segments');
    await breathe();

    request.onStage?.('segments');
    segmentRows = segments(knownHoldout, {
      champion: championBlocks,
      challenger: challengerBlocks,
      policy,
      confidence: settings.confidence,
    });
    if (!plain) addSegmentPopulation(segmentRows, holdout);
    await breathe();
    // On the rows with a known outcome (their own bands), with their sampling weights.
    const sectionInput = {
      holdout: knownHoldout,
      data: knownData,
      settings,
      policy,
      pd: { champion: mapping.probabilityOfDefault?.champion === true, challenger: mapping.probabilityOfDefault?.challenger === true },
      columns: { champion: mapping.champion, challenger: mapping.challenger },
      weights: knownHoldout.weight ?? null,
      overallDeltaGini: delong.difference.gini,
      reference: request.reference ?? null,
    };
    request.onStage?.('calibration');
    calibration = calibrationSection(sectionInput);
    await breathe();
    request.onStage?.('stability');
    stability = stabilitySection(sectionInput);
    request.onStage?.('waiting for the bootstrap');
    boot = await booting;
  } catch (error) {
    stop.abort(error);
    await booting.catch(() => {});
    throw error;
  }
  request.onStage?.('verdict and the challengers’ sections');
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
  result.calibration = calibration;
  result.stability = stability;
  result.verdict = verdict(result, policy, swapAtPolicyRate);
  addChallengerSections(result, {
    holdout,
    knownHoldout,
    data,
    knownData,
    settings,
    policy,
    mapping,
    read: request.read ?? { rowsRead: n, rowsDroppedMissingScore: 0, missingByColumn: {} },
    championBlocks,
    blocks: [challengerBlocks, ...moreBlocks],
    several,
    championKs,
    ks: [challengerKs, ...moreKs],
    boot,
    swapAtPolicyRate,
  });
  report(1, 'Done');
  return result;
}
