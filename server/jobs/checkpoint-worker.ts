import { parentPort, workerData } from 'node:worker_threads';
import Database from 'better-sqlite3';
import { lowerPriority } from './worker-support';

/**
 * Copies the WAL into the database file (a passive checkpoint) every `everyMs`, on its own thread
 * and connection, so the thread that answers requests never does it (see db/checkpointer.ts).
 * Stops when told to, after a last checkpoint.
 */
const { databasePath, everyMs } = workerData as { databasePath: string; everyMs: number };
lowerPriority(5);
const db = new Database(databasePath, { fileMustExist: true });
db.pragma('busy_timeout = 5000');
const checkpoint = () => {
  try {
    db.pragma('wal_checkpoint(PASSIVE)');
  } catch (error) {
    parentPort!.postMessage({ error: error instanceof Error ? error.message : String(error) });
  }
};
const timer = setInterval(checkpoint, everyMs);
parentPort!.on('message', (message: 'stop') => {
  if (message !== 'stop') return;
  clearInterval(timer);
  checkpoint();
  db.close();
  parentPort!.close();
});
