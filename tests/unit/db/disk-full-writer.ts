/**
 * Run as a child process under a file-size limit (tests/unit/db/failed-commit.test.ts): writes
 * 20 KB rows through every write path of the server — inTransaction, withWriteLock with a plain
 * repository save (TypeORM's own transaction) — until well past the limit, then prints the
 * positions it was told were stored, the errors by code, whether the connection ended inside a
 * transaction and what /api/health would read, as one JSON line.
 */
import { openDatabase } from '@server/db/data-source';
import { rawConnection } from '@server/db/connection-guard';
import { AppSetting } from '@server/db/entities/index';
import { sqliteCode } from '@server/db/storage-errors';
import { inTransaction, withWriteLock } from '@server/db/transaction';
import { writeHealth } from '@server/db/write-health';

const dataSource = await openDatabase(process.argv[2]);
const acknowledged: number[] = [];
const errors: Record<string, number> = {};
const body = 'x'.repeat(20_000);
for (let i = 0; i < 300; i++) {
  try {
    if (i % 2 === 0) {
      await inTransaction(dataSource, async (manager) => {
        await manager.query('INSERT INTO "app_settings" ("key", "value") VALUES (?, ?)', [`row-${i}`, body]);
      });
    } else {
      await withWriteLock(dataSource, () => dataSource.getRepository(AppSetting).save({ key: `row-${i}`, value: body }));
    }
    acknowledged.push(i);
  } catch (error) {
    const code = sqliteCode(error) ?? (error as Error).name;
    errors[code] = (errors[code] ?? 0) + 1;
  }
}
const inTransactionAtEnd = rawConnection(dataSource).inTransaction;
const health = { writable: writeHealth(dataSource).writable };
await dataSource.destroy().catch(() => undefined);
process.stdout.write(JSON.stringify({ acknowledged, errors, inTransactionAtEnd, health }) + '\n');
