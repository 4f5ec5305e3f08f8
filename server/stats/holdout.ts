import type { HigherIs } from '@shared/report';

/**
 * A holdout in column form, as the engine reads it: one entry per account, typed arrays for
 * everything per-row. Scores are kept as given in the file (each model's own units and
 * orientation); `safety()` in order.ts turns them into "higher = safer" for the statistics.
 */
export interface Holdout {
  n: number;
  /** 1 = bad (the event), 0 = good. */
  bad: Uint8Array;
  champion: Float64Array;
  challenger: Float64Array;
  higherIs: { champion: HigherIs; challenger: HigherIs };
  /**
   * Challengers after the primary (`challenger`), in the mapping's order: each its column, the
   * modeler's name, orientation and scores as given. Absent or empty: a two-model comparison.
   */
  moreChallengers?: ExtraChallengerScores[];
  /** Exposure / amount per account, when mapped. */
  exposure: Float64Array | null;
  /** Account ids as read, when mapped. */
  ids: string[] | null;
  /** Categorical columns: the distinct values and each account's index into them. */
  segments: SegmentColumn[];
  /** Rating grade column of each model (calibration by grade), when mapped. */
  grades?: { champion: SegmentColumn | null; challenger: SegmentColumn | null };
  /** Month or vintage column (stability by period), when mapped. */
  period?: SegmentColumn | null;
  /** Sampling weight per row (positive, finite): the applicants the row stands for; absent = 1 each. */
  weight?: Float64Array | null;
  /** 1 = the outcome is known, 0 = no outcome (kept with keep-unknown; bad is 0 there); absent = all known. */
  known?: Uint8Array | null;
  /** Probability of bad from the mapped inferred-bad column (NaN where not given); absent when not mapped. */
  inferredBad?: Float64Array | null;
}

export interface ExtraChallengerScores {
  column: string;
  name: string;
  higherIs: HigherIs;
  scores: Float64Array;
}

/**
 * The holdout with challenger k (0 = the primary) in the challenger's place: the two-model
 * holdout every pairwise section (swap sets, curves, bands) is computed on. No copy of any column.
 */
export function withChallenger(holdout: Holdout, k: number): Holdout {
  if (k === 0) return holdout;
  const extra = holdout.moreChallengers?.[k - 1];
  if (!extra) throw new RangeError(`no challenger ${k}`);
  const pair: Holdout = { ...holdout, challenger: extra.scores, higherIs: { champion: holdout.higherIs.champion, challenger: extra.higherIs } };
  delete pair.moreChallengers;
  if (holdout.grades) pair.grades = { champion: holdout.grades.champion, challenger: null };
  return pair;
}

export interface SegmentColumn {
  column: string;
  levels: string[];
  codes: Uint32Array;
}

export type ModelName = 'champion' | 'challenger';
/**
 * A segment column's level indexes in the order its values are reported: by the values' UTF-16
 * code units (the same for every report; not locale-dependent).
 */
export function levelOrder(levels: readonly string[]): number[] {
  return [...levels.keys()].sort((x, y) => (levels[x] < levels[y] ? -1 : levels[x] > levels[y] ? 1 : 0));
}
