import { mkdirSync, readdirSync, rmSync } from 'node:fs';
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

/** Creates the folder, or empties it of files a previous process left (call before serving). */
export function clearUploadDir(dir: string): number {
  mkdirSync(dir, { recursive: true });
  let removed = 0;
  for (const name of readdirSync(dir)) {
    rmSync(join(dir, name), { force: true, recursive: true });
    removed += 1;
  }
  return removed;
}
