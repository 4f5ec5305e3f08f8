import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import type { DataSource } from 'typeorm';
import { afterEach, describe, expect, it } from 'vitest';
import { onUnrecoverable, rawConnection } from '@server/db/connection-guard';
import { openDatabase } from '@server/db/data-source';
import { AppSetting } from '@server/db/entities/index';
import { inTransaction, withWriteLock } from '@server/db/transaction';

/**
 * A COMMIT that fails (disk full, I/O error) must never be followed by an acknowledged write
 * (db/connection-guard.ts). First for real: a child process under a file-size limit (ulimit -f,
 * SIGXFSZ ignored, as a full disk) writes until its writes fail; every write it was told was
 * stored must be in the file. Before the guard, e.g. 298 of 300 writes were acknowledged and 96
 * stored. Then the guard's steps in-process, with SQLite dropping the transaction by hand.
 */

let directory = '';
afterEach(() => {
  if (directory) rmSync(directory, { recursive: true, force: true });
  directory = '';
});

describe('a failed COMMIT under a file-size limit', () => {
  it('acknowledges only what is stored, and leaves the connection out of any transaction', () => {
    directory = mkdtempSync(join(tmpdir(), 'scorecourt-disk-full-'));
    const file = join(directory, 'db.sqlite');
    const script = join(import.meta.dirname, 'disk-full-writer.ts');
    // 3 MB: room for the schema and ~100 of the 300 rows of 20 KB.
    const child = spawnSync('/bin/sh', ['-c', `trap '' XFSZ; ulimit -f 6000 && exec '${process.execPath}' --import tsx '${script}' '${file}'`], {
      encoding: 'utf8',
      timeout: 300_000,
    });
    expect(child.status, child.stderr).toBe(0);
    const result = JSON.parse(child.stdout.trim().split('\n').pop()!) as { acknowledged: number[]; errors: Record<string, number>; inTransactionAtEnd: boolean; health: { writable: boolean } };
    const db = new Database(file, { readonly: true });
    const stored = (db.prepare(`SELECT "key" FROM "app_settings" WHERE "key" LIKE 'row-%'`).all() as { key: string }[]).map((row) => Number(row.key.slice(4)));
    db.close();
    console.log(`[disk full] acknowledged ${result.acknowledged.length}, stored ${stored.length}, errors ${JSON.stringify(result.errors)}`);
    expect(Object.keys(result.errors).length, 'the limit was reached').toBeGreaterThan(0);
    expect(result.inTransactionAtEnd).toBe(false);
    // What /api/health reads: the failure was recorded.
    expect(result.health.writable).toBe(false);
    expect(stored.sort((a, b) => a - b)).toEqual(result.acknowledged);
  });
});

describe('the connection guard', () => {
  let dataSource: DataSource;
  const open = async () => {
    directory = mkdtempSync(join(tmpdir(), 'scorecourt-guard-'));
    dataSource = await openDatabase(join(directory, 'db.sqlite'));
    return dataSource;
  };
  afterEach(async () => {
    if (dataSource?.isInitialized) await dataSource.destroy();
  });
  const keys = async () => (await dataSource.getRepository(AppSetting).find()).map((row) => row.key).filter((key) => key.startsWith('k-')).sort();

  it('refuses a unit whose transaction SQLite dropped midway, and writes nothing of it on its own', async () => {
    await open();
    await expect(
      inTransaction(dataSource, async (manager) => {
        await manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-1', 'a')`);
        // As SQLite does when a statement fails with SQLITE_FULL: the statement fails and the
        // whole transaction is gone. The unit swallows the error and carries on writing.
        rawConnection(dataSource).exec('ROLLBACK');
        await manager.query(`SELECT * FROM "no_such_table"`).catch(() => undefined);
        await manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-2', 'b')`);
        await manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-3', 'c')`);
      }),
    ).rejects.toThrow();
    expect(rawConnection(dataSource).inTransaction).toBe(false);
    // Refused at COMMIT; nothing written after the failed statement was committed on its own.
    expect(await keys()).toEqual([]);
    // The next units commit normally: no transaction left open under them.
    await inTransaction(dataSource, (manager) => manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-4', 'd')`));
    await withWriteLock(dataSource, () => dataSource.getRepository(AppSetting).save({ key: 'k-5', value: 'e' }));
    expect(rawConnection(dataSource).inTransaction).toBe(false);
    await dataSource.destroy();
    dataSource = await openDatabase(join(directory, 'db.sqlite'));
    expect(await keys()).toEqual(['k-4', 'k-5']);
  });

  it('rolls back and verifies when a COMMIT fails with the transaction already dropped', async () => {
    await open();
    const runner = dataSource.createQueryRunner();
    await runner.startTransaction();
    await runner.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-1', 'a')`);
    rawConnection(dataSource).exec('ROLLBACK');
    await expect(runner.commitTransaction()).rejects.toThrow();
    await runner.rollbackTransaction();
    expect(runner.isTransactionActive).toBe(false);
    expect(rawConnection(dataSource).inTransaction).toBe(false);
    await inTransaction(dataSource, (manager) => manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('k-2', 'b')`));
    expect(rawConnection(dataSource).inTransaction).toBe(false);
    expect(await keys()).toEqual(['k-2']);
  });

  it('stops the process when the connection cannot be brought out of its transaction', async () => {
    await open();
    const stops: string[] = [];
    onUnrecoverable(dataSource, (reason) => stops.push(reason));
    const raw = rawConnection(dataSource) as { exec(sql: string): unknown };
    const exec = raw.exec.bind(raw);
    const runner = dataSource.createQueryRunner();
    await runner.startTransaction();
    // A ROLLBACK that cannot run (as on a failing disk): nothing may be acknowledged after it.
    raw.exec = (sql: string) => {
      if (sql === 'ROLLBACK') throw new Error('disk I/O error');
      return exec(sql);
    };
    const query = runner.query.bind(runner);
    (runner as unknown as { query: typeof runner.query }).query = (sql: string, ...rest: unknown[]) =>
      sql === 'ROLLBACK' ? Promise.reject(new Error('disk I/O error')) : (query as (...args: unknown[]) => Promise<unknown>)(sql, ...rest);
    await runner.rollbackTransaction();
    expect(stops).toHaveLength(1);
    raw.exec = exec;
    exec('ROLLBACK');
  });
});
