import { parentPort, workerData } from 'node:worker_threads';
import type { SwapMatrix } from '@shared/report';
import { prepareStored } from '../comparisons/prepare-stored';
import type { PreparedHoldout } from '../stats/policy-data';
import { lowerPriority, readRun, transferable } from './worker-support';

/**
 * Prepares a done run's stored columns for swap sets on demand, off the request thread (started
 * by comparisons/prepared-cache.ts when its cache does not hold the run, e.g. after a restart):
 * reads the columns and sort orders read-only, prepares them (comparisons/prepare-stored.ts: the
 * stored orders, no sort), and transfers the result. About 0.3 s at 1,000,000 accounts.
 */

export interface PrepareJob {
  /** The SQLite file or PostgreSQL URL (db/reader-connection.ts). */
  databasePath: string;
  runId: number;
}
export type PrepareMessage = { prepared: PreparedHoldout; matrix: SwapMatrix } | { error: string };

const job = workerData as PrepareJob;
lowerPriority(5);

async function main(): Promise<void> {
  const run = await readRun(job.databasePath, job.runId, { ids: false });
  const { data, matrix } = prepareStored(run.input, run.mapping, run.settings, run.columns);
  const { prepared, buffers } = transferable(data);
  parentPort!.postMessage({ prepared, matrix } satisfies PrepareMessage, buffers);
}

main().catch((error: unknown) => {
  parentPort!.postMessage({ error: error instanceof Error ? error.message : String(error) } satisfies PrepareMessage);
});
