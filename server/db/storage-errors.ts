/**
 * SQLite's answers that mean "the storage under the database failed", not "this request was
 * wrong": the disk (or the file-size limit) is full, the file cannot be read or written, the
 * database is read-only or damaged. A request that meets one of them is refused with 507 (storage
 * full) or 503 (storage unavailable), never acknowledged, and /api/health reports the database
 * unwritable until a write succeeds again (db/write-health.ts). errors.ts turns them into the API's
 * error shape.
 */

export type StorageFailureKind = 'full' | 'unavailable';

/** The SQLite error code (e.g. `SQLITE_FULL`, `SQLITE_IOERR_WRITE`) of an error, through TypeORM's QueryFailedError; null if none. */
export function sqliteCode(error: unknown): string | null {
  for (let e: unknown = error, depth = 0; e && typeof e === 'object' && depth < 4; depth++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && code.startsWith('SQLITE_')) return code;
    e = (e as { driverError?: unknown }).driverError ?? (e as { cause?: unknown }).cause;
  }
  return null;
}

/** A Node file-system error code meaning the disk is full or failing (ENOSPC, EDQUOT, EFBIG, EIO, EROFS); null otherwise. */
export function fileSystemFailure(error: unknown): StorageFailureKind | null {
  const code = typeof error === 'object' && error !== null ? (error as { code?: unknown }).code : undefined;
  if (code === 'ENOSPC' || code === 'EDQUOT' || code === 'EFBIG') return 'full';
  if (code === 'EIO' || code === 'EROFS') return 'unavailable';
  return null;
}

/**
 * PostgreSQL's SQLSTATE for the same failures: 53100 disk full, 53200 out of memory, 53300 too
 * many connections, 58030 I/O error, 57P03 cannot connect now (starting or stopping), 25006 a
 * read-only transaction (a standby). Null for any other error.
 */
export function postgresStorageFailure(error: unknown): StorageFailureKind | null {
  for (let e: unknown = error, depth = 0; e && typeof e === 'object' && depth < 4; depth++) {
    const code = (e as { code?: unknown }).code;
    const isPg = typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code) && typeof (e as { severity?: unknown }).severity === 'string';
    if (isPg) {
      if (code === '53100') return 'full';
      if (['53200', '53300', '58030', '57P03', '25006'].includes(code)) return 'unavailable';
      return null;
    }
    e = (e as { driverError?: unknown }).driverError ?? (e as { cause?: unknown }).cause;
  }
  return null;
}

export function storageFailureKind(error: unknown): StorageFailureKind | null {
  const postgres = postgresStorageFailure(error);
  if (postgres !== null) return postgres;
  const code = sqliteCode(error);
  if (code !== null) {
    if (code === 'SQLITE_FULL') return 'full';
    if (/^SQLITE_(IOERR|READONLY|CANTOPEN|CORRUPT|NOTADB|NOMEM|PROTOCOL)/.test(code)) return 'unavailable';
    return null;
  }
  return fileSystemFailure(error);
}
