import type { MigrationInterface, QueryRunner } from 'typeorm';
import { portableQuery } from './portable';

/**
 * `staged_uploads`: uploads received into the upload folder and not yet stored, so that another
 * instance sharing the folder finishes storing them, or cleans them up, when the instance that
 * received one stopped mid-way (holdouts/staged-uploads.ts).
 */
export class StagedUploads1765000000000 implements MigrationInterface {
  name = 'StagedUploads1765000000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(
      queryRunner,
      `CREATE TABLE "staged_uploads" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "file" text NOT NULL, "originalName" text NOT NULL, ` +
        `"sheet" text, "uploadedById" integer NOT NULL, "receivedAt" datetime NOT NULL, "claimedUntil" datetime NOT NULL, "takeovers" integer NOT NULL DEFAULT (0))`,
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TABLE "staged_uploads"');
  }
}
