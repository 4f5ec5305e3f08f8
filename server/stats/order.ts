import type { HigherIs } from '@shared/report';

/**
 * Orientation and ordering helpers shared by every statistic.
 * Cost: safety() O(n); argsortAscending() O(n log n).
 */

/** Scores turned to "higher = safer": unchanged for points, negated for PD-like scores. */
export function safety(scores: Float64Array, higherIs: HigherIs): Float64Array {
  if (higherIs === 'safer') return scores;
  const out = new Float64Array(scores.length);
  for (let i = 0; i < scores.length; i++) out[i] = -scores[i];
  return out;
}

/** Indices that sort `values` ascending; ties keep index order (a stable sort). */
export function argsortAscending(values: Float64Array): Uint32Array {
  const index = new Uint32Array(values.length);
  for (let i = 0; i < index.length; i++) index[i] = i;
  index.sort((a, b) => values[a] - values[b] || a - b);
  return index;
}
