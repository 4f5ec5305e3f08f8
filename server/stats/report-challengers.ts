import { choiceSummary, recommendedChallenger } from '@shared/choose-challenger';
import type { AdoptionPolicy } from '@shared/policy';
import {
  type AnalysisSettings,
  championOf,
  challengersOf,
  type ChallengerResult,
  type ColumnMapping,
  type Report,
  statedBadRate,
  type SwapSets,
} from '@shared/report';
import { approvalPatterns } from './approval-patterns';
import { bandTable } from './bands';
import type { BootstrapResult } from './bootstrap';
import { calibrationSection, stabilitySection } from './calibration-stability';
import { dataQuality, type ReadSummary } from './data-quality';
import { type Holdout, withChallenger } from './holdout';
import type { ScoreBlocks } from './order';
import { pairData, type PreparedHoldout } from './policy-data';
import { addSegmentPopulation } from './segment-population';
import { segments } from './segments';
import type { SeveralChallengers } from './several-challengers';
import { swapSets } from './swap-sets';
import { verdict } from './verdict';

/**
 * The several-challenger sections of the report (shared/report.ts `challengers`, `pairwise`,
 * `joint`, `choice`, `approvalPatterns`), from what buildReport computed for every model: the
 * DeLong results (several-challengers.ts), each model's KS, the bootstrap paired across all
 * models, and the primary's finished report. Each further challenger gets its own prepared data
 * against the champion (policy-data.ts withOtherChallenger, re-using the champion's), swap sets
 * at the report's and the policy's approval rate, segments (for the segment rule, with their
 * applicants as the primary's), its band table, calibration
 * and stability sections (for their rules: a further challenger is never marked as a PD and has
 * no reference scores, which those rules state), data quality and its verdict. With two or more
 * challengers every verdict, the primary's included, judges significance on the Holm-adjusted p.
 * The recommended challenger: shared/choose-challenger.ts.
 * Cost: per further challenger O(n) with its order (the known rows' order serves when every
 * outcome is known), else O(n log n); plus O(2^(K+1) + (K+1)·n) for the approval patterns.
 */
export interface ChallengerSectionsInput {
  holdout: Holdout;
  knownHoldout: Holdout;
  data: PreparedHoldout;
  knownData: PreparedHoldout;
  settings: AnalysisSettings;
  policy: AdoptionPolicy;
  mapping: ColumnMapping;
  read: ReadSummary;
  championBlocks: ScoreBlocks;
  /** Every challenger's blocks (rows with an outcome), the primary first. */
  blocks: readonly ScoreBlocks[];
  several: SeveralChallengers;
  /** KS of the champion and of each challenger (primary first). */
  championKs: { ks: number; score: number };
  ks: readonly { ks: number; score: number }[];
  boot: BootstrapResult;
  /** The primary's swap sets at the policy's approval rate (null with the swap rule off). */
  swapAtPolicyRate: SwapSets | null;
}

export type ChallengerSections = Required<Pick<Report, 'challengers' | 'pairwise' | 'joint' | 'choice' | 'approvalPatterns'>>;

/** Fills the sections in `report` (the primary's report, complete); with K ≥ 2 re-judges its verdict on the Holm p. */
export function addChallengerSections(report: Report, input: ChallengerSectionsInput): void {
  const { holdout, knownHoldout, data, settings, policy, mapping, several, boot } = input;
  const specs = challengersOf(mapping);
  const k = specs.length;
  const multiplicity = (index: number) => ({
    challengers: k,
    pOneSided: several.vsChampion[index].pOneSidedHolm,
    pTwoSided: several.vsChampion[index].pTwoSidedHolm,
  });
  if (k >= 2) report.verdict = verdict(report, policy, input.swapAtPolicyRate, multiplicity(0));
  const atRate = (prepared: PreparedHoldout, rate: number) => swapSets(prepared, { basis: 'approval-rate', approvalRate: rate }, settings.confidence);
  const primarySwap =
    report.swap.basis === 'approval-rate' && report.swap.requestedApprovalRate === settings.approvalRate ? report.swap : atRate(data, settings.approvalRate);
  const histograms = boot.section.histograms;
  const challengers: ChallengerResult[] = [
    {
      column: specs[0].column,
      name: specs[0].name,
      metrics: report.challenger,
      difference: report.difference,
      pOneSidedHolm: several.vsChampion[0].pOneSidedHolm,
      pTwoSidedHolm: several.vsChampion[0].pTwoSidedHolm,
      verdict: report.verdict,
      swap: primarySwap,
      score: report.dataQuality.challenger,
      scoreCorrelation: report.dataQuality.scoreCorrelation,
      histograms: histograms === null ? null : { deltaGini: histograms.deltaGini, deltaKs: histograms.deltaKs, challengerKs: histograms.challengerKs },
    },
  ];
  const prepared: PreparedHoldout[] = [data];
  const swapsAtPolicy: (SwapSets | null)[] = [input.swapAtPolicyRate];
  for (let index = 1; index < k; index++) {
    const extra = holdout.moreChallengers![index - 1];
    const blocks = input.blocks[index];
    const pairAll = pairData(data, index);
    const pairKnownData = knownHoldout === holdout ? pairAll : pairData(input.knownData, index);
    prepared.push(pairAll);
    const { delong } = several.vsChampion[index];
    const more = boot.more[index - 1];
    const ks = input.ks[index];
    const metrics = {
      higherIs: extra.higherIs,
      auc: delong.challenger.auc,
      aucSe: delong.challenger.aucSe,
      aucCi: delong.challenger.aucCi,
      gini: delong.challenger.gini,
      giniCi: delong.challenger.giniCi,
      ks: ks.ks,
      ksScore: ks.score,
      ksCi: more.challengerKsCi,
    };
    const difference = { ...delong.difference, giniBootstrapCi: more.deltaGiniCi, ks: ks.ks - input.championKs.ks, ksCi: more.deltaKsCi };
    const swap = atRate(pairAll, settings.approvalRate);
    const swapAtPolicy = !policy.swapRule.enabled ? null : policy.swapRule.approvalRate === settings.approvalRate ? swap : atRate(pairAll, policy.swapRule.approvalRate);
    swapsAtPolicy.push(swapAtPolicy);
    const pairKnown = withChallenger(knownHoldout, index);
    const segmentRows = segments(pairKnown, { champion: input.championBlocks, challenger: blocks, policy, confidence: settings.confidence });
    if (holdout.weight || holdout.known) addSegmentPopulation(segmentRows, holdout);
    const sectionInput = {
      holdout: pairKnown,
      data: pairKnownData,
      settings,
      policy,
      pd: { champion: mapping.probabilityOfDefault?.champion === true, challenger: false },
      columns: { champion: mapping.champion, challenger: extra.column },
      weights: knownHoldout.weight ?? null,
      overallDeltaGini: difference.gini,
      reference: null,
    };
    const evidence = {
      bads: report.bads,
      settings,
      difference,
      swap,
      segments: segmentRows,
      calibration: calibrationSection(sectionInput),
      stability: stabilitySection(sectionInput),
    };
    const quality = dataQuality(withChallenger(holdout, index), pairAll, input.read);
    for (const warning of quality.warnings) {
      if (/challenger/i.test(warning) && !report.dataQuality.warnings.includes(warning)) report.dataQuality.warnings.push(`${extra.name}: ${warning}`);
    }
    challengers.push({
      column: extra.column,
      name: extra.name,
      metrics,
      difference,
      pOneSidedHolm: several.vsChampion[index].pOneSidedHolm,
      pTwoSidedHolm: several.vsChampion[index].pTwoSidedHolm,
      verdict: verdict(evidence, policy, swapAtPolicy, multiplicity(index)),
      swap,
      score: quality.challenger,
      scoreCorrelation: quality.scoreCorrelation,
      histograms: more.histograms,
      segments: segmentRows,
      calibration: evidence.calibration,
      stability: evidence.stability,
      bands: bandTable(pairAll, 'challenger'),
    });
  }
  const candidates = challengers.map((challenger, index) => {
    const cell = (swapsAtPolicy[index] ?? challenger.swap).swapIn;
    return { name: challenger.name, outcome: challenger.verdict.outcome, gini: challenger.metrics.gini, swapInBadRate: statedBadRate(cell) };
  });
  const recommended = recommendedChallenger(candidates);
  const champion = championOf(mapping);
  report.challengers = challengers;
  report.pairwise = several.pairwise.map((pair) => ({ a: pair.a, b: pair.b, deltaGini: pair.deltaGini, se: pair.giniSe, z: pair.z, pTwoSided: pair.pTwoSided }));
  report.joint = several.joint;
  report.choice = { recommended, summary: choiceSummary(candidates, recommended, policy.version) };
  report.approvalPatterns = approvalPatterns(
    [
      { name: champion.name, column: champion.column, prepared: data.champion },
      ...prepared.map((pair, index) => ({ name: specs[index].name, column: specs[index].column, prepared: pair.challenger })),
    ],
    { bad: data.bad, weight: data.weight, known: data.known },
    settings.approvalRate,
  );
}
