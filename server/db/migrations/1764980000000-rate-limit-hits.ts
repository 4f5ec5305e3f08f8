import { Table, type MigrationInterface, type QueryRunner } from 'typeorm';
import { postgresType } from './portable';

/**
 * Rate-limit counters in the database (`rate_limit_hits`), so that several server instances on
 * one PostgreSQL database count the same sign-in attempts (auth/rate-limit-store.ts). Created on
 * SQLite too, where the single server keeps its counters in memory and leaves the table empty.
 */
export class RateLimitHits1764980000000 implements MigrationInterface {
  name = 'RateLimitHits1764980000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.createTable(
      new Table({
        name: 'rate_limit_hits',
        columns: [
          { name: 'key', type: 'text', isPrimary: true, isNullable: false },
          { name: 'hits', type: 'integer', isNullable: false },
          { name: 'resetAt', type: postgresType(queryRunner, 'datetime'), isNullable: false },
        ],
      }),
    );
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.dropTable('rate_limit_hits');
  }
}
