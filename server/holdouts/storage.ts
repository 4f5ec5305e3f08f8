import { closeSync, openSync, readSync } from 'node:fs';
import type { EntityManager } from 'typeorm';
import { rawQuery } from '../db/driver';

/**
 * An uploaded file's bytes in SQLite, in fixed-size chunks (holdout_chunks), written in the
 * same transaction as the holdout row: the file is stored whole or not at all, and a later
 * mapping reads it back (holdouts/reading.ts `storedFile`) with the engine's reader (a `{ bytes }` source). 4 MB chunks keep each
 * row well under SQLite's limits and a 200 MB file at 50 rows; the event loop gets a turn between
 * chunks, so other requests are answered while a large file is stored.
 */
export const CHUNK_BYTES = 4 * 1024 * 1024;

/** Copies the file at `path` into chunks of holdout `holdoutId`; call inside the holdout's transaction. */
export async function storeHoldoutFile(manager: EntityManager, holdoutId: number, path: string): Promise<{ chunks: number; bytes: number }> {
  const fd = openSync(path, 'r');
  let chunks = 0;
  let bytes = 0;
  try {
    for (;;) {
      const buffer = Buffer.allocUnsafe(CHUNK_BYTES);
      let filled = 0;
      while (filled < CHUNK_BYTES) {
        const read = readSync(fd, buffer, filled, CHUNK_BYTES - filled, null);
        if (read === 0) break;
        filled += read;
      }
      if (filled === 0) break;
      await rawQuery(manager, 'INSERT INTO "holdout_chunks" ("holdoutId", "seq", "data") VALUES (?, ?, ?)', [holdoutId, chunks, buffer.subarray(0, filled)]);
      chunks += 1;
      bytes += filled;
      if (filled < CHUNK_BYTES) break;
      // Let requests in between chunks: SQLite's calls are synchronous, and a 200 MB file is 50 of them.
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
  } finally {
    closeSync(fd);
  }
  return { chunks, bytes };
}
