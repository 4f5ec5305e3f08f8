import type { MigrationInterface, QueryRunner } from 'typeorm';
import { portableQuery } from './portable';

/**
 * The PSI's reference sample: the holdout a run took its development-sample scores from
 * (`analysis_runs.referenceHoldoutId`, null when none). Added with ALTER TABLE, which keeps the
 * table and its rows as they are (a rebuild would cascade through run_columns); the index name is
 * the one TypeORM derives from the entity, so its schema diff stays empty (tests/unit/schema.test.ts).
 */
export class ReferenceSample1764930000000 implements MigrationInterface {
  name = 'ReferenceSample1764930000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `ALTER TABLE "analysis_runs" ADD COLUMN "referenceHoldoutId" integer`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_fb3b6c44cf82cf0858700c6d3c" ON "analysis_runs" ("referenceHoldoutId") `);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `DROP INDEX "IDX_fb3b6c44cf82cf0858700c6d3c"`);
    await portableQuery(queryRunner, `ALTER TABLE "analysis_runs" DROP COLUMN "referenceHoldoutId"`);
  }
}
