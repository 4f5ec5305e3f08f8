import type { DataSource, EntityManager, QueryRunner } from 'typeorm';

/**
 * Which database the server runs on, and the few places where SQL differs between them.
 *
 * The database is named by one string, the "database address": a file path for SQLite (the
 * embedded default, DATABASE_PATH) or a `postgres://` URL (DATABASE_URL). Worker threads and
 * processes are handed the same string and open their own connection to it.
 *
 * Raw SQL in the server is written once with `?` placeholders and double-quoted identifiers;
 * `rawQuery` numbers the placeholders (`$1`, `$2`, …) for PostgreSQL. Anything else that differs
 * (a JSON field, a case-insensitive match, the larger of two numbers) is chosen with `isPostgres`.
 */

export type DatabaseKind = 'sqlite' | 'postgres';

/** True for a `postgres://` or `postgresql://` URL. */
export function isPostgresAddress(address: string): boolean {
  return /^postgres(ql)?:\/\//i.test(address);
}

type Source = DataSource | EntityManager | QueryRunner;

function dataSourceOf(source: Source): DataSource {
  return 'connection' in source && source.connection ? source.connection : (source as DataSource);
}

export function databaseKind(source: Source): DatabaseKind {
  return dataSourceOf(source).options.type === 'postgres' ? 'postgres' : 'sqlite';
}

export function isPostgres(source: Source): boolean {
  return databaseKind(source) === 'postgres';
}

/** `?` placeholders as `$1`, `$2`, … (outside quoted strings and identifiers). */
export function numberedPlaceholders(sql: string): string {
  let out = '';
  let n = 0;
  let quote: string | null = null;
  for (const character of sql) {
    if (quote) {
      if (character === quote) quote = null;
      out += character;
    } else if (character === "'" || character === '"') {
      quote = character;
      out += character;
    } else if (character === '?') {
      n += 1;
      out += `$${n}`;
    } else {
      out += character;
    }
  }
  return out;
}

/** A raw query written with `?` placeholders, on either database. */
export function rawQuery<T>(source: DataSource | EntityManager, sql: string, parameters: unknown[] = []): Promise<T[]> {
  return source.query(isPostgres(source) ? numberedPlaceholders(sql) : sql, parameters) as Promise<T[]>;
}

/** A number read by a raw query: PostgreSQL returns COUNT(*) and other bigints as strings. */
export function numberOf(value: unknown): number {
  return typeof value === 'number' ? value : Number(value);
}

/** SQL for a JSON text column's numeric field (`headline` → deltaGini). */
export function jsonNumberSql(source: Source, column: string, field: string): string {
  return isPostgres(source) ? `((${column})::json ->> '${field}')::double precision` : `json_extract(${column}, '$.${field}')`;
}

/** The case-insensitive LIKE (SQLite's LIKE already is, for ASCII letters). */
export function likeSql(source: Source): string {
  return isPostgres(source) ? 'ILIKE' : 'LIKE';
}

/** The larger of two numbers in SQL. */
export function greatestSql(source: Source, a: string, b: string): string {
  return isPostgres(source) ? `GREATEST(${a}, ${b})` : `MAX(${a}, ${b})`;
}
