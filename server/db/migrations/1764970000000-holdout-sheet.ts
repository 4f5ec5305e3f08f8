import { type MigrationInterface, type QueryRunner, TableColumn } from 'typeorm';

/**
 * The worksheet an .xlsx holdout was read from (`holdouts.sheet`, null for CSV and for holdouts
 * stored before workbooks had a choice of sheet, which were read from their first sheet). Every
 * later reading of the stored bytes — validation, mapping, the PSI's reference — reads that sheet.
 *
 * Portable: on SQLite a plain ALTER TABLE ADD COLUMN, which keeps the table and its rows (TypeORM's
 * addColumn rebuilds a SQLite table, and dropping `holdouts` would run into holdout_chunks' and
 * comparisons' foreign keys); on other databases TypeORM's own addColumn.
 */
export class HoldoutSheet1764970000000 implements MigrationInterface {
  name = 'HoldoutSheet1764970000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    if (queryRunner.connection.driver.options.type === 'better-sqlite3') {
      await queryRunner.query(`ALTER TABLE "holdouts" ADD COLUMN "sheet" text`);
    } else {
      await queryRunner.addColumn('holdouts', new TableColumn({ name: 'sheet', type: 'text', isNullable: true }));
    }
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    if (queryRunner.connection.driver.options.type === 'better-sqlite3') {
      await queryRunner.query(`ALTER TABLE "holdouts" DROP COLUMN "sheet"`);
    } else {
      await queryRunner.dropColumn('holdouts', 'sheet');
    }
  }
}
