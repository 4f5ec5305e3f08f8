import type { MigrationInterface, QueryRunner } from 'typeorm';
import { appendOnly, dropAppendOnly, portableQuery } from './portable';

/**
 * The committee pack archived with each decision (`decision_packs`): the PDF's bytes and SHA-256.
 * Like the decision itself, a stored pack is never changed or removed: triggers refuse both.
 */
export class DecisionPacks1764940000000 implements MigrationInterface {
  name = 'DecisionPacks1764940000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner,
      `CREATE TABLE "decision_packs" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "decisionId" integer NOT NULL, "comparisonId" integer NOT NULL, ` +
        `"sha256" text NOT NULL, "bytes" integer NOT NULL, "pdf" blob NOT NULL, "createdAt" datetime NOT NULL, ` +
        `CONSTRAINT "UQ_bf272c9334453688c4588c8126f" UNIQUE ("decisionId"), ` +
        `CONSTRAINT "FK_bf272c9334453688c4588c8126f" FOREIGN KEY ("decisionId") REFERENCES "decisions" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`,
    );
    await appendOnly(queryRunner, 'decision_packs', 'decision_packs rows are kept as written');
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await dropAppendOnly(queryRunner, 'decision_packs');
    await portableQuery(queryRunner, `DROP TABLE "decision_packs"`);
  }
}
