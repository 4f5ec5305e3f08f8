import type { CurrentVerdict } from '@shared/comparisons';
import { In, type DataSource, type EntityManager } from 'typeorm';
import { VerdictRecord } from '../db/entities/index';
import { rawQuery } from '../db/driver';

/**
 * The one verdict each comparison shows everywhere (header badge, verdict tab, list, e-mails):
 * after a decision, the verdict record the decision was made on; otherwise the newest verdict
 * record of the current run (the newest done run), whatever policy version it was judged under.
 * Older records are history. One query for the ids, one for the records, for a whole page.
 */
export async function currentVerdicts(source: DataSource | EntityManager, comparisonIds: readonly number[]): Promise<Map<number, CurrentVerdict>> {
  const result = new Map<number, CurrentVerdict>();
  if (comparisonIds.length === 0) return result;
  const placeholders = comparisonIds.map(() => '?').join(', ');
  const rows = await rawQuery<{ id: number | null }>(
    source,
    `SELECT COALESCE(` +
      `(SELECT d."verdictId" FROM "decisions" d WHERE d."comparisonId" = c."id" AND d."verdictId" IS NOT NULL ORDER BY d."id" DESC LIMIT 1), ` +
      `(SELECT MAX(v."id") FROM "verdict_records" v WHERE v."comparisonId" = c."id" AND v."runId" = ` +
      `(SELECT MAX(r."id") FROM "analysis_runs" r WHERE r."comparisonId" = c."id" AND r."status" = 'done'))) AS "id" ` +
      `FROM "comparisons" c WHERE c."id" IN (${placeholders})`,
    [...comparisonIds],
  );
  const ids = rows.flatMap((row) => (row.id === null ? [] : [row.id]));
  if (ids.length === 0) return result;
  const records = await source.getRepository(VerdictRecord).find({ where: { id: In(ids) } });
  for (const record of records) result.set(record.comparisonId, presentCurrentVerdict(record));
  return result;
}

export function presentCurrentVerdict(record: VerdictRecord): CurrentVerdict {
  return {
    id: record.id,
    runId: record.runId,
    policyVersion: record.policyVersion,
    outcome: record.outcome,
    criteria: record.criteria,
    summary: record.summary,
    createdAt: record.createdAt.toISOString(),
    challengers: record.challengers ?? [],
    recommended: record.recommended,
    choiceSummary: record.choiceSummary ?? '',
  };
}

export async function currentVerdict(source: DataSource | EntityManager, comparisonId: number): Promise<CurrentVerdict | null> {
  return (await currentVerdicts(source, [comparisonId])).get(comparisonId) ?? null;
}
