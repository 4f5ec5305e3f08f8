import { mkdirSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';

/**
 * Where multer streams uploads before they are read and stored: `uploads/` beside the database
 * file (one server per database, so the folder is this server's alone), or the system's temporary
 * folder for a database in memory. Each file gets a random name and is removed once its request
 * is answered; `clearUploadDir` at start-up removes what a killed process left behind.
 */
export function uploadDirFor(databasePath: string): string {
  if (databasePath === ':memory:' || databasePath === '') return join(tmpdir(), `scorecourt-uploads-${process.pid}`);
  return join(dirname(resolve(databasePath)), 'uploads');
}

/**
 * Creates the folder, or empties it of files a previous process left (call before serving). With
 * `olderThanMs`, only files untouched for that long: a folder several instances share (UPLOAD_DIR
 * with PostgreSQL) holds the others' uploads in progress, so any instance removes what a killed
 * one left once it is clearly abandoned, and nothing newer. `keep`: names left alone (files still
 * recorded as staged, which holdouts/staged-uploads.ts stores or removes).
 */
export function clearUploadDir(dir: string, options: { olderThanMs?: number; keep?: ReadonlySet<string> } = {}): number {
  mkdirSync(dir, { recursive: true });
  let removed = 0;
  const before = options.olderThanMs === undefined ? Infinity : Date.now() - options.olderThanMs;
  for (const name of readdirSync(dir)) {
    if (options.keep?.has(name)) continue; // staged: another instance stores it (staged-uploads.ts)
    const path = join(dir, name);
    try {
      if (statSync(path).mtimeMs >= before) continue;
    } catch {
      continue; // removed meanwhile by another instance
    }
    rmSync(path, { force: true, recursive: true });
    removed += 1;
  }
  return removed;
}

/** A staged upload not written to for this long is abandoned (its request has long ended). */
export const abandonedUploadMs = 6 * 60 * 60_000;
