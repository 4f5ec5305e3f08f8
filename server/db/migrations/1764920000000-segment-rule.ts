import type { MigrationInterface, QueryRunner } from 'typeorm';
import { portableQuery, storedNow } from './portable';

/**
 * The segment rule ("no segment value significantly worse") and a quorum of two committee votes.
 *
 * Policy versions are never changed (triggers refuse it), so this appends a version: the newest
 * stored policy with `segmentRule` on (30 bads) added. When the newest version is still the
 * default written by the governance migration (version 1, no admin's change), its quorum of 0 also
 * becomes 2, the new default; a quorum an admin chose is kept. Versions stored before stay as they
 * were and are read with the rule off (shared/policy.ts), so their verdicts keep their meaning.
 * Written out here rather than read from shared/policy.ts, so the migration keeps doing what it did.
 */

export const segmentRuleAdded = { enabled: true, minBads: 30 } as const;

export class SegmentRule1764920000000 implements MigrationInterface {
  name = 'SegmentRule1764920000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    const rows = (await portableQuery(queryRunner, `SELECT "version", "policy", "createdById" FROM "policy_versions" ORDER BY "version" DESC LIMIT 1`)) as {
      version: number;
      policy: string;
      createdById: number | null;
    }[];
    const newest = rows[0];
    if (!newest) return;
    const policy = JSON.parse(newest.policy) as Record<string, unknown>;
    if (policy.segmentRule !== undefined) return;
    const untouchedDefault = newest.version === 1 && newest.createdById === null;
    const next = { ...policy, quorum: untouchedDefault && policy.quorum === 0 ? 2 : policy.quorum, segmentRule: segmentRuleAdded };
    await portableQuery(queryRunner,
      `INSERT INTO "policy_versions" ("version", "policy", "reason", "createdById", "createdAt") VALUES (?, ?, ?, NULL, ?)`,
      [
        newest.version + 1,
        JSON.stringify(next),
        untouchedDefault
          ? 'Scorecourt update: a segment value where the challenger is significantly worse now blocks adoption (at least 30 bads), and a decision needs two committee votes.'
          : 'Scorecourt update: a segment value where the challenger is significantly worse now blocks adoption (at least 30 bads).',
        storedNow(queryRunner),
      ],
    );
  }

  async down(): Promise<void> {
    // Policy versions are kept as written (triggers refuse DELETE): the appended version stays.
  }
}
