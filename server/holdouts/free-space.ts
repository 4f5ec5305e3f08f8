import { statfsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { storageError } from '../errors';

/**
 * The free-space check before an upload is received and before it is stored: refused with 507
 * when it would not fit, rather than filling the disk under the database (which every other write
 * shares).
 *
 * An upload takes room three times at its peak: the received file in the upload folder, its chunks
 * in the WAL while the storing transaction runs, and the same pages copied into the database by
 * the checkpoint (after which the WAL's room is reused). On top of that the check keeps a reserve,
 * so that sign-ins, notes and audit events still have room once the upload is stored.
 */

/** Room kept free for everything else the server writes (sessions, notes, audit events, results). */
export const reserveBytes = 64 * 1024 * 1024;

/** Free bytes for an unprivileged writer on the file system holding `path`; null when unknown (a database in memory). */
export function freeBytes(path: string): number | null {
  if (path === ':memory:' || path === '') return null;
  try {
    const stats = statfsSync(dirname(resolve(path)));
    return stats.bavail * stats.bsize;
  } catch {
    return null;
  }
}

/**
 * Throws 507 unless `bytes` more can be written `copies` times on the database's file system with
 * the reserve left over. `copies` counts the copies still to be written (3 before receiving, 2
 * once the file is in the upload folder).
 */
export function ensureRoomFor(databasePath: string, bytes: number, copies: number): void {
  const free = freeBytes(databasePath);
  if (free === null) return;
  if (free < bytes * copies + reserveBytes) throw storageError('full');
}
