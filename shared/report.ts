import { z } from 'zod';
import { calibrationSchema, stabilitySchema } from './calibration';
import { adoptionPolicySchema } from './policy';
import { statedBadRate } from './stated-bad-rate';

/**
 * The comparison report: what the engine computes for one holdout scored by both models.
 * The CLI prints it (`npm run compare -- FILE --json`), the API serves it, the client draws it.
 *
 * Conventions used throughout:
 * - "bad" is the event (the positive class); difference = challenger − champion.
 * - Scores are reported in each model's own units and orientation (`higherIs`).
 * - Gini and AUC are fractions (0.4213), not points; the client shows Gini in points (42.1).
 * - Rates and shares are fractions in [0, 1].
 * - A quantity that is undefined for the data (a bad rate of an empty group, a test with an empty
 *   side) is `null`, never NaN; the client shows it as "—" with the reason where one is given.
 * - Bands are numbered from 1 = riskiest.
 */

export const higherIsSchema = z.enum(['safer', 'riskier']);
export type HigherIs = z.infer<typeof higherIsSchema>;

export const intervalSchema = z.tuple([z.number(), z.number()]);
export type Interval = z.infer<typeof intervalSchema>;

export const modelMetricsSchema = z.object({
  higherIs: higherIsSchema,
  auc: z.number(),
  /** DeLong standard error of the AUC; null with fewer than 2 goods or 2 bads (difference.inference says so). */
  aucSe: z.number().nullable(),
  aucCi: intervalSchema.nullable(),
  gini: z.number(),
  giniCi: intervalSchema.nullable(),
  ks: z.number(),
  /** The score (in the model's own units) at which the KS gap is reached. */
  ksScore: z.number(),
  /** Bootstrap percentile interval of KS; null when the bootstrap was skipped. */
  ksCi: intervalSchema.nullable(),
});
export type ModelMetrics = z.infer<typeof modelMetricsSchema>;

export const differenceSchema = z.object({
  auc: z.number(),
  gini: z.number(),
  /**
   * DeLong standard error of ΔAUC: sqrt(V1 + V2 − 2C). This and the test and intervals below are
   * null with fewer than 2 goods or 2 bads (no sample variance); `inference` then says why.
   */
  se: z.number().nullable(),
  giniSe: z.number().nullable(),
  z: z.number().nullable(),
  pTwoSided: z.number().nullable(),
  /** One-sided p for H1: the challenger's AUC is higher. */
  pOneSided: z.number().nullable(),
  /** Δ ± z·se, clamped to the possible range ([−1, 1] for ΔAUC, [−2, 2] for ΔGini). */
  aucCi: intervalSchema.nullable(),
  giniCi: intervalSchema.nullable(),
  /** Bootstrap percentile interval of ΔGini, the cross-check on DeLong; null without bootstrap. */
  giniBootstrapCi: intervalSchema.nullable(),
  ks: z.number(),
  ksCi: intervalSchema.nullable(),
  /** DeLong covariance pieces, for audit: V(champion), V(challenger), C. */
  varianceChampion: z.number().nullable(),
  varianceChallenger: z.number().nullable(),
  covariance: z.number().nullable(),
  /** Correlation of the two AUC estimates, C / sqrt(V1·V2); null when a variance is 0. */
  correlation: z.number().nullable(),
  /** Why the standard error, test and intervals are null (fewer than 2 goods or 2 bads); null otherwise. */
  inference: z.string().nullable().default(null),
});
export type Difference = z.infer<typeof differenceSchema>;

/** Counts of a distribution over equal-width bins; `edges` has one more entry than `counts`. */
export const histogramSchema = z.object({
  edges: z.array(z.number()),
  counts: z.array(z.number().int()),
});
export type Histogram = z.infer<typeof histogramSchema>;

export const bootstrapSchema = z.object({
  replicates: z.number().int(),
  seed: z.number().int(),
  confidence: z.number(),
  /** Paired (same accounts for both models), stratified by outcome, percentile intervals. */
  method: z.literal('paired-stratified-percentile'),
  /** Replicate distributions, binned for histograms; null when replicates = 0. */
  histograms: z
    .object({
      deltaGini: histogramSchema,
      deltaKs: histogramSchema,
      championKs: histogramSchema,
      challengerKs: histogramSchema,
    })
    .nullable(),
});
export type Bootstrap = z.infer<typeof bootstrapSchema>;

export const inferredBadsSchema = z.object({
  method: z.enum(['parcel', 'column']),
  /** Known bads plus the bads inferred for the unknown accounts (weighted). */
  bads: z.number(),
  /** bads / accounts; null for an empty cell. */
  badRate: z.number().nullable(),
});
export type InferredBads = z.infer<typeof inferredBadsSchema>;

export const swapCellSchema = z.object({
  /** Rows of the file in the cell (all of them, with or without an outcome). */
  count: z.number().int(),
  /** Share of all accounts in the holdout (weighted). */
  share: z.number(),
  /** Bads among the accounts with a known outcome (weighted). */
  bads: z.number(),
  /** bads / known accounts; null when no account of the cell has a known outcome. */
  badRate: z.number().nullable(),
  /** Wilson score interval of the bad rate at the report's confidence (on the Kish effective size when weighted). */
  badRateCi: intervalSchema.nullable(),
  /** Sum of the exposure column for these accounts (weighted); null when no exposure column is mapped. */
  amount: z.number().nullable(),
  /**
   * Present when the holdout has weights or rows without an outcome (engine 1.2); otherwise
   * accounts = known = count, unknown = 0 and the bounds are the bad rate itself.
   * accounts: weighted applicants in the cell; known / unknown: of them, with / without an outcome.
   */
  accounts: z.number().optional(),
  known: z.number().optional(),
  unknown: z.number().optional(),
  /** [every unknown good, every unknown bad]: bads / accounts and (bads + unknown) / accounts. */
  badRateBounds: intervalSchema.nullable().optional(),
  /** The bad rate with the unknown accounts' bads inferred, under the report's reject inference; null for known-only. */
  inferred: inferredBadsSchema.nullable().optional(),
});
export type SwapCell = z.infer<typeof swapCellSchema>;

export const cutoffPositionSchema = z.object({
  /** Accounts on the safe side of the cut-off, the cut-off itself included, are accepted. */
  cutoff: z.number(),
  approvalRate: z.number(),
});
export type CutoffPosition = z.infer<typeof cutoffPositionSchema>;

export const swapTestSchema = z.object({
  /** Swap-in bad rate vs swap-out bad rate. */
  method: z.enum(['two-proportion-z', 'fisher-exact']),
  z: z.number().nullable(),
  /** Two-sided p; null when either side is empty (with `reason`). */
  p: z.number().nullable(),
  reason: z.string().nullable(),
});

/** A swap cell within one segment value: as SwapCell, without the share of the holdout. */
export const segmentSwapCellSchema = swapCellSchema.omit({ share: true });
export type SegmentSwapCell = z.infer<typeof segmentSwapCellSchema>;

export const segmentApprovalSchema = z.object({
  /** Accounts of the segment value on the safe side of the model's cut-off (weighted). */
  approved: z.number(),
  /** approved / accounts of the segment value. */
  approvalRate: z.number(),
  /** Bad rate of the accounts the model approves in the segment value; null when it approves none. */
  approvedBadRate: z.number().nullable(),
});

/** The swap sets within one value of a mapped segment column, at the same cut-offs as the whole holdout. */
export const swapSegmentRowSchema = z.object({
  column: z.string(),
  value: z.string(),
  /** Accounts of the segment value (weighted), with or without an outcome. */
  accounts: z.number(),
  bads: z.number(),
  /** Of them, accounts without an outcome (weighted); absent before engine 1.2. */
  unknown: z.number().optional(),
  champion: segmentApprovalSchema,
  challenger: segmentApprovalSchema,
  swapIn: segmentSwapCellSchema,
  swapOut: segmentSwapCellSchema,
});
export type SwapSegmentRow = z.infer<typeof swapSegmentRowSchema>;

// The bad rate a swap cell states (inferred when the run infers): one rule for swap cells and the mixed strategy.
export { statedBadRate } from './stated-bad-rate';

/** The swap-in's stated bad rate above the swap-out's (both defined): the challenger trades in riskier accounts there. */
export function swapInRiskier(row: Pick<SwapSegmentRow, 'swapIn' | 'swapOut'>): boolean {
  const rateIn = statedBadRate(row.swapIn);
  const rateOut = statedBadRate(row.swapOut);
  return rateIn !== null && rateOut !== null && rateIn > rateOut;
}

export const swapSetsSchema = z.object({
  /** How the cut-offs were chosen: given per model, or matched to one approval rate. */
  basis: z.enum(['cutoffs', 'approval-rate']),
  requestedApprovalRate: z.number().nullable(),
  champion: cutoffPositionSchema,
  challenger: cutoffPositionSchema,
  bothAccept: swapCellSchema,
  /** Champion rejects, challenger accepts. */
  swapIn: swapCellSchema,
  /** Champion accepts, challenger rejects. */
  swapOut: swapCellSchema,
  bothReject: swapCellSchema,
  test: swapTestSchema,
  /**
   * The same decisions within each value of each mapped segment column, in the segments' order
   * (empty without segments; reports of engine 1.0 have none).
   */
  bySegment: z.array(swapSegmentRowSchema).default([]),
});
export type SwapSets = z.infer<typeof swapSetsSchema>;

export const swapMatrixSchema = z.object({
  /** Number of quantile bands per model (10 = deciles); band 1 is the riskiest. */
  bands: z.number().int(),
  /** Score range of each band, per model, in the model's own units. */
  championBands: z.array(z.object({ band: z.number().int(), scoreMin: z.number(), scoreMax: z.number() })),
  challengerBands: z.array(z.object({ band: z.number().int(), scoreMin: z.number(), scoreMax: z.number() })),
  /** cells[i][j]: champion band i+1 × challenger band j+1. */
  cells: z.array(
    z.array(
      z.object({
        /** Accounts (weighted), with or without an outcome. */
        count: z.number(),
        bads: z.number(),
        /** bads / accounts with a known outcome. */
        badRate: z.number().nullable(),
        /** Accounts without an outcome (weighted); absent when every outcome is known. */
        unknown: z.number().optional(),
      }),
    ),
  ),
});
export type SwapMatrix = z.infer<typeof swapMatrixSchema>;

export const strategyModelPointSchema = z.object({
  cutoff: z.number(),
  /** Approval rate actually achieved at that cut-off (ties can push it past the target). */
  achievedApprovalRate: z.number(),
  /** Bad rate of the whole approved book. */
  portfolioBadRate: z.number().nullable(),
  /** Bad rate of the accounts added since the previous point (the marginal band). */
  marginalBadRate: z.number().nullable(),
});

export const strategyCurveSchema = z.object({
  points: z.array(
    z.object({
      approvalRate: z.number(),
      champion: strategyModelPointSchema,
      challenger: strategyModelPointSchema,
    }),
  ),
  /** At the report's approval rate, both books of the same size (strategy-curve.ts). */
  atApprovalRate: z.object({
    approvalRate: z.number(),
    /**
     * How the books' bads are counted when some applicants have no outcome: 'inferred' (known bads
     * plus the run's inferred bads, rates over all accounts) or 'known-only' (bads of the accounts
     * with an outcome; those without count as none, a caution the words state); absent otherwise.
     */
    bads: z.enum(['inferred', 'known-only']).optional(),
    /** Accounts approved in both books: the champion's book at its cut-off for the rate (weighted). */
    accounts: z.number(),
    /** Known bads approved (weighted) in the champion's book. */
    championBads: z.number(),
    /** Known bads among the challenger's `accounts` safest accounts (the tie block at the edge in proportion; can be fractional). */
    challengerBads: z.number(),
    /** Champion's approved bads minus the challenger's, at the same number of accounts approved. */
    badsAvoided: z.number(),
    /** The challenger's book at its own cut-off for the rate (what the swap sets show). */
    challengerAtCutoff: z.object({ accounts: z.number(), bads: z.number() }),
    /** Extra approvals the challenger makes while keeping the champion's portfolio bad rate. */
    approvalsGainedAtEqualBadRate: z.number().nullable(),
  }),
});
export type StrategyCurve = z.infer<typeof strategyCurveSchema>;

export const bandRowSchema = z.object({
  band: z.number().int(),
  scoreMin: z.number(),
  scoreMax: z.number(),
  /** Accounts in the band (weighted), with or without an outcome. */
  count: z.number(),
  /** Goods and bads with a known outcome (weighted); the bad rate is bads / (goods + bads). */
  goods: z.number(),
  bads: z.number(),
  /** Accounts without an outcome (weighted); absent when every outcome is known. */
  unknown: z.number().optional(),
  badRate: z.number().nullable(),
  /** Cumulative shares of all bads and of all goods, riskiest band first. */
  cumBadShare: z.number(),
  cumGoodShare: z.number(),
  /** cumBadShare − cumGoodShare at the end of this band. */
  ks: z.number(),
  /** Good:bad odds in the band; null when the band has no bads. */
  odds: z.number().nullable(),
});

export const bandTableSchema = z.object({
  rows: z.array(bandRowSchema),
  /** Trapezoid Gini over the band table (Engelmann, Hayden & Tasche 2003). */
  giniTrapezoid: z.number(),
});
export type BandTable = z.infer<typeof bandTableSchema>;

export const segmentFlagSchema = z.enum(['significantly-worse', 'materially-worse']);
export type SegmentFlag = z.infer<typeof segmentFlagSchema>;

export const segmentRowSchema = z.object({
  column: z.string(),
  value: z.string(),
  /** Rows with a known outcome, and of them goods and bads (unweighted: what the Gini rests on). */
  n: z.number().int(),
  goods: z.number().int(),
  bads: z.number().int(),
  /** Applicants of the value (weighted), with or without an outcome; absent before engine 1.2. */
  accounts: z.number().optional(),
  /** Of them, applicants without an outcome (weighted). */
  unknown: z.number().optional(),
  championGini: z.number().nullable(),
  challengerGini: z.number().nullable(),
  deltaGini: z.number().nullable(),
  giniSe: z.number().nullable(),
  /**
   * Two-sided DeLong p for the segment (harm and benefit alike can be significant). Reports of
   * engines before 1.2 held the p in the policy's sidedness here.
   */
  p: z.number().nullable(),
  /** Two-sided DeLong p (the same as `p` since engine 1.2); null before. */
  pTwoSided: z.number().nullable().default(null),
  /** ΔGini ± z·se at the report's confidence (clamped to [−2, 2]); null without a test. */
  giniCi: intervalSchema.nullable().default(null),
  /** Holm-adjusted two-sided p across every segment row of the report that has a test. */
  pHolm: z.number().nullable(),
  /** Fewer bads than the policy's segment threshold: marked, and left out of the segment rule. */
  tooFewBads: z.boolean(),
  /**
   * significantly-worse: Holm-adjusted two-sided p < α with ΔGini < 0; materially-worse:
   * ΔGini ≤ −materiality. Under the report's policy; a value with too few bads gets none.
   */
  flags: z.array(segmentFlagSchema).default([]),
  /** Why a value is null (one class only, …); null when everything is defined. */
  note: z.string().nullable(),
});
export type SegmentRow = z.infer<typeof segmentRowSchema>;

export const scoreSummarySchema = z.object({
  min: z.number(),
  max: z.number(),
  mean: z.number(),
  distinct: z.number().int(),
});

export const dataQualitySchema = z.object({
  rowsRead: z.number().int(),
  rowsUsed: z.number().int(),
  /** Rows left out because a score was missing (only with drop-missing). */
  rowsDroppedMissingScore: z.number().int(),
  /** Empty cells per mapped column. */
  missingByColumn: z.record(z.string(), z.number().int()),
  champion: scoreSummarySchema,
  challenger: scoreSummarySchema,
  /** Correlation of the two scores as given (each in its own orientation). */
  scoreCorrelation: z.object({ pearson: z.number().nullable(), spearman: z.number().nullable() }),
  duplicateIds: z.number().int().nullable(),
  warnings: z.array(z.string()),
});
export type DataQuality = z.infer<typeof dataQualitySchema>;

export const curvePointSchema = z.object({ x: z.number(), y: z.number() });
export const ksPointSchema = z.object({ score: z.number(), cumBad: z.number(), cumGood: z.number() });

/** Curve points, downsampled to at most 500 per model and curve. */
export const curvesSchema = z.object({
  /** x = false-positive rate (share of goods declined), y = share of bads declined, riskiest first. */
  roc: z.object({ champion: z.array(curvePointSchema), challenger: z.array(curvePointSchema) }),
  /** x = share of all accounts declined, y = share of bads declined, riskiest first. */
  cap: z.object({ champion: z.array(curvePointSchema), challenger: z.array(curvePointSchema) }),
  ks: z.object({ champion: z.array(ksPointSchema), challenger: z.array(ksPointSchema) }),
});
export type Curves = z.infer<typeof curvesSchema>;

export const economicsSchema = z.object({
  profitPerGood: z.number(),
  lossPerBad: z.number().nullable(),
  /** When set, a bad's loss is lgd × its exposure instead of lossPerBad. */
  lgd: z.number().nullable(),
  champion: z.object({
    bestCutoff: z.number(),
    bestApprovalRate: z.number(),
    bestProfit: z.number(),
    curve: z.array(z.object({ approvalRate: z.number(), cutoff: z.number(), profit: z.number() })),
  }),
  challenger: z.object({
    bestCutoff: z.number(),
    bestApprovalRate: z.number(),
    bestProfit: z.number(),
    curve: z.array(z.object({ approvalRate: z.number(), cutoff: z.number(), profit: z.number() })),
  }),
});
export type Economics = z.infer<typeof economicsSchema>;

export const verdictOutcomeSchema = z.enum(['supported', 'not-proven', 'champion-better']);
export type VerdictOutcome = z.infer<typeof verdictOutcomeSchema>;

export const criterionSchema = z.object({
  id: z.enum(['significance', 'materiality', 'interval', 'swap-bad-rate', 'minimum-bads', 'segments', 'calibration', 'psi', 'period-sign']),
  label: z.string(),
  met: z.boolean(),
  /** Plain-language reason with the numbers, e.g. "one-sided p = 0.0003 < α = 0.05". */
  detail: z.string(),
});
export type Criterion = z.infer<typeof criterionSchema>;

export const verdictSchema = z.object({
  outcome: verdictOutcomeSchema,
  policyVersion: z.number().int(),
  criteria: z.array(criterionSchema),
  /** One plain-language sentence summarising the evidence. */
  summary: z.string(),
});
export type Verdict = z.infer<typeof verdictSchema>;

/**
 * The largest amount (exposure) or sampling weight a row may carry: sums of amounts and weights
 * over millions of rows must stay finite, and no loan or sampling weight comes near it.
 */
export const maxAmountMagnitude = 1e15;

/** The most challengers one comparison holds beside its champion. */
export const MAX_CHALLENGERS = 5;

/** A model's name as the modeler gives it: one line of at most 80 characters. */
export const modelNameSchema = z.string().trim().min(1, 'Name the model').max(80).regex(/^[^\r\n]*$/, 'A model name is one line');

/** A challenger after the primary one: its score column, orientation, and the modeler's name for it. */
export const extraChallengerSchema = z.object({
  column: z.string().min(1),
  higherIs: higherIsSchema,
  /** Absent = the column name. */
  name: modelNameSchema.optional(),
});
export type ExtraChallenger = z.infer<typeof extraChallengerSchema>;

export const columnMappingSchema = z.object({
  outcome: z.string().min(1),
  /** The outcome value that means bad (the event); the other observed value means good. */
  badValue: z.string().min(1),
  champion: z.string().min(1),
  challenger: z.string().min(1),
  higherIs: z.object({ champion: higherIsSchema, challenger: higherIsSchema }),
  id: z.string().min(1).nullable().optional(),
  segments: z.array(z.string().min(1)).optional(),
  exposure: z.string().min(1).nullable().optional(),
  /** Sampling weight: a positive finite number per row, each row standing for that many applicants. */
  weight: z.string().min(1).nullable().optional(),
  /** The modeler confirms that a model's score is a probability of default (higher = riskier, 0 to 1): its calibration is computed. */
  probabilityOfDefault: z.object({ champion: z.boolean(), challenger: z.boolean() }).optional(),
  /** Rating grade columns: calibration by grade instead of by quantile band. */
  grades: z.object({ champion: z.string().min(1).nullable(), challenger: z.string().min(1).nullable() }).optional(),
  /** Month or vintage column: stability by period. */
  period: z.string().min(1).nullable().optional(),
  /**
   * Keep applicants without an outcome (e.g. those the champion declined, never booked): a blank
   * outcome, or one of `unknownValues`, marks the row unknown instead of being an error.
   */
  keepUnknown: z.boolean().optional(),
  /** Coded values meaning "no outcome" (e.g. `R`, `reject`, `-1`); only with keepUnknown. */
  unknownValues: z.array(z.string().trim().min(1)).max(20).optional(),
  /** A column with each unknown row's probability of bad (0 to 1), for reject inference by column. */
  inferredBad: z.string().min(1).nullable().optional(),
  // --- several challengers (see modelsOf below) ---
  /** The modeler's name for the champion (e.g. "CF-2 scorecard"); absent = the column name. */
  championName: modelNameSchema.optional(),
  /** The modeler's name for the primary challenger (`challenger`); absent = the column name. */
  challengerName: modelNameSchema.optional(),
  /**
   * Challengers after the primary, 0 to MAX_CHALLENGERS − 1: each a score column of the same
   * holdout with its own orientation and name. Absent or empty = a two-model comparison, exactly
   * as before. Every score column (champion and challengers) must be distinct, and so must the
   * names (mappingModelProblems).
   */
  moreChallengers: z.array(extraChallengerSchema).max(MAX_CHALLENGERS - 1, `at most ${MAX_CHALLENGERS} challengers`).optional(),
});
export type ColumnMapping = z.infer<typeof columnMappingSchema>;

/**
 * How the bad rate of applicants without an outcome is stated (reject inference):
 * - known-only: the bad rate of the known accounts, with the bounds (every unknown good, every
 *   unknown bad) beside it;
 * - parcel: an unknown row in champion score band b counts min(1, K·r_b) bads, r_b the weighted
 *   bad rate of the known rows of that band;
 * - column: the unknown row's probability of bad from the mapped inferred-bad column.
 */
export const rejectInferenceMethods = ['known-only', 'parcel', 'column'] as const;
export const rejectInferenceSchema = z.object({
  method: z.enum(rejectInferenceMethods).default('known-only'),
  /** K of the parcel method. */
  parcelFactor: z.number().gt(0).max(20).default(1),
});
export type RejectInference = z.infer<typeof rejectInferenceSchema>;
export const defaultRejectInference: RejectInference = { method: 'known-only', parcelFactor: 1 };

export const analysisSettingsSchema = z.object({
  bootstrap: z.number().int().min(0).max(20000).default(2000),
  seed: z.number().int().min(0).max(2 ** 31 - 1).default(1),
  confidence: z.number().gt(0.5).lt(1).default(0.95),
  /** Matched approval rate for the swap sets when no cut-offs are given. */
  approvalRate: z.number().gt(0).lt(1).default(0.7),
  cutoffs: z.object({ champion: z.number(), challenger: z.number() }).nullable().default(null),
  dropMissing: z.boolean().default(false),
  /** Bands for band tables and the swap matrix. */
  bands: z.number().int().min(2).max(50).default(10),
  economics: z
    .object({
      profitPerGood: z.number(),
      lossPerBad: z.number().nullable().default(null),
      lgd: z.number().min(0).max(1).nullable().default(null),
    })
    .nullable()
    .default(null),
  /** A value of the period column whose accounts are the PSI's reference (when no reference file is given). */
  referencePeriod: z.string().min(1).max(200).nullable().default(null),
  /** Reject inference for rows without an outcome; absent = known-only (reports before engine 1.2 have none). */
  rejectInference: rejectInferenceSchema.optional(),
});
export type AnalysisSettings = z.infer<typeof analysisSettingsSchema>;

/**
 * Who is in the holdout: rows of the file and the applicants they stand for (accounts, weighted),
 * split by whether the outcome is known. Absent in reports before engine 1.2 (see populationOf).
 */
export const populationSchema = z.object({
  rows: z.number().int(),
  accounts: z.number(),
  known: z.object({ rows: z.number().int(), accounts: z.number(), goods: z.number(), bads: z.number() }),
  unknown: z.object({ rows: z.number().int(), accounts: z.number() }),
});
export type Population = z.infer<typeof populationSchema>;

// --- several challengers (one champion, 1 to MAX_CHALLENGERS challengers) -------------------
/**
 * A comparison may hold one champion and 1 to 5 challengers scored on the same holdout. The first
 * challenger (mapping.challenger) is the primary: the report's `challenger`, `difference`, `swap`,
 * curves, bands, segments, calibration and `verdict` stay about it, so a two-model comparison reads
 * exactly as before. The sections below cover every challenger (the primary first, index 0).
 */
/** One model of a comparison as the mapping names it. */
export interface ModelSpec {
  column: string;
  higherIs: HigherIs;
  /** The modeler's name, or the column name when none was given. */
  name: string;
}

/** The champion as the mapping names it. */
export function championOf(mapping: Pick<ColumnMapping, 'champion' | 'championName' | 'higherIs'>): ModelSpec {
  return { column: mapping.champion, higherIs: mapping.higherIs.champion, name: mapping.championName ?? mapping.champion };
}

/** Every challenger of a mapping, the primary first (index 0): the order of `Report.challengers`. */
export function challengersOf(mapping: Pick<ColumnMapping, 'challenger' | 'challengerName' | 'higherIs' | 'moreChallengers'>): ModelSpec[] {
  return [
    { column: mapping.challenger, higherIs: mapping.higherIs.challenger, name: mapping.challengerName ?? mapping.challenger },
    ...(mapping.moreChallengers ?? []).map((extra) => ({ column: extra.column, higherIs: extra.higherIs, name: extra.name ?? extra.column })),
  ];
}

/**
 * What is wrong with a mapping's models, in words (empty when nothing): 1 to MAX_CHALLENGERS
 * challengers, every score column distinct, every name distinct (case and surrounding spaces
 * ignored), none of them the outcome column. The reader and the API refuse such a mapping with
 * these words; the mapping form shows them.
 */
export function mappingModelProblems(mapping: ColumnMapping): string[] {
  const problems: string[] = [];
  const models = [championOf(mapping), ...challengersOf(mapping)];
  if (models.length - 1 > MAX_CHALLENGERS) problems.push(`a comparison has at most ${MAX_CHALLENGERS} challengers; this mapping names ${models.length - 1}`);
  const role = (index: number) => (index === 0 ? 'the champion' : index === 1 ? 'the primary challenger' : `challenger ${index}`);
  const seenColumns = new Map<string, number>();
  const seenNames = new Map<string, number>();
  models.forEach((model, index) => {
    if (model.column === mapping.outcome) problems.push(`column "${model.column}" is the outcome and cannot also be ${role(index)}'s score`);
    const column = seenColumns.get(model.column);
    if (column !== undefined) problems.push(`column "${model.column}" is both ${role(column)} and ${role(index)}; each model needs its own score column`);
    else seenColumns.set(model.column, index);
    const key = model.name.trim().toLowerCase();
    const name = seenNames.get(key);
    if (name !== undefined && column === undefined) problems.push(`the name "${model.name}" is given to both ${role(name)} and ${role(index)}; give each model its own name`);
    else if (name === undefined) seenNames.set(key, index);
  });
  return problems;
}

/**
 * One challenger against the champion. For index 0 (the primary) `metrics`, `difference` and
 * `verdict` equal the report's `challenger`, `difference` and `verdict`.
 */
export const challengerResultSchema = z.object({
  column: z.string(),
  name: z.string(),
  metrics: modelMetricsSchema,
  /** This challenger − the champion: paired DeLong, bootstrap ΔGini and ΔKS (same replicates for every model). */
  difference: differenceSchema,
  /** Holm-adjusted one- and two-sided p across the K challengers' tests against the champion (= the plain p with K = 1). */
  pOneSidedHolm: z.number().nullable(),
  pTwoSidedHolm: z.number().nullable(),
  /** This challenger judged under the report's policy; with K ≥ 2 the significance criterion uses the Holm-adjusted p and says so. */
  verdict: verdictSchema,
  /**
   * Swap sets against the champion at the report's approval rate (settings.approvalRate; both
   * models at their cut-offs for that rate, even when the report's own `swap` uses fixed cut-offs).
   */
  swap: swapSetsSchema,
  /** Data quality of this model's score: its summary, and its correlation with the champion's score as given. */
  score: scoreSummarySchema,
  scoreCorrelation: z.object({ pearson: z.number().nullable(), spearman: z.number().nullable() }),
  /** Replicate distributions of this challenger (same resampled rows as every model), binned; null without bootstrap. */
  histograms: z.object({ deltaGini: histogramSchema, deltaKs: histogramSchema, challengerKs: histogramSchema }).nullable(),
  /**
   * Challengers after the primary only (the primary's are the report's own `segments`,
   * `calibration`, `stability`): this challenger against the champion within each segment value,
   * and its calibration and stability sections — the evidence its verdict was judged on (a
   * further challenger is never marked as a PD and has no PSI reference scores).
   */
  segments: z.array(segmentRowSchema).optional(),
  calibration: calibrationSchema.optional(),
  stability: stabilitySchema.optional(),
  /**
   * Challengers after the primary only (the primary's is the report's `bands.challenger`): this
   * challenger's band table on its own score (the champion's is the report's `bands.champion`).
   */
  bands: bandTableSchema.optional(),
});
export type ChallengerResult = z.infer<typeof challengerResultSchema>;

/** A pair of challengers: b − a (indices into `challengers`, a < b), paired DeLong. */
export const challengerPairSchema = z.object({
  a: z.number().int(),
  b: z.number().int(),
  /** Gini of b − Gini of a. */
  deltaGini: z.number(),
  /** DeLong standard error of that ΔGini; it, z and p are null without a variance (fewer than 2 goods or bads). */
  se: z.number().nullable(),
  z: z.number().nullable(),
  pTwoSided: z.number().nullable(),
});
export type ChallengerPair = z.infer<typeof challengerPairSchema>;

/**
 * The joint test that every challenger's AUC equals the champion's (DeLong, DeLong &
 * Clarke-Pearson 1988): χ² = (Lθ)ᵀ(LSLᵀ)⁻(Lθ), df = rank of the contrast covariance. With K = 1 it
 * is the paired test's z², df 1. Null without a variance or when every challenger ranks as the champion.
 */
export const jointTestSchema = z.object({ chi2: z.number(), df: z.number().int(), p: z.number() });
export type JointTestResult = z.infer<typeof jointTestSchema>;

/**
 * The recommended challenger (shared/choose-challenger.ts): among those whose verdict is
 * supported, the highest Gini, ties by the lower swap-in bad rate at the policy's approval rate.
 */
export const challengerChoiceSchema = z.object({
  /** Index into `challengers`; null: none is supported, the champion stays. */
  recommended: z.number().int().nullable(),
  /** One plain sentence naming the recommended challenger (or none) and why. */
  summary: z.string(),
});
export type ChallengerChoice = z.infer<typeof challengerChoiceSchema>;

/**
 * Who each model approves at one matched approval rate: every model at its own cut-off for the
 * rate (the cut-off rule of the swap sets), and the accounts in each combination of approve /
 * decline across the models (2^(K+1) combinations, champion first, every combination listed).
 */
export const approvalPatternsSchema = z.object({
  approvalRate: z.number(),
  /** Champion first, then the challengers in order. */
  models: z.array(z.object({ name: z.string(), column: z.string(), cutoff: z.number(), approvalRate: z.number() })),
  combinations: z.array(
    z.object({
      /** Per model (champion first): approved at its cut-off. */
      approved: z.array(z.boolean()),
      /** Rows of the file. */
      count: z.number().int(),
      /** Applicants (weighted), known outcome among them, and their bads (weighted). */
      accounts: z.number(),
      known: z.number(),
      bads: z.number(),
      /** bads / known; null when none has a known outcome. */
      badRate: z.number().nullable(),
    }),
  ),
});
export type ApprovalPatterns = z.infer<typeof approvalPatternsSchema>;
// --- end of several challengers ---

export const reportSchema = z.object({
  engineVersion: z.string(),
  /** `sheet`: the worksheet read, when the holdout is an .xlsx workbook. */
  input: z.object({ fileName: z.string(), sha256: z.string(), bytes: z.number().int(), sheet: z.string().optional() }),
  mapping: columnMappingSchema,
  settings: analysisSettingsSchema,
  /** The adoption policy the verdict was evaluated under. */
  policy: adoptionPolicySchema,
  /** Rows with a known outcome, and of them goods and bads (unweighted). */
  rows: z.number().int(),
  goods: z.number().int(),
  bads: z.number().int(),
  /** Bad rate of the accounts with a known outcome (weighted). */
  badRate: z.number(),
  population: populationSchema.optional(),
  champion: modelMetricsSchema,
  challenger: modelMetricsSchema,
  difference: differenceSchema,
  bootstrap: bootstrapSchema,
  swap: swapSetsSchema,
  swapMatrix: swapMatrixSchema,
  strategyCurve: strategyCurveSchema,
  bands: z.object({ champion: bandTableSchema, challenger: bandTableSchema }),
  segments: z.array(segmentRowSchema),
  dataQuality: dataQualitySchema,
  curves: curvesSchema,
  economics: economicsSchema.nullable(),
  verdict: verdictSchema,
  /** Optional: reports stored before engine 1.2 have neither. */
  calibration: calibrationSchema.optional(),
  stability: stabilitySchema.optional(),
  // Several challengers (absent in reports stored before them; present for every new report, K = 1 included).
  /** Every challenger against the champion, the primary first. */
  challengers: z.array(challengerResultSchema).optional(),
  /** Every pair of challengers (empty with one challenger). */
  pairwise: z.array(challengerPairSchema).optional(),
  joint: jointTestSchema.nullable().optional(),
  choice: challengerChoiceSchema.optional(),
  /** At the report's approval rate (settings.approvalRate). */
  approvalPatterns: approvalPatternsSchema.optional(),
});
export type Report = z.infer<typeof reportSchema>;

/** A report's population; reports before engine 1.2 have every outcome known and no weights. */
export function populationOf(report: Pick<Report, 'rows' | 'goods' | 'bads' | 'population'>): Population {
  return (
    report.population ?? {
      rows: report.rows,
      accounts: report.rows,
      known: { rows: report.rows, accounts: report.rows, goods: report.goods, bads: report.bads },
      unknown: { rows: 0, accounts: 0 },
    }
  );
}

/** A swap cell with every field of engine 1.2, filled in for cells that have none (all known, unweighted). */
export function fullSwapCell(cell: SegmentSwapCell): Required<SegmentSwapCell> {
  const accounts = cell.accounts ?? cell.count;
  return {
    ...cell,
    accounts,
    known: cell.known ?? accounts,
    unknown: cell.unknown ?? 0,
    badRateBounds: cell.badRateBounds !== undefined ? cell.badRateBounds : cell.badRate === null ? null : [cell.badRate, cell.badRate],
    inferred: cell.inferred ?? null,
  };
}

/** The reject inference a report was computed under (known-only when none is recorded). */
export function inferenceOf(settings: Pick<AnalysisSettings, 'rejectInference'>): RejectInference {
  return settings.rejectInference ?? defaultRejectInference;
}
