import { z } from 'zod';
import { calibrationSchema, stabilitySchema } from './calibration';
import { adoptionPolicySchema } from './policy';

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

/** The swap-in's bad rate above the swap-out's (both defined): the challenger trades in riskier accounts there. */
export function swapInRiskier(row: Pick<SwapSegmentRow, 'swapIn' | 'swapOut'>): boolean {
  return row.swapIn.badRate !== null && row.swapOut.badRate !== null && row.swapIn.badRate > row.swapOut.badRate;
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
  /** At the report's approval rate. */
  atApprovalRate: z.object({
    approvalRate: z.number(),
    /** Known bads approved (weighted). */
    championBads: z.number(),
    challengerBads: z.number(),
    /** Champion's approved bads minus the challenger's, at the same approval rate. */
    badsAvoided: z.number(),
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

export const reportSchema = z.object({
  engineVersion: z.string(),
  input: z.object({ fileName: z.string(), sha256: z.string(), bytes: z.number().int() }),
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
