import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '@server/db/data-source';
import type * as Transaction from '@server/db/transaction';
import { createTestDatabase, type TestDatabase } from '../../setup/test-database';

/**
 * The write lock belongs to the data source (db/transaction.ts), not to a copy of the module: two
 * copies of transaction.ts (as two bundled entry points, or a test and a tool loading the sources,
 * would have) still take turns on one data source, and a unit running under one copy is seen as
 * already holding the lock by the other (a nested write joins it instead of waiting for itself).
 */

type TransactionModule = typeof Transaction;
let directory: string;
let database: TestDatabase;
let dataSource: DataSource;
let first: TransactionModule;
let second: TransactionModule;

beforeAll(async () => {
  directory = mkdtempSync(join(tmpdir(), 'scorecourt-write-lock-'));
  database = await createTestDatabase(directory, 'lock.sqlite');
  dataSource = await openDatabase(database.address);
  first = await import('@server/db/transaction');
  vi.resetModules();
  second = await import('@server/db/transaction');
});
afterAll(async () => {
  await dataSource?.destroy();
  await database?.drop();
  rmSync(directory, { recursive: true, force: true });
});

describe('the write lock of a data source', () => {
  it('is one lock for two copies of the module', async () => {
    expect(second).not.toBe(first);
    const events: string[] = [];
    const unit = (copy: TransactionModule, name: string) =>
      copy.withWriteLock(dataSource, async () => {
        events.push(`${name} in`);
        await new Promise((resolve) => setTimeout(resolve, 30));
        events.push(`${name} out`);
      });
    await Promise.all([unit(first, 'a'), unit(second, 'b'), unit(first, 'c'), unit(second, 'd')]);
    // Never two units at once: each leaves before the next enters.
    expect(events).toEqual(['a in', 'a out', 'b in', 'b out', 'c in', 'c out', 'd in', 'd out']);
  });

  it('lets a unit under one copy write through the other inside the same transaction', async () => {
    const joined = await first.inTransaction(dataSource, async (manager) => {
      await manager.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('write-lock-outer', '1')`);
      // Through the other copy: the open transaction itself (on PostgreSQL a transaction of its
      // own would wait for the advisory lock this one holds, for ever).
      return second.inTransaction(dataSource, async (inner) => {
        await inner.query(`INSERT INTO "app_settings" ("key", "value") VALUES ('write-lock-inner', '1')`);
        return inner === manager;
      });
    });
    expect(joined).toBe(true);
    const rows = (await dataSource.query(`SELECT "key" FROM "app_settings" WHERE "key" LIKE 'write-lock-%' ORDER BY "key"`)) as { key: string }[];
    expect(rows.map((row) => row.key)).toEqual(['write-lock-inner', 'write-lock-outer']);
  });
});
