import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { WalCheckpointer } from '@server/db/checkpointer';
import { openDatabase } from '@server/db/data-source';
import { createLogger } from '@server/log';

describe('the WAL checkpointer', () => {
  it("turns the connection's automatic checkpoints off, checkpoints on its own thread, and turns them back on when stopped", async () => {
    const directory = mkdtempSync(join(tmpdir(), 'scorecourt-checkpoint-'));
    const path = join(directory, 'db.sqlite');
    const dataSource = await openDatabase(path);
    const checkpointer = new WalCheckpointer(dataSource, path, createLogger('silent'), 100);
    try {
      await checkpointer.start();
      expect(await dataSource.query('PRAGMA wal_autocheckpoint')).toEqual([{ wal_autocheckpoint: 0 }]);
      const before = statSync(path).size;
      await dataSource.query('CREATE TABLE filler (data blob)');
      await dataSource.query('INSERT INTO filler VALUES (?)', [Buffer.alloc(8 << 20, 1)]);
      // The write went to the WAL only; the worker copies it into the database file.
      const deadline = Date.now() + 10_000;
      while (statSync(path).size < before + (8 << 20)) {
        if (Date.now() > deadline) throw new Error('no checkpoint within 10 s');
        await new Promise((resolve) => setTimeout(resolve, 20));
      }
      await checkpointer.stop();
      expect(await dataSource.query('PRAGMA wal_autocheckpoint')).toEqual([{ wal_autocheckpoint: 1000 }]);
    } finally {
      await checkpointer.stop();
      await dataSource.destroy();
      rmSync(directory, { recursive: true, force: true });
    }
  });
});
