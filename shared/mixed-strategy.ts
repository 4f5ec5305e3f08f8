import { z } from 'zod';
import { MAX_CHALLENGERS } from './report';

/**
 * Conditional adoption: the challenger everywhere except chosen segment values, which keep the
 * champion ("adopt, except for brokered cards"). Both models keep the cut-offs they have at the
 * approval rate (matched on the whole holdout, tie rule of the swap sets); an account in a kept
 * value is decided by the champion's cut-off, every other account by the challenger's.
 * Accounts are weighted (summed sampling weights; counts without weights); bads and bad rates are
 * of the accounts with a known outcome, and, when the run infers the bads of applicants without
 * an outcome (reject inference by parcel or column), `inferredBadRate` states the rate over all
 * accounts with those inferred bads counted, named as inferred wherever it is shown
 * (server/stats/mixed-strategy.ts).
 */
export const segmentValueRefSchema = z.object({ column: z.string().min(1).max(200), value: z.string().max(500) });
export type SegmentValueRef = z.infer<typeof segmentValueRefSchema>;

export const strategyBookSchema = z.object({
  /** Accounts approved (weighted). */
  accepted: z.number(),
  /** Known bads approved (weighted). */
  bads: z.number(),
  /** accepted / all accounts of the group. */
  approvalRate: z.number().nullable(),
  /** Bad rate of the approved book (known accounts); null when no approved account has an outcome. */
  badRate: z.number().nullable(),
  /** Known bads plus the inferred bads of the approved accounts without an outcome, over all approved accounts; absent without reject inference. */
  inferredBadRate: z.number().nullable().optional(),
});
export type StrategyBook = z.infer<typeof strategyBookSchema>;

export const strategySwapCellSchema = z.object({
  count: z.number(),
  bads: z.number(),
  badRate: z.number().nullable(),
  /** As in the book: the rate with the inferred bads of accounts without an outcome; absent without reject inference. */
  inferredBadRate: z.number().nullable().optional(),
});

export const strategySwapSchema = z.object({
  /** Champion rejects, the strategy accepts. */
  swapIn: strategySwapCellSchema,
  /** Champion accepts, the strategy rejects. */
  swapOut: strategySwapCellSchema,
});

export const strategyWithSwapsSchema = strategyBookSchema.extend(strategySwapSchema.shape);
export type StrategyWithSwaps = z.infer<typeof strategyWithSwapsSchema>;

export const mixedStrategySegmentSchema = z.object({
  column: z.string(),
  value: z.string(),
  /** This value keeps the champion under the mixed strategy. */
  kept: z.boolean(),
  /** Accounts in the value (weighted). */
  accounts: z.number(),
  champion: strategyBookSchema,
  mixed: strategyWithSwapsSchema,
});
export type MixedStrategySegment = z.infer<typeof mixedStrategySegmentSchema>;

export const mixedStrategyResultSchema = z.object({
  /** The run the figures were computed on. */
  runId: z.number().int().optional(),
  /** The approval rate the cut-offs were matched to. */
  approvalRate: z.number(),
  cutoffs: z.object({ champion: z.number(), challenger: z.number() }),
  keepChampion: z.array(segmentValueRefSchema),
  /** Accounts in the kept values (weighted). */
  keptAccounts: z.number(),
  /** All accounts of the holdout (weighted). */
  accounts: z.number().optional(),
  champion: strategyBookSchema,
  /** Pure adoption: the challenger everywhere. */
  pure: strategyWithSwapsSchema,
  /** The mixed strategy. */
  mixed: strategyWithSwapsSchema,
  /** The reject inference behind `inferredBadRate`; absent when the run has none (known outcomes only). */
  inference: z.enum(['parcel', 'column']).optional(),
  /** Per value of every segment column: the champion's book and the mixed strategy's, with its swaps. */
  bySegment: z.array(mixedStrategySegmentSchema).default([]),
  /**
   * Several challengers: the challenger adopted outside the kept values (index into the report's
   * `challengers`, 0 = the primary) and its name; absent with one challenger (as before).
   */
  challenger: z.number().int().min(0).optional(),
  challengerName: z.string().optional(),
});
export type MixedStrategyResult = z.infer<typeof mixedStrategyResultSchema>;

/** POST /api/comparisons/:id/mixed-strategy (policy, committee): the figures for these exceptions. */
export const mixedStrategyQuerySchema = z.object({
  keepChampion: z.array(segmentValueRefSchema).min(1, 'Choose at least one segment value to keep on the champion').max(100),
  /** Default: the run's approval rate (the report's strategy curve). */
  approvalRate: z.number().gt(0).lt(1).optional(),
  /** Several challengers: the one adopted outside the kept values (index, default 0 = the primary). */
  challenger: z.number().int().min(0).max(MAX_CHALLENGERS - 1).optional(),
});
export type MixedStrategyQuery = z.infer<typeof mixedStrategyQuerySchema>;

/** "column = value", as the pages, the pack and the e-mails name a segment value. */
export function segmentValueLabel(ref: SegmentValueRef): string {
  return `${ref.column} = ${ref.value}`;
}
