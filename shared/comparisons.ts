import { z } from 'zod';
import {
  analysisSettingsSchema,
  approvalPatternsSchema,
  columnMappingSchema,
  criterionSchema,
  higherIsSchema,
  intervalSchema,
  mappingModelProblems,
  MAX_CHALLENGERS,
  strategyCurveSchema,
  swapMatrixSchema,
  swapSetsSchema,
  verdictOutcomeSchema,
} from './report';

/**
 * API contract for holdouts, comparisons, analysis runs, swap sets and exports (issue: uploads,
 * comparisons and analysis jobs). Paths are in the comments; errors use shared/errors.ts.
 */

// --- states -------------------------------------------------------------------------------
/** docs/design.md "Workflow and roles". */
export const comparisonStates = ['draft', 'analysed', 'in-review', 'validated', 'returned', 'decided'] as const;
export const comparisonStateSchema = z.enum(comparisonStates);
export type ComparisonState = z.infer<typeof comparisonStateSchema>;

export const comparisonStateLabels: Record<ComparisonState, string> = {
  draft: 'Draft',
  analysed: 'Analysed',
  'in-review': 'In review',
  validated: 'Validated',
  returned: 'Returned',
  decided: 'Decided',
};

export const runStatusSchema = z.enum(['queued', 'running', 'done', 'failed']);
export type RunStatus = z.infer<typeof runStatusSchema>;

const personRefSchema = z.object({ id: z.number().int(), name: z.string() });

// --- holdouts -----------------------------------------------------------------------------
/** The reader's proposal for a mapping, from column names and the data. */
export const mappingGuessSchema = z.object({
  outcome: z.string().nullable(),
  badValue: z.string().nullable(),
  champion: z.string().nullable(),
  challenger: z.string().nullable(),
  higherIs: z.object({ champion: higherIsSchema.nullable(), challenger: higherIsSchema.nullable() }),
  /** Why each orientation was guessed, e.g. "bads have lower scores on average". */
  orientationHints: z.object({ champion: z.string().nullable(), challenger: z.string().nullable() }),
  id: z.string().nullable(),
  segments: z.array(z.string()),
  exposure: z.string().nullable(),
  /** Outcome codes that look like "no outcome" (e.g. R for the declined of a through-the-door sample): proposed as applicants without an outcome. */
  unknownValues: z.array(z.string()).optional(),
});
export type MappingGuess = z.infer<typeof mappingGuessSchema>;

export const holdoutColumnSchema = z.object({
  name: z.string(),
  /** What the values look like: every non-empty value a number, a few distinct values, or text. */
  kind: z.enum(['numeric', 'categorical', 'text']),
  distinct: z.number().int(),
  missing: z.number().int(),
});

/** POST /api/holdouts (modeler; multipart field `file`) → 201; GET /api/holdouts/:id → 200. */
export const holdoutSchema = z.object({
  id: z.number().int(),
  fileName: z.string(),
  sha256: z.string(),
  bytes: z.number().int(),
  rowCount: z.number().int(),
  /** The worksheet read, for an .xlsx workbook (the one chosen at upload, else its first); null for CSV. */
  sheet: z.string().nullable().default(null),
  columns: z.array(holdoutColumnSchema),
  /** The first 20 data rows, as text, in column order: cells cut to 200 characters, 64 KB in all; empty for roles other than modeler and analyst. */
  preview: z.array(z.array(z.string())),
  /** True when the preview was left out for the viewer's role (the column names and kinds stay). */
  previewWithheld: z.boolean().optional(),
  guess: mappingGuessSchema,
  uploadedBy: personRefSchema,
  uploadedAt: z.string(),
});
export type HoldoutInfo = z.infer<typeof holdoutSchema>;

export const rowErrorSchema = z.object({
  /** Line number in the file (the header is line 1); null when the problem is not one row's. */
  row: z.number().int().nullable(),
  column: z.string().nullable(),
  message: z.string(),
});
export type RowError = z.infer<typeof rowErrorSchema>;

/** Segment columns a mapping sent to the server may name (each adds tables per value to the report). */
export const maxSegmentColumns = 10;

/**
 * A mapping as the API accepts it: segment columns each at most once and at most
 * maxSegmentColumns, so checking a mapping stays bounded work (reports already stored keep the
 * looser columnMappingSchema).
 */
export const mappingInputSchema = columnMappingSchema.extend({
  segments: z
    .array(z.string().min(1))
    .max(maxSegmentColumns, `at most ${maxSegmentColumns} segment columns`)
    .refine((names) => new Set(names).size === names.length, { message: 'name each segment column at most once' })
    .optional(),
}).superRefine((mapping, context) => {
  // Several challengers: distinct score columns and names (a 400 naming them, before any reading).
  for (const message of mappingModelProblems(mapping)) context.addIssue({ code: 'custom', message, path: ['moreChallengers'] });
});

/** POST /api/holdouts/:id/validate { mapping, dropMissing? } → the wizard's validation report. */
export const validateMappingInputSchema = z.object({
  mapping: mappingInputSchema,
  dropMissing: z.boolean().default(false),
});
export const validationReportSchema = z.object({
  ok: z.boolean(),
  /** The first problems found (at most 50), each naming its row and column. */
  errors: z.array(rowErrorSchema),
  summary: z
    .object({
      rows: z.number().int(),
      rowsUsed: z.number().int(),
      goods: z.number().int(),
      bads: z.number().int(),
      /** Bad rate of the rows with an outcome. */
      badRate: z.number(),
      /** Rows kept without an outcome (keep-unknown); absent when every row has one. */
      unknownRows: z.number().int().optional(),
      /** Applicants the rows stand for (weights summed); absent without weights or unknown rows. */
      accounts: z.number().optional(),
      rowsDroppedMissingScore: z.number().int(),
      missingByColumn: z.record(z.string(), z.number().int()),
      warnings: z.array(z.string()),
    })
    .nullable(),
});
export type ValidationReport = z.infer<typeof validationReportSchema>;

// --- comparisons --------------------------------------------------------------------------
/**
 * POST /api/comparisons (modeler) → 201 { id, state }. Without a mapping the comparison stays a
 * draft waiting for its mapping; with one it is checked against the data (400 naming the row and
 * column; nothing stored) and its analysis is queued.
 */
export const createComparisonInputSchema = z.object({
  name: z.string().trim().min(1, 'Give the comparison a name').max(160),
  description: z.string().trim().max(4000).optional(),
  holdoutId: z.number().int(),
  mapping: mappingInputSchema.optional(),
  settings: analysisSettingsSchema.partial().optional(),
  /** A second uploaded file, the development sample: the PSI's reference (same score columns, no outcome needed). */
  referenceHoldoutId: z.number().int().nullable().optional(),
});
export type CreateComparisonInput = z.infer<typeof createComparisonInputSchema>;

/**
 * PUT /api/comparisons/:id/setup (modeler; state draft, analysed or returned) { mapping, settings?,
 * holdoutId? } → 200 detail: checks the mapping, starts a new analysis run (earlier runs are kept).
 */
export const setupComparisonInputSchema = z.object({
  holdoutId: z.number().int().optional(),
  mapping: mappingInputSchema,
  settings: analysisSettingsSchema.partial().optional(),
  /** The PSI's reference sample (an uploaded holdout); null or absent: none. */
  referenceHoldoutId: z.number().int().nullable().optional(),
});
export type SetupComparisonInput = z.infer<typeof setupComparisonInputSchema>;

export const analysisRunSchema = z.object({
  id: z.number().int(),
  status: runStatusSchema,
  /** 0 to 1. */
  progress: z.number(),
  /** What the run is doing now, e.g. "Bootstrap 1,200 of 2,000". */
  stage: z.string().nullable(),
  attempts: z.number().int(),
  error: z.string().nullable(),
  engineVersion: z.string().nullable(),
  queuedAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
});
export type AnalysisRun = z.infer<typeof analysisRunSchema>;

/** Headline numbers of the current run's report, for lists; null until a run is done. */
export const comparisonHeadlineSchema = z.object({
  rows: z.number().int(),
  bads: z.number().int(),
  championGini: z.number(),
  challengerGini: z.number(),
  deltaGini: z.number(),
  /** Null with fewer than 2 goods or 2 bads (no DeLong variance). */
  deltaGiniCi: intervalSchema.nullable(),
  pOneSided: z.number().nullable(),
  pTwoSided: z.number().nullable(),
  verdict: verdictOutcomeSchema,
});
export type ComparisonHeadline = z.infer<typeof comparisonHeadlineSchema>;

/**
 * The verdict every page shows: the newest verdict record of the current run (after a decision,
 * the one the decision was made on), with the policy version it was judged under. Older records
 * are the history (GET …/governance). Null until a run is done.
 */
/** One challenger's verdict within a verdict record. */
export const challengerVerdictSchema = z.object({
  challenger: z.number().int(),
  column: z.string(),
  name: z.string(),
  outcome: verdictOutcomeSchema,
  criteria: z.array(criterionSchema),
  summary: z.string(),
});
export type ChallengerVerdict = z.infer<typeof challengerVerdictSchema>;

export const currentVerdictSchema = z.object({
  id: z.number().int(),
  runId: z.number().int(),
  policyVersion: z.number().int(),
  outcome: verdictOutcomeSchema,
  criteria: z.array(criterionSchema),
  summary: z.string(),
  createdAt: z.string(),
  /** Several challengers: each one's verdict in this record, the recommended one and its sentence (empty, null, '' otherwise). */
  challengers: z.array(challengerVerdictSchema).default([]),
  recommended: z.number().int().nullable().default(null),
  choiceSummary: z.string().default(''),
});
export type CurrentVerdict = z.infer<typeof currentVerdictSchema>;

export const comparisonSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  state: comparisonStateSchema,
  createdBy: personRefSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
  holdout: z.object({ id: z.number().int(), fileName: z.string(), rowCount: z.number().int() }),
  latestRun: analysisRunSchema.pick({ id: true, status: true, progress: true, stage: true }).nullable(),
  headline: comparisonHeadlineSchema.nullable(),
  verdict: currentVerdictSchema.nullable(),
  /**
   * A decided comparison: the decision's outcome and the model it chose (the champion, or the
   * adopted challenger by index and name; null for defer and for decisions recorded before
   * decisions named a model). Null until decided.
   */
  decided: z
    .object({
      outcome: z.enum(['adopt', 'keep', 'defer']),
      chosen: z.object({ model: z.enum(['champion', 'challenger']), challenger: z.number().int().nullable(), column: z.string(), name: z.string() }).nullable(),
    })
    .nullable()
    .default(null),
});
export type ComparisonSummary = z.infer<typeof comparisonSummarySchema>;

/** GET /api/comparisons?state=&q=&page=&pageSize=&sort= (any signed-in person). */
export const listComparisonsQuerySchema = z.object({
  state: comparisonStateSchema.optional(),
  q: z.string().trim().max(160).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
  sort: z.enum(['updated-desc', 'created-desc', 'name-asc', 'delta-gini-desc']).default('updated-desc'),
});
export type ListComparisonsQuery = z.infer<typeof listComparisonsQuerySchema>;
export const comparisonListSchema = z.object({
  items: z.array(comparisonSummarySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type ComparisonList = z.infer<typeof comparisonListSchema>;

/** GET /api/comparisons/:id → the comparison with its runs (newest first). */
export const comparisonDetailSchema = comparisonSummarySchema.extend({
  description: z.string().nullable(),
  mapping: columnMappingSchema.nullable(),
  settings: analysisSettingsSchema.nullable(),
  holdout: z.object({
    id: z.number().int(),
    fileName: z.string(),
    sha256: z.string(),
    bytes: z.number().int(),
    rowCount: z.number().int(),
    uploadedAt: z.string(),
  }),
  runs: z.array(analysisRunSchema),
  /** The run whose report the comparison pages show: the newest done run, else null. */
  currentRunId: z.number().int().nullable(),
  /**
   * The ids of the people who shaped the evidence (created it, uploaded one of its holdouts, set up
   * one of its analyses), in id order: the four-eyes rule bars them from reviewing, voting and deciding.
   */
  authorIds: z.array(z.number().int()),
});
export type ComparisonDetail = z.infer<typeof comparisonDetailSchema>;

// GET /api/comparisons/:id/report → the Report (shared/report.ts) of the current run; 409 while
// no run is done. The same JSON as `npm run compare -- FILE --json` on the same file and settings.

// --- swap sets on demand, scenarios -------------------------------------------------------
/**
 * POST /api/comparisons/:id/swap (any signed-in person): recomputed at these settings. With several
 * challengers, `challenger` (default 0, the first) is the one set against the champion: its swap
 * sets (by segment too), swap matrix and strategy position; `cutoffs.challenger` is then on its
 * score. A 400 names an index the comparison does not have.
 */
export const swapQuerySchema = z
  .object({
    cutoffs: z.object({ champion: z.number(), challenger: z.number() }).optional(),
    approvalRate: z.number().gt(0).lt(1).optional(),
    challenger: z.number().int().min(0).max(MAX_CHALLENGERS - 1).optional(),
  })
  .refine((value) => value.cutoffs !== undefined || value.approvalRate !== undefined, 'Give cut-offs or an approval rate');
export type SwapQuery = z.infer<typeof swapQuerySchema>;
export const swapResultSchema = z.object({
  swap: swapSetsSchema,
  swapMatrix: swapMatrixSchema,
  /** Where these cut-offs sit on the strategy curve. */
  strategyPosition: strategyCurveSchema.shape.atApprovalRate.extend({
    championApprovalRate: z.number(),
    challengerApprovalRate: z.number(),
  }),
});
export type SwapResult = z.infer<typeof swapResultSchema>;

/**
 * POST /api/comparisons/:id/challengers/swap (any signed-in person) { approvalRate }: every
 * challenger's swap sets against the champion at the same approval rate (each model at its own
 * cut-off for the rate), side by side, and who each model approves (the approval patterns), on
 * the current run. A two-model comparison answers with its one challenger.
 */
export const challengersSwapQuerySchema = z.object({ approvalRate: z.number().gt(0).lt(1) });
export type ChallengersSwapQuery = z.infer<typeof challengersSwapQuerySchema>;
export const challengersSwapResultSchema = z.object({
  approvalRate: z.number(),
  /** The primary first (index 0), as the report's `challengers`. */
  challengers: z.array(z.object({ challenger: z.number().int(), column: z.string(), name: z.string(), swap: swapSetsSchema })),
  patterns: approvalPatternsSchema,
});
export type ChallengersSwapResult = z.infer<typeof challengersSwapResultSchema>;

/** GET /api/comparisons/:id/scenarios; POST (policy role) → 201 the scenario. */
export const scenarioInputSchema = z.object({
  name: z.string().trim().min(1, 'Name the scenario').max(120),
  cutoffs: z.object({ champion: z.number(), challenger: z.number() }).nullable().default(null),
  approvalRate: z.number().gt(0).lt(1).nullable().default(null),
  note: z.string().trim().max(4000).default(''),
});
export type ScenarioInput = z.infer<typeof scenarioInputSchema>;
/**
 * A swap set of a saved scenario: rows and the bad rate of known outcomes; with weights or
 * applicants without an outcome also the accounts (weighted) and the inferred bad rate under the
 * run's reject inference (null under known-only).
 */
const scenarioCellSchema = z.object({
  count: z.number().int(),
  badRate: z.number().nullable(),
  accounts: z.number().optional(),
  inferredBadRate: z.number().nullable().optional(),
});

export const scenarioSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  cutoffs: z.object({ champion: z.number(), challenger: z.number() }),
  approvalRate: z.number().nullable(),
  note: z.string(),
  /** Swap-in and swap-out at save time, so a list can show them without recomputing. */
  swapIn: scenarioCellSchema,
  swapOut: scenarioCellSchema,
  createdBy: personRefSchema,
  createdAt: z.string(),
  /** Saved after the committee's decision: not part of what it saw. */
  afterDecision: z.boolean().default(false),
});
export type Scenario = z.infer<typeof scenarioSchema>;

// Exports (any signed-in person; formula-safe CSV written with fast-csv):
// GET /api/comparisons/:id/export/bands.csv
// GET /api/comparisons/:id/export/swap.csv?championCutoff=&challengerCutoff= | ?approvalRate=
//     (swap-in and swap-out accounts: id, both scores, outcome, amount; policy role)
// GET /api/comparisons/:id/export/report.json
