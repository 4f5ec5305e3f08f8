import { type ComparisonSummary } from '@shared/comparisons';

/**
 * Several challengers: the model the current verdict record recommends and, once decided, the one
 * the decision chose. Nothing with one challenger (the list reads as before).
 */
export function choiceLines(summary: Pick<ComparisonSummary, 'verdict' | 'decided'>): string[] {
  const record = summary.verdict;
  if (!record || record.challengers.length < 2) return [];
  const recommended = record.recommended === null ? null : (record.challengers[record.recommended]?.name ?? null);
  const lines = [recommended === null ? 'Recommended: none (the champion stays)' : `Recommended: ${recommended}`];
  const chosen = summary.decided?.chosen ?? null;
  if (summary.decided?.outcome === 'adopt' && chosen?.model === 'challenger') lines.push(`Adopted: ${chosen.name}`);
  else if (summary.decided?.outcome === 'keep') lines.push('Decided: keep the champion');
  else if (summary.decided?.outcome === 'defer') lines.push('Decided: defer');
  return lines;
}
