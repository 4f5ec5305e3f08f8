import type { DataSource } from 'typeorm';
import { storageFailureKind, type StorageFailureKind } from './storage-errors';

/**
 * Whether the database takes writes. A storage failure (disk full, I/O error) marks the data
 * source unwritable. Small writes may still fit where large ones fail, so an ordinary successful
 * commit does not clear the mark: /api/health clears it only once a quiet period has passed
 * without a failure and its own test write succeeds (http/health.ts).
 */

export interface WriteHealth {
  writable: boolean;
  /** The last storage failure, while unwritable; `at` is performance.now(). */
  failure: { kind: StorageFailureKind; code: string; at: number } | null;
}

const states = new WeakMap<DataSource, WriteHealth>();

function state(dataSource: DataSource): WriteHealth {
  let found = states.get(dataSource);
  if (!found) {
    found = { writable: true, failure: null };
    states.set(dataSource, found);
  }
  return found;
}

/** Records `error` if it is a storage failure; returns its kind (null: not a storage failure). */
export function noteWriteFailure(dataSource: DataSource, error: unknown): StorageFailureKind | null {
  const kind = storageFailureKind(error);
  if (kind === null) return null;
  const current = state(dataSource);
  const code = String((error as { code?: unknown }).code ?? (error as { driverError?: { code?: unknown } }).driverError?.code ?? kind);
  current.writable = false;
  // Monotonic time: the clock module's now() is for stored timestamps, this is only an age.
  current.failure = { kind, code, at: performance.now() };
  return kind;
}

/** A write went through after the quiet period (health's test write): writable again. */
export function noteWritable(dataSource: DataSource): void {
  const current = state(dataSource);
  current.writable = true;
  current.failure = null;
}

export function writeHealth(dataSource: DataSource): Readonly<WriteHealth> {
  return state(dataSource);
}
