import { z } from 'zod';

/**
 * The report's calibration and stability sections (shared/report.ts `calibration`, `stability`;
 * both optional there, so that reports stored before them still open).
 *
 * Calibration is computed for a model only when the modeler confirms that its score is a
 * probability of default (mapping `probabilityOfDefault`): higher = riskier, values in [0, 1].
 * Groups are the model's quantile bands (the band table's), or the grades of a mapped grade column.
 * Weighted holdouts use the weighted rates and Kish's effective counts (see server/stats/calibration.ts).
 */

const interval = z.tuple([z.number(), z.number()]);

export const calibrationRowSchema = z.object({
  /** "Band 3" or the grade's value. */
  label: z.string(),
  /** Band number (1 = riskiest) when grouped by bands; null for grades. */
  band: z.number().int().nullable(),
  accounts: z.number().int(),
  /** Bads counted (unweighted). */
  bads: z.number().int(),
  /** Sum of weights; null without weights. */
  weight: z.number().nullable(),
  /** Kish effective sample size; equals accounts without weights. */
  effectiveAccounts: z.number(),
  meanPd: z.number(),
  /** PD range of the group. */
  pdMin: z.number(),
  pdMax: z.number(),
  observedBadRate: z.number(),
  /** Wilson score interval of the observed bad rate at the report's confidence. */
  observedBadRateCi: interval.nullable(),
  /** Σ PD (weighted) and Σ bad (weighted). */
  expectedBads: z.number(),
  observedBads: z.number(),
  /** Jeffreys test p, one-sided, H0: the PD is not underestimated. */
  jeffreysP: z.number(),
  /** Exact binomial test p, one-sided, the same hypothesis. */
  binomialP: z.number(),
  /** jeffreysP below the calibration α: the PD is too low for the defaults observed. */
  fails: z.boolean(),
});
export type CalibrationRow = z.infer<typeof calibrationRowSchema>;

export const brierSchema = z.object({
  brier: z.number(),
  /** Murphy (1973) over the groups: brier ≈ reliability − resolution + uncertainty. */
  reliability: z.number(),
  resolution: z.number(),
  uncertainty: z.number(),
  /** brier − (reliability − resolution + uncertainty): the PD's spread within groups (0 when each group has one PD). */
  withinGroup: z.number(),
});
export type Brier = z.infer<typeof brierSchema>;

export const modelCalibrationSchema = z.object({
  /** What the groups are: the model's quantile bands, or a mapped grade column. */
  groupedBy: z.union([z.object({ kind: z.literal('bands') }), z.object({ kind: z.literal('grades'), column: z.string() })]),
  rows: z.array(calibrationRowSchema),
  portfolio: calibrationRowSchema,
  brier: brierSchema,
  /** Bands or grades whose Jeffreys p is below alpha. */
  failing: z.number().int(),
});
export type ModelCalibration = z.infer<typeof modelCalibrationSchema>;

export const calibrationSchema = z.object({
  /** Significance level of the per-group flag (the policy's calibration α). */
  alpha: z.number(),
  confidence: z.number(),
  weighted: z.boolean(),
  /** null when the model's score is not confirmed as a probability of default. */
  champion: modelCalibrationSchema.nullable(),
  challenger: modelCalibrationSchema.nullable(),
});
export type Calibration = z.infer<typeof calibrationSchema>;

export const psiBandSchema = z.object({
  band: z.number().int(),
  /** Score range of the reference band, in the model's own units. */
  scoreMin: z.number(),
  scoreMax: z.number(),
  referenceShare: z.number(),
  actualShare: z.number(),
  /** (a − e) ln(a / e) for this band. */
  contribution: z.number(),
});

export const psiSchema = z.object({
  psi: z.number(),
  bands: z.array(psiBandSchema),
  referenceSize: z.number(),
  actualSize: z.number(),
  /** Yurdakul & Naranjo: (1/M + 1/N) · χ²(B − 1) quantile at 1 − α. */
  criticalValue: z.number(),
  criticalAlpha: z.number(),
  /** psi above criticalValue. */
  significant: z.boolean(),
  /** 'stable' < 0.1 ≤ 'watch' < 0.25 ≤ 'shifted' (common practice, no source). */
  rating: z.enum(['stable', 'watch', 'shifted']),
  /** Bands where one side was empty and 0.5 accounts were put in its place. */
  emptyBandsAdjusted: z.number().int(),
});
export type Psi = z.infer<typeof psiSchema>;

export const periodRowSchema = z.object({
  period: z.string(),
  accounts: z.number().int(),
  bads: z.number().int(),
  championGini: z.number().nullable(),
  championGiniCi: interval.nullable(),
  challengerGini: z.number().nullable(),
  challengerGiniCi: interval.nullable(),
  championKs: z.number().nullable(),
  challengerKs: z.number().nullable(),
  deltaGini: z.number().nullable(),
  deltaGiniCi: interval.nullable(),
  /** At least `minBads` bads: the period counts for the sign rule. */
  enoughBads: z.boolean(),
  /** ΔGini's sign differs from the whole holdout's in a period with enough bads. */
  signChanged: z.boolean(),
  /** PSI of each model's score against the previous period (null for the first). */
  championPsiFromPrevious: z.number().nullable(),
  challengerPsiFromPrevious: z.number().nullable(),
  note: z.string().nullable(),
});
export type PeriodRow = z.infer<typeof periodRowSchema>;

export const stabilitySchema = z.object({
  /** The mapped period column; null when none is mapped. */
  periodColumn: z.string().nullable(),
  /** A period needs this many bads to count for the sign rule (the policy's stability minimum). */
  minBads: z.number().int(),
  periods: z.array(periodRowSchema),
  /** Periods with enough bads where the uplift's sign differs from the whole holdout's. */
  signChanges: z.array(z.string()),
  /** PSI against the reference sample; null without a reference. */
  psi: z
    .object({
      reference: z.union([
        z.object({ kind: z.literal('file'), fileName: z.string(), sha256: z.string(), rows: z.number().int() }),
        z.object({ kind: z.literal('period'), period: z.string(), rows: z.number().int() }),
      ]),
      /** Compared: the holdout, or its periods other than the reference period. */
      actual: z.string(),
      champion: psiSchema,
      challenger: psiSchema,
    })
    .nullable(),
});
export type Stability = z.infer<typeof stabilitySchema>;
