import type { MigrationInterface, QueryRunner } from 'typeorm';
import { portableQuery } from './portable';

/**
 * Holdouts (with their bytes in fixed-size chunks), comparisons, analysis runs (with their input
 * columns as typed-array blobs) and saved cut-off scenarios. Constraint and index names are the
 * ones TypeORM derives from the entities, so its schema diff after this migration is empty
 * (tests/unit/schema.test.ts).
 */
export class HoldoutsComparisonsRuns1764633600000 implements MigrationInterface {
  name = 'HoldoutsComparisonsRuns1764633600000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner,
      `CREATE TABLE "holdouts" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "fileName" text NOT NULL, "sha256" text NOT NULL, ` +
        `"bytes" integer NOT NULL, "rowCount" integer NOT NULL, "delimiter" text NOT NULL, "columns" text NOT NULL, "preview" text NOT NULL, ` +
        `"guess" text NOT NULL, "chunkSize" integer NOT NULL, "chunkCount" integer NOT NULL, "uploadedById" integer NOT NULL, ` +
        `"uploadedAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_7c2080f4d537c73db00f8547c60" FOREIGN KEY ("uploadedById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_dca9f517843d627e328a3b38c6" ON "holdouts" ("sha256")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "holdout_chunks" ("holdoutId" integer NOT NULL, "seq" integer NOT NULL, "data" blob NOT NULL, ` +
        `CONSTRAINT "FK_6fbadcfeae4a8e53d1e6fea56eb" FOREIGN KEY ("holdoutId") REFERENCES "holdouts" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, ` +
        `PRIMARY KEY ("holdoutId", "seq"))`,
    );
    await portableQuery(queryRunner,
      `CREATE TABLE "comparisons" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "name" text NOT NULL, "description" text, ` +
        `"holdoutId" integer NOT NULL, "mapping" text, "settings" text, "state" text NOT NULL, "createdById" integer NOT NULL, ` +
        `"createdAt" datetime NOT NULL, "updatedAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_83eefbccb9d53d4a562741b02a4" FOREIGN KEY ("holdoutId") REFERENCES "holdouts" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_db691443ff75b338a1f0637f27a" FOREIGN KEY ("createdById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_83eefbccb9d53d4a562741b02a" ON "comparisons" ("holdoutId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_ca15868f8ca1fc17520222d9e9" ON "comparisons" ("state", "updatedAt")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "analysis_runs" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, ` +
        `"holdoutId" integer NOT NULL, "status" text NOT NULL, "progress" real NOT NULL DEFAULT (0), "stage" text, ` +
        `"attempts" integer NOT NULL DEFAULT (0), "error" text, "engineVersion" text, "queuedAt" datetime NOT NULL, ` +
        `"startedAt" datetime, "finishedAt" datetime, "mapping" text NOT NULL, "settings" text NOT NULL, "input" text NOT NULL, ` +
        `"report" text, "headline" text, "requestedById" integer NOT NULL, ` +
        `CONSTRAINT "FK_30449b16230a31e008d3ea15fe4" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_c6a8cbe9851ed249ece3f11ef8e" FOREIGN KEY ("holdoutId") REFERENCES "holdouts" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_e0a1032cb2e00cce8d6242891d4" FOREIGN KEY ("requestedById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_30449b16230a31e008d3ea15fe" ON "analysis_runs" ("comparisonId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_c6a8cbe9851ed249ece3f11ef8" ON "analysis_runs" ("holdoutId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_c8e2b7463b90caae36900b41d8" ON "analysis_runs" ("status", "id")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "run_columns" ("runId" integer NOT NULL, "name" text NOT NULL, "data" blob NOT NULL, ` +
        `CONSTRAINT "FK_5cb0779668a9f4a3fc98cb955e6" FOREIGN KEY ("runId") REFERENCES "analysis_runs" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, ` +
        `PRIMARY KEY ("runId", "name"))`,
    );
    await portableQuery(queryRunner,
      `CREATE TABLE "cutoff_scenarios" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, ` +
        `"runId" integer NOT NULL, "name" text NOT NULL, "championCutoff" real NOT NULL, "challengerCutoff" real NOT NULL, ` +
        `"approvalRate" real, "note" text NOT NULL, "swap" text NOT NULL, "createdById" integer NOT NULL, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_8c0978a4f3bf854ecdca8aafef7" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_ed38b0273d471722c8b0644af7d" FOREIGN KEY ("runId") REFERENCES "analysis_runs" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_8790d17855dedc7d8e75544e2f2" FOREIGN KEY ("createdById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_8c0978a4f3bf854ecdca8aafef" ON "cutoff_scenarios" ("comparisonId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_ed38b0273d471722c8b0644af7" ON "cutoff_scenarios" ("runId")`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `DROP TABLE "cutoff_scenarios"`);
    await portableQuery(queryRunner, `DROP TABLE "run_columns"`);
    await portableQuery(queryRunner, `DROP TABLE "analysis_runs"`);
    await portableQuery(queryRunner, `DROP TABLE "comparisons"`);
    await portableQuery(queryRunner, `DROP TABLE "holdout_chunks"`);
    await portableQuery(queryRunner, `DROP TABLE "holdouts"`);
  }
}
