import { parentPort, workerData } from 'node:worker_threads';
import { decodeHoldout, decodeReference } from '../holdouts/columns';
import { HoldoutInputError } from '../reader/errors';
import { argsortAscending, safety } from '../stats/order';
import { preparePolicyData } from '../stats/policy-data';
import { buildReport } from '../stats/report';
import { StatisticError } from '../stats/statistic-error';
import { type AnalysisJob, choiceRecordOf, headlineOf, type WorkerMessage } from './messages';
import { lowerPriority, readRun, transferable } from './worker-support';

/**
 * One analysis run on its own thread (started by jobs/runner.ts through startWorker()). It opens
 * the database read-only (db/reader-connection.ts: SQLite's WAL lets it read while the main thread writes), loads the run's stored
 * columns, builds the report with the engine, and posts progress and the result back. It never
 * writes: the main thread stores the report, the state change and the audit event together.
 */

const job = workerData as AnalysisJob;

lowerPriority();
const port = parentPort!;
const post = (message: WorkerMessage, transfer: ArrayBuffer[] = []) => port.postMessage(message, transfer);

async function main(): Promise<void> {
  post({ type: 'progress', fraction: 0, stage: 'Loading the holdout' });
  const { mapping, settings, input, columns } = await readRun(job.databasePath, job.runId);
  const holdout = decodeHoldout(input, mapping, columns);

  let lastPost = 0;
  const report = await buildReport({
    holdout,
    input: { fileName: input.fileName, sha256: input.sha256, bytes: input.bytes, ...(input.sheet === undefined ? {} : { sheet: input.sheet }) },
    mapping,
    settings,
    policy: job.policy,
    read: input.read,
    reference: (() => {
      const scores = decodeReference(input, columns);
      return scores && input.reference ? { fileName: input.reference.fileName, sha256: input.reference.sha256, ...scores } : null;
    })(),
    onProgress: ({ fraction, stage }) => {
      const now = Date.now();
      if (now - lastPost < 100 && fraction < 1) return;
      lastPost = now;
      post({ type: 'progress', fraction: Math.min(0.99, fraction), stage });
    },
  });

  // The same orders the engine uses (safety ascending, ties in account order), and the data
  // prepared from them, handed to the main thread for swap sets on demand.
  const orders = {
    champion: argsortAscending(safety(holdout.champion, holdout.higherIs.champion)),
    challenger: argsortAscending(safety(holdout.challenger, holdout.higherIs.challenger)),
  };
  const { prepared, buffers } = transferable(preparePolicyData(holdout, { bands: settings.bands, orders, inference: settings.rejectInference }));
  post(
    {
      type: 'done',
      report: JSON.stringify(report),
      engineVersion: report.engineVersion,
      headline: headlineOf(report),
      verdict: report.verdict,
      choice: choiceRecordOf(report),
      prepared,
      swapMatrix: report.swapMatrix,
    },
    buffers,
  );
}

main().catch((error: unknown) => {
  const permanent = error instanceof StatisticError || error instanceof HoldoutInputError;
  const message = error instanceof Error ? error.message : String(error);
  post({ type: 'failed', message, permanent });
});
