import { z } from 'zod';

/**
 * Conditional adoption: the challenger everywhere except chosen segment values, which keep the
 * champion ("adopt, except for brokered cards"). Both models keep the cut-offs they have at the
 * approval rate (matched on the whole holdout, tie rule of the swap sets); an account in a kept
 * value is decided by the champion's cut-off, every other account by the challenger's.
 */
export const segmentValueRefSchema = z.object({ column: z.string().min(1).max(200), value: z.string().max(500) });
export type SegmentValueRef = z.infer<typeof segmentValueRefSchema>;

export const strategyBookSchema = z.object({
  accepted: z.number().int(),
  bads: z.number().int(),
  approvalRate: z.number(),
  /** Bad rate of the approved book; null when nobody is approved. */
  badRate: z.number().nullable(),
});
export type StrategyBook = z.infer<typeof strategyBookSchema>;

export const strategySwapSchema = z.object({
  /** Champion rejects, the strategy accepts. */
  swapIn: z.object({ count: z.number().int(), bads: z.number().int(), badRate: z.number().nullable() }),
  /** Champion accepts, the strategy rejects. */
  swapOut: z.object({ count: z.number().int(), bads: z.number().int(), badRate: z.number().nullable() }),
});

export const mixedStrategyResultSchema = z.object({
  /** The approval rate the cut-offs were matched to. */
  approvalRate: z.number(),
  cutoffs: z.object({ champion: z.number(), challenger: z.number() }),
  keepChampion: z.array(segmentValueRefSchema),
  /** Accounts in the kept values. */
  keptAccounts: z.number().int(),
  champion: strategyBookSchema,
  /** Pure adoption: the challenger everywhere. */
  pure: strategyBookSchema.extend(strategySwapSchema.shape),
  /** The mixed strategy. */
  mixed: strategyBookSchema.extend(strategySwapSchema.shape),
});
export type MixedStrategyResult = z.infer<typeof mixedStrategyResultSchema>;

/** POST /api/comparisons/:id/mixed-strategy (policy, committee): the figures for these exceptions. */
export const mixedStrategyQuerySchema = z.object({
  keepChampion: z.array(segmentValueRefSchema).min(1).max(100),
  approvalRate: z.number().gt(0).lt(1).optional(),
});
export type MixedStrategyQuery = z.infer<typeof mixedStrategyQuerySchema>;
