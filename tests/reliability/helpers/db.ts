import { readdirSync } from 'node:fs';
import Database from 'better-sqlite3';
import { verifyAuditChain } from '@server/audit/audit';
import { openDatabase } from '@server/db/data-source';

/**
 * Looks into a server's SQLite file from outside (read-only; WAL lets it read while the server
 * runs): integrity, foreign keys, row counts, and the invariants of "nothing half-stored".
 */

export const tables = [
  'users', 'sessions', 'one_time_tokens', 'audit_events', 'mail_messages', 'holdouts', 'holdout_chunks', 'comparisons',
  'analysis_runs', 'run_columns', 'cutoff_scenarios', 'reviews', 'votes', 'decisions', 'verdict_records', 'notes', 'policy_versions',
] as const;

export interface Inspection {
  integrity: string;
  foreignKeyProblems: number;
  counts: Record<string, number>;
  /** Chunks whose holdout row does not exist. */
  orphanChunks: number;
  /** Holdouts whose chunks are missing, extra or of the wrong total size. */
  incompleteHoldouts: number[];
  /** Holdouts without their `holdout.uploaded` audit event. */
  holdoutsWithoutAudit: number[];
  /** Comparisons without their `comparison.created` audit event. */
  comparisonsWithoutAudit: number[];
  /** Runs by status. */
  runs: Record<string, number>;
  /** Runs missing one of their input columns (bad, champion, challenger). */
  runsWithoutColumns: number[];
}

export function inspect(databasePath: string): Inspection {
  const db = new Database(databasePath, { readonly: true, fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    const integrity = (db.pragma('integrity_check') as { integrity_check: string }[]).map((row) => row.integrity_check).join('; ');
    const foreignKeyProblems = (db.pragma('foreign_key_check') as unknown[]).length;
    const counts: Record<string, number> = {};
    for (const table of tables) counts[table] = (db.prepare(`SELECT COUNT(*) AS n FROM "${table}"`).get() as { n: number }).n;
    const orphanChunks = (
      db.prepare('SELECT COUNT(*) AS n FROM "holdout_chunks" c LEFT JOIN "holdouts" h ON h."id" = c."holdoutId" WHERE h."id" IS NULL').get() as { n: number }
    ).n;
    const incompleteHoldouts = (
      db
        .prepare(
          `SELECT h."id" AS id FROM "holdouts" h
           LEFT JOIN (SELECT "holdoutId", COUNT(*) AS n, SUM(LENGTH("data")) AS bytes, MAX("seq") AS last FROM "holdout_chunks" GROUP BY "holdoutId") c ON c."holdoutId" = h."id"
           WHERE COALESCE(c.n, 0) != h."chunkCount" OR COALESCE(c.bytes, 0) != h."bytes" OR COALESCE(c.last, -1) != h."chunkCount" - 1`,
        )
        .all() as { id: number }[]
    ).map((row) => row.id);
    const withoutEvent = (table: string, type: string, action: string) =>
      (
        db
          .prepare(`SELECT t."id" AS id FROM "${table}" t WHERE NOT EXISTS (SELECT 1 FROM "audit_events" a WHERE a."targetType" = ? AND a."targetId" = CAST(t."id" AS TEXT) AND a."action" = ?)`)
          .all(type, action) as { id: number }[]
      ).map((row) => row.id);
    const runs: Record<string, number> = {};
    for (const row of db.prepare('SELECT "status", COUNT(*) AS n FROM "analysis_runs" GROUP BY "status"').all() as { status: string; n: number }[]) runs[row.status] = row.n;
    const runsWithoutColumns = (
      db
        .prepare(
          `SELECT r."id" AS id FROM "analysis_runs" r WHERE r."status" != 'failed' AND
           (SELECT COUNT(*) FROM "run_columns" c WHERE c."runId" = r."id" AND c."name" IN ('bad', 'champion', 'challenger')) != 3`,
        )
        .all() as { id: number }[]
    ).map((row) => row.id);
    return {
      integrity,
      runsWithoutColumns,
      foreignKeyProblems,
      counts,
      orphanChunks,
      incompleteHoldouts,
      holdoutsWithoutAudit: withoutEvent('holdouts', 'holdout', 'holdout.uploaded'),
      comparisonsWithoutAudit: withoutEvent('comparisons', 'comparison', 'comparison.created'),
      runs,
    };
  } finally {
    db.close();
  }
}

/** The invariants every inspection must meet; [] when it does. */
export function invariantProblems(found: Inspection): string[] {
  const problems: string[] = [];
  if (found.integrity !== 'ok') problems.push(`PRAGMA integrity_check: ${found.integrity}`);
  if (found.foreignKeyProblems > 0) problems.push(`${found.foreignKeyProblems} foreign-key problems`);
  if (found.orphanChunks > 0) problems.push(`${found.orphanChunks} holdout chunks without their holdout`);
  if (found.incompleteHoldouts.length > 0) problems.push(`holdouts stored in part: ${found.incompleteHoldouts.join(', ')}`);
  if (found.holdoutsWithoutAudit.length > 0) problems.push(`holdouts without their audit event: ${found.holdoutsWithoutAudit.join(', ')}`);
  if (found.runsWithoutColumns.length > 0) problems.push(`runs without their input columns: ${found.runsWithoutColumns.join(', ')}`);
  if (found.comparisonsWithoutAudit.length > 0) problems.push(`comparisons without their audit event: ${found.comparisonsWithoutAudit.join(', ')}`);
  return problems;
}

/** The audit chain, checked with the server's own verifier (open the file only while the server is stopped). */
export async function auditChainOffline(databasePath: string): Promise<Awaited<ReturnType<typeof verifyAuditChain>>> {
  const dataSource = await openDatabase(databasePath);
  try {
    return await verifyAuditChain(dataSource);
  } finally {
    await dataSource.destroy();
  }
}

/** Files in the server's upload folder (it must be empty between requests). */
export function uploadLeftovers(uploadDir: string): string[] {
  try {
    return readdirSync(uploadDir);
  } catch {
    return [];
  }
}
