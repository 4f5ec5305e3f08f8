import type { MigrationInterface, QueryRunner } from 'typeorm';
import { appendOnly, dropAppendOnly, portableQuery, storedNow } from './portable';

/**
 * Governance: adoption-policy versions (version 1 = the default policy), verdict records, reviews,
 * committee votes, decisions and notes. Constraint and index names are the ones TypeORM derives
 * from the entities, so its schema diff after this migration is empty (tests/unit/schema.test.ts).
 *
 * Policy versions, verdict records, reviews, votes and decisions are records of what was decided
 * and under which rules: triggers refuse UPDATE and DELETE on them, as on audit_events.
 *
 * Version 1 is written out here rather than read from shared/policy.ts, so this migration keeps
 * doing what it did when it was first run; tests/unit/policy-seed.test.ts checks that it equals
 * `defaultAdoptionPolicy`.
 */

const immutableTables = ['policy_versions', 'verdict_records', 'reviews', 'votes', 'decisions'] as const;

export const seededPolicy = {
  alpha: 0.05,
  sided: 'one-sided',
  materialityGiniPoints: 2,
  requireIntervalAboveZero: true,
  swapRule: { enabled: true, approvalRate: 0.7 },
  minBads: 300,
  quorum: 0,
} as const;

export class Governance1764806400000 implements MigrationInterface {
  name = 'Governance1764806400000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner,
      `CREATE TABLE "policy_versions" ("version" integer PRIMARY KEY NOT NULL, "policy" text NOT NULL, "reason" text NOT NULL, ` +
        `"createdById" integer, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_acffaece227470f51d9019b2395" FOREIGN KEY ("createdById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner,
      `CREATE TABLE "reviews" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, "runId" integer NOT NULL, ` +
        `"outcome" text NOT NULL, "findings" text NOT NULL, "reviewerId" integer NOT NULL, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_4e01dc008a542b3514803b67ac9" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_6e0f253f551b35767f3c2e5c9fe" FOREIGN KEY ("runId") REFERENCES "analysis_runs" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_f9238c3e3739dc40322f577fc46" FOREIGN KEY ("reviewerId") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_6e0f253f551b35767f3c2e5c9f" ON "reviews" ("runId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_7b0740cb1fc5046bfd6575f256" ON "reviews" ("comparisonId", "id")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "verdict_records" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, "runId" integer NOT NULL, ` +
        `"policyVersion" integer NOT NULL, "outcome" text NOT NULL, "criteria" text NOT NULL, "summary" text NOT NULL, "createdById" integer, ` +
        `"createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_ce2a623ecf6fd018e36f6628b53" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_c63d8067accabd9200636cc70fb" FOREIGN KEY ("runId") REFERENCES "analysis_runs" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_d8eb42bddae86040505d90ff42e" FOREIGN KEY ("policyVersion") REFERENCES "policy_versions" ("version") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_faf2634b7dad36e13b39fc1dd9c" FOREIGN KEY ("createdById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_c63d8067accabd9200636cc70f" ON "verdict_records" ("runId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_91a46ecfb3e6b0d8c0999de12f" ON "verdict_records" ("comparisonId", "id")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "decisions" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, "runId" integer NOT NULL, ` +
        `"reviewId" integer NOT NULL, "policyVersion" integer NOT NULL, "verdictId" integer, "outcome" text NOT NULL, "rationale" text NOT NULL, ` +
        `"conditions" text, "effectiveDate" text, "decidedById" integer NOT NULL, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "UQ_ca820cbbe0ef728f59fc3e410e8" UNIQUE ("comparisonId"), ` +
        `CONSTRAINT "FK_ca820cbbe0ef728f59fc3e410e8" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_b411cbe368861a7bc346e69b156" FOREIGN KEY ("runId") REFERENCES "analysis_runs" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_b93e4981e4d8096fb45153cbc23" FOREIGN KEY ("reviewId") REFERENCES "reviews" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_8911d3fff729fc2603a44e309bc" FOREIGN KEY ("policyVersion") REFERENCES "policy_versions" ("version") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_a983712a1c369995dbab3cc793a" FOREIGN KEY ("verdictId") REFERENCES "verdict_records" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_e7a16bf4208ae5faa5b2d4370b2" FOREIGN KEY ("decidedById") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner,
      `CREATE TABLE "notes" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, "anchor" text NOT NULL, ` +
        `"body" text NOT NULL, "scenarioId" integer, "authorId" integer NOT NULL, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_9dea442e2925889c81299f8dc76" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_7676356dd9826fe08a6ecec4b83" FOREIGN KEY ("scenarioId") REFERENCES "cutoff_scenarios" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_d358080cb403fe88e62cc9cba58" FOREIGN KEY ("authorId") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_428aa626ac2b072c4e66d8e38b" ON "notes" ("comparisonId", "id")`);
    await portableQuery(queryRunner,
      `CREATE TABLE "votes" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "comparisonId" integer NOT NULL, "reviewId" integer NOT NULL, ` +
        `"voterId" integer NOT NULL, "vote" text NOT NULL, "comment" text NOT NULL, "replacesId" integer, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "FK_92a61f7652412a0e7c43c6eadcf" FOREIGN KEY ("comparisonId") REFERENCES "comparisons" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_797be9842556f00436f8fc5d5fd" FOREIGN KEY ("reviewId") REFERENCES "reviews" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_dcc38940c4fffe707c10e061d2a" FOREIGN KEY ("voterId") REFERENCES "users" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION, ` +
        `CONSTRAINT "FK_73dca027dfc08053aa944f578a2" FOREIGN KEY ("replacesId") REFERENCES "votes" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await portableQuery(queryRunner, `CREATE INDEX "IDX_92a61f7652412a0e7c43c6eadc" ON "votes" ("comparisonId")`);
    await portableQuery(queryRunner, `CREATE INDEX "IDX_8e8ac054b106f8598ec8dd057e" ON "votes" ("reviewId", "voterId")`);

    for (const table of immutableTables) await appendOnly(queryRunner, table, `${table} rows are kept as written`);

    await portableQuery(queryRunner,
      `INSERT INTO "policy_versions" ("version", "policy", "reason", "createdById", "createdAt") VALUES (1, ?, ?, NULL, ?)`,
      [JSON.stringify(seededPolicy), 'The default policy Scorecourt starts with.', storedNow(queryRunner)],
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    for (const table of [...immutableTables].reverse()) {
      await dropAppendOnly(queryRunner, table);
    }
    await portableQuery(queryRunner, `DROP INDEX "IDX_8e8ac054b106f8598ec8dd057e"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_92a61f7652412a0e7c43c6eadc"`);
    await portableQuery(queryRunner, `DROP TABLE "votes"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_428aa626ac2b072c4e66d8e38b"`);
    await portableQuery(queryRunner, `DROP TABLE "notes"`);
    await portableQuery(queryRunner, `DROP TABLE "decisions"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_91a46ecfb3e6b0d8c0999de12f"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_c63d8067accabd9200636cc70f"`);
    await portableQuery(queryRunner, `DROP TABLE "verdict_records"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_7b0740cb1fc5046bfd6575f256"`);
    await portableQuery(queryRunner, `DROP INDEX "IDX_6e0f253f551b35767f3c2e5c9f"`);
    await portableQuery(queryRunner, `DROP TABLE "reviews"`);
    await portableQuery(queryRunner, `DROP TABLE "policy_versions"`);
  }
}
