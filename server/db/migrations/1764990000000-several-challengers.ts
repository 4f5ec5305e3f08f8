import { type MigrationInterface, type QueryRunner, TableColumn } from 'typeorm';

/**
 * Several challengers: a vote for adoption names its challenger (`votes.challenger`, an index into
 * the report's challengers), a decision names the model chosen (`decisions.chosen`, JSON: champion
 * or which challenger, with column and name), and a verdict record keeps every challenger's
 * verdict and the recommended one (`verdict_records.challengers` JSON, `recommended`,
 * `choiceSummary`). All nullable: records written before keep their meaning (one challenger).
 *
 * Portable: on SQLite a plain ALTER TABLE ADD COLUMN, which keeps the tables, their rows and their
 * append-only triggers (TypeORM's addColumn rebuilds a SQLite table); elsewhere TypeORM's addColumn.
 */
const added: [table: string, column: string, type: 'text' | 'integer'][] = [
  ['votes', 'challenger', 'integer'],
  ['decisions', 'chosen', 'text'],
  ['verdict_records', 'challengers', 'text'],
  ['verdict_records', 'recommended', 'integer'],
  ['verdict_records', 'choiceSummary', 'text'],
];

export class SeveralChallengers1764990000000 implements MigrationInterface {
  name = 'SeveralChallengers1764990000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    for (const [table, column, type] of added) {
      if (queryRunner.connection.driver.options.type === 'better-sqlite3') {
        await queryRunner.query(`ALTER TABLE "${table}" ADD COLUMN "${column}" ${type}`);
      } else {
        await queryRunner.addColumn(table, new TableColumn({ name: column, type, isNullable: true }));
      }
    }
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    for (const [table, column] of [...added].reverse()) {
      if (queryRunner.connection.driver.options.type === 'better-sqlite3') {
        await queryRunner.query(`ALTER TABLE "${table}" DROP COLUMN "${column}"`);
      } else {
        await queryRunner.dropColumn(table, column);
      }
    }
  }
}
