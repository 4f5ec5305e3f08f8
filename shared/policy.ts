import { z } from 'zod';

// --- Calibration and stability criteria (each off by default; older versions parse with these defaults) ---
/** The challenger's portfolio Jeffreys p above α (only for a challenger whose score is a PD). */
export const calibrationRuleSchema = z.object({ enabled: z.boolean(), alpha: z.number().gt(0).lt(0.5) });
/** The PSI of the challenger's score against the reference sample below a threshold. */
export const psiRuleSchema = z.object({ enabled: z.boolean(), threshold: z.number().gt(0).max(10) });
/** The uplift keeps its sign in every period with at least minBads bads. */
export const periodSignRuleSchema = z.object({ enabled: z.boolean(), minBads: z.number().int().min(1) });
export const defaultCalibrationRule = { enabled: false, alpha: 0.05 };
/** 0.25: the usual "shifted" line, common practice, no source. */
export const defaultPsiRule = { enabled: false, threshold: 0.25 };
/** 100 bads for a period's Gini to be read: rule of thumb, no source. */
export const defaultPeriodSignRule = { enabled: false, minBads: 100 };
// --- end of the calibration and stability criteria ---

/**
 * The adoption policy: the rules that turn a report's evidence into a recommendation.
 * Admin-editable and versioned on the server; the version is stored with every verdict.
 * Defaults: docs/design.md ("Verdict"). Materiality of 2 Gini points, 300 bads and a quorum of two
 * committee votes are common practice, no source.
 */
export const segmentRuleSchema = z.object({ enabled: z.boolean(), minBads: z.number().int().min(0) });
export type SegmentRule = z.infer<typeof segmentRuleSchema>;

/** The segment rule a new policy version gets when the input does not say: on, 30 bads (rule of thumb, no source). */
export const defaultSegmentRule: SegmentRule = { enabled: true, minBads: 30 };

export const adoptionPolicySchema = z.object({
  version: z.number().int().min(1),
  /** Significance level for the DeLong test of ΔGini. */
  alpha: z.number().gt(0).lt(0.5),
  /** one-sided: H1 is "the challenger is better"; two-sided: H1 is "they differ". */
  sided: z.enum(['one-sided', 'two-sided']),
  /** Minimum ΔGini, in Gini points (1 point = 0.01). */
  materialityGiniPoints: z.number().min(0).max(100),
  /** Require the lower bound of the ΔGini interval to be above 0. */
  requireIntervalAboveZero: z.boolean(),
  /** Require the swap-in bad rate not above the swap-out bad rate at this approval rate. */
  swapRule: z.object({
    enabled: z.boolean(),
    approvalRate: z.number().gt(0).lt(1),
    /**
     * Must also hold at the worst case: the swap-in's upper bound (every unknown bad) not above the
     * swap-out's lower bound (every unknown good). Absent = false.
     */
    worstCase: z.boolean().optional(),
  }),
  /** Minimum number of bads in the holdout. */
  minBads: z.number().int().min(0),
  /** Committee votes needed before a decision can be recorded; 0 = no quorum. */
  quorum: z.number().int().min(0),
  // Calibration and stability criteria (see above).
  calibrationRule: calibrationRuleSchema.default(defaultCalibrationRule),
  psiRule: psiRuleSchema.default(defaultPsiRule),
  periodSignRule: periodSignRuleSchema.default(defaultPeriodSignRule),
  /**
   * No segment value significantly worse: with the rule on, a segment value whose ΔGini is below 0
   * with a Holm-adjusted two-sided DeLong p below α fails the verdict. Values with fewer than
   * `minBads` bads are marked and left out of the rule. Versions stored before the rule existed
   * have no such field and are read as the rule switched off, so their verdicts keep their meaning.
   */
  segmentRule: segmentRuleSchema.default({ enabled: false, minBads: 30 }),
});
export type AdoptionPolicy = z.infer<typeof adoptionPolicySchema>;

/** The policy a new database starts with: version 2, written by the migrations (version 1 predates the segment rule). */
export const defaultAdoptionPolicy: AdoptionPolicy = {
  version: 2,
  alpha: 0.05,
  sided: 'one-sided',
  materialityGiniPoints: 2,
  requireIntervalAboveZero: true,
  swapRule: { enabled: true, approvalRate: 0.7 },
  minBads: 300,
  quorum: 2,
  segmentRule: defaultSegmentRule,
  calibrationRule: defaultCalibrationRule,
  psiRule: defaultPsiRule,
  periodSignRule: defaultPeriodSignRule,
};
