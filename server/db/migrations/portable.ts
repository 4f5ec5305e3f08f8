import type { QueryRunner } from 'typeorm';
import { numberedPlaceholders } from '../driver';
import { now } from '../../clock';

/**
 * The migrations are written once, in SQLite's SQL as they were first run (so an existing SQLite
 * database sees exactly the statements it always did), and read for PostgreSQL by the rules below.
 * New migrations should prefer TypeORM's QueryRunner API (`addColumn`, `createTable`), which
 * needs nothing from here except the column types PostgreSQL lacks (`postgresType`).
 *
 * For PostgreSQL, a statement's
 * - `integer PRIMARY KEY AUTOINCREMENT` becomes `SERIAL PRIMARY KEY` (a sequence, as TypeORM's
 *   generated columns expect);
 * - `datetime` becomes `timestamptz`, `blob` → `bytea`, `real` → `double precision`
 *   (db/postgres.ts says why; the entities are read the same way);
 * - a boolean's `DEFAULT (0)` / `DEFAULT (1)` becomes `DEFAULT false` / `DEFAULT true`;
 * - `?` placeholders are numbered (`$1`, `$2`, …).
 * Append-only tables get their triggers through `appendOnly`: SQLite's `RAISE(ABORT)` triggers, or
 * one PL/pgSQL function that raises, called by BEFORE UPDATE / DELETE row triggers and a BEFORE
 * TRUNCATE statement trigger.
 */

export function onPostgres(queryRunner: QueryRunner): boolean {
  return queryRunner.connection.driver.options.type === 'postgres';
}

/** A statement as PostgreSQL should read it (see above). */
export function postgresSql(sql: string): string {
  return numberedPlaceholders(
    sql
      .replace(/"([^"]+)" integer PRIMARY KEY AUTOINCREMENT NOT NULL/g, '"$1" SERIAL NOT NULL PRIMARY KEY')
      .replace(/" datetime\b/g, '" timestamptz')
      .replace(/" blob\b/g, '" bytea')
      .replace(/" real\b/g, '" double precision')
      .replace(/ boolean( NOT NULL)? DEFAULT \(([01])\)/g, (_match, notNull: string | undefined, value: string) => ` boolean${notNull ?? ''} DEFAULT ${value === '1' ? 'true' : 'false'}`),
  );
}

/** Runs a statement written for SQLite on either database. */
export function portableQuery(queryRunner: QueryRunner, sql: string, parameters?: unknown[]): Promise<unknown> {
  return queryRunner.query(onPostgres(queryRunner) ? postgresSql(sql) : sql, parameters);
}

/** A column type for `new TableColumn({ type })` on the migration's database (`datetime`, `blob`, `real` differ). */
export function postgresType(queryRunner: QueryRunner, sqliteType: string): string {
  if (!onPostgres(queryRunner)) return sqliteType;
  return { datetime: 'timestamptz', blob: 'bytea', real: 'double precision' }[sqliteType] ?? sqliteType;
}

/** The current time as a parameter for a `datetime` column written by raw SQL in a migration. */
export function storedNow(queryRunner: QueryRunner): string | Date {
  const at = now();
  return onPostgres(queryRunner) ? at : at.toISOString().replace('T', ' ').replace('Z', '');
}

/** Refuses UPDATE and DELETE (and on PostgreSQL TRUNCATE) on `table`, with `message` as the error. */
export async function appendOnly(queryRunner: QueryRunner, table: string, message: string): Promise<void> {
  if (!onPostgres(queryRunner)) {
    await queryRunner.query(`CREATE TRIGGER "${table}_no_update" BEFORE UPDATE ON "${table}" BEGIN SELECT RAISE(ABORT, '${message}'); END`);
    await queryRunner.query(`CREATE TRIGGER "${table}_no_delete" BEFORE DELETE ON "${table}" BEGIN SELECT RAISE(ABORT, '${message}'); END`);
    return;
  }
  await queryRunner.query(
    `CREATE OR REPLACE FUNCTION "scorecourt_kept_as_written"() RETURNS trigger LANGUAGE plpgsql AS $$ ` +
      `BEGIN RAISE EXCEPTION '%', TG_ARGV[0] USING ERRCODE = 'restrict_violation'; END $$`,
  );
  for (const [suffix, event, level] of [
    ['no_update', 'UPDATE', 'ROW'],
    ['no_delete', 'DELETE', 'ROW'],
    ['no_truncate', 'TRUNCATE', 'STATEMENT'],
  ] as const) {
    await queryRunner.query(
      `CREATE TRIGGER "${table}_${suffix}" BEFORE ${event} ON "${table}" FOR EACH ${level} EXECUTE FUNCTION "scorecourt_kept_as_written"('${message}')`,
    );
  }
}

/** Removes what `appendOnly` added to `table`. */
export async function dropAppendOnly(queryRunner: QueryRunner, table: string): Promise<void> {
  if (!onPostgres(queryRunner)) {
    await queryRunner.query(`DROP TRIGGER "${table}_no_delete"`);
    await queryRunner.query(`DROP TRIGGER "${table}_no_update"`);
    return;
  }
  for (const suffix of ['no_truncate', 'no_delete', 'no_update']) await queryRunner.query(`DROP TRIGGER "${table}_${suffix}" ON "${table}"`);
}
