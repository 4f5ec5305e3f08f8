import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Names at the time of the act on the audit trail (issue 13): each event keeps its actor's name
 * and e-mail as they were when it was recorded, so a later rename does not rewrite history; both
 * enter the event's hash (server/audit/audit.ts) when present. Columns only: ADD COLUMN (the same
 * statement on SQLite and PostgreSQL) keeps the table and its no-update, no-delete triggers, which
 * TypeORM's addColumn would drop on SQLite by rebuilding the table. Events written before keep
 * nulls: their hash is unchanged and their names are read from the people as before.
 */
export class AuditActorNames1764960000000 implements MigrationInterface {
  name = 'AuditActorNames1764960000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "audit_events" ADD COLUMN "actorName" text`);
    await queryRunner.query(`ALTER TABLE "audit_events" ADD COLUMN "actorEmail" text`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "audit_events" DROP COLUMN "actorEmail"`);
    await queryRunner.query(`ALTER TABLE "audit_events" DROP COLUMN "actorName"`);
  }
}
