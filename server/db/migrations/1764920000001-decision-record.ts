import type { MigrationInterface, QueryRunner } from 'typeorm';
import { portableQuery } from './portable';

/**
 * Decisions that match the record (issue 13): the policy version governing a comparison from its
 * submission; notes and scenarios written after the decision are marked so; a decision keeps the
 * vote tally, whether the decider acknowledged deciding against the record, and an adoption with
 * exceptions (the mixed strategy); votes, reviews and decisions keep the person's name and e-mail
 * at the time. Columns only (ADD COLUMN keeps the tables and their no-update triggers). Rows
 * written before keep nulls: their names are read from the people as before.
 */
export class DecisionRecord1764920000001 implements MigrationInterface {
  name = 'DecisionRecord1764920000001';

  async up(queryRunner: QueryRunner): Promise<void> {
    await portableQuery(queryRunner, `ALTER TABLE "comparisons" ADD COLUMN "governingPolicyVersion" integer`);
    await portableQuery(queryRunner, `ALTER TABLE "notes" ADD COLUMN "afterDecision" boolean NOT NULL DEFAULT (0)`);
    await portableQuery(queryRunner, `ALTER TABLE "cutoff_scenarios" ADD COLUMN "afterDecision" boolean NOT NULL DEFAULT (0)`);
    await portableQuery(queryRunner, `ALTER TABLE "decisions" ADD COLUMN "decidedByName" text`);
    await portableQuery(queryRunner, `ALTER TABLE "decisions" ADD COLUMN "decidedByEmail" text`);
    await portableQuery(queryRunner, `ALTER TABLE "decisions" ADD COLUMN "tally" text`);
    await portableQuery(queryRunner, `ALTER TABLE "decisions" ADD COLUMN "acknowledgedAgainstRecord" boolean NOT NULL DEFAULT (0)`);
    await portableQuery(queryRunner, `ALTER TABLE "decisions" ADD COLUMN "strategy" text`);
    await portableQuery(queryRunner, `ALTER TABLE "votes" ADD COLUMN "voterName" text`);
    await portableQuery(queryRunner, `ALTER TABLE "votes" ADD COLUMN "voterEmail" text`);
    await portableQuery(queryRunner, `ALTER TABLE "reviews" ADD COLUMN "reviewerName" text`);
    await portableQuery(queryRunner, `ALTER TABLE "reviews" ADD COLUMN "reviewerEmail" text`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    for (const [table, column] of [
      ['reviews', 'reviewerEmail'],
      ['reviews', 'reviewerName'],
      ['votes', 'voterEmail'],
      ['votes', 'voterName'],
      ['decisions', 'strategy'],
      ['decisions', 'acknowledgedAgainstRecord'],
      ['decisions', 'tally'],
      ['decisions', 'decidedByEmail'],
      ['decisions', 'decidedByName'],
      ['cutoff_scenarios', 'afterDecision'],
      ['notes', 'afterDecision'],
      ['comparisons', 'governingPolicyVersion'],
    ]) {
      await portableQuery(queryRunner, `ALTER TABLE "${table}" DROP COLUMN "${column}"`);
    }
  }
}
