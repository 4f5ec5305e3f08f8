import { setPriority } from 'node:os';
import { parentPort, workerData } from 'node:worker_threads';
import Database from 'better-sqlite3';
import type { AnalysisSettings, ColumnMapping } from '@shared/report';
import type { RunInput } from '../db/entities/analysis-run';
import { decodeHoldout } from '../holdouts/columns';
import { HoldoutInputError } from '../reader/errors';
import { argsortAscending, safety } from '../stats/order';
import { preparePolicyData, type PreparedHoldout } from '../stats/policy-data';
import { buildReport } from '../stats/report';
import { StatisticError } from '../stats/statistic-error';
import { type AnalysisJob, headlineOf, type WorkerMessage } from './messages';

/**
 * One analysis run on its own thread (started by jobs/runner.ts through startWorker()). It opens
 * the database read-only (WAL lets it read while the main thread writes), loads the run's stored
 * columns, builds the report with the engine, and posts progress and the result back. It never
 * writes: the main thread stores the report, the state change and the audit event together.
 */

const job = workerData as AnalysisJob;

// Below the thread that answers requests: on Linux the nice value is per thread, and the
// bootstrap's threads, started from this one, inherit it. So a long analysis never makes the
// server slow to answer, even when the cores are busy. (Elsewhere this is best effort.)
try {
  setPriority(10);
} catch {
  // not permitted here: run at the normal priority
}
const port = parentPort!;
const post = (message: WorkerMessage, transfer: ArrayBuffer[] = []) => port.postMessage(message, transfer);

function readRun(): { mapping: ColumnMapping; settings: AnalysisSettings; input: RunInput; columns: Map<string, Uint8Array> } {
  const db = new Database(job.databasePath, { readonly: true, fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    const run = db.prepare('SELECT "mapping", "settings", "input" FROM "analysis_runs" WHERE "id" = ?').get(job.runId) as
      | { mapping: string; settings: string; input: string }
      | undefined;
    if (!run) throw new Error(`analysis run ${job.runId} is not in the database`);
    const rows = db.prepare('SELECT "name", "data" FROM "run_columns" WHERE "runId" = ?').all(job.runId) as { name: string; data: Buffer }[];
    return {
      mapping: JSON.parse(run.mapping) as ColumnMapping,
      settings: JSON.parse(run.settings) as AnalysisSettings,
      input: JSON.parse(run.input) as RunInput,
      columns: new Map(rows.map((row) => [row.name, row.data])),
    };
  } finally {
    db.close();
  }
}

async function main(): Promise<void> {
  post({ type: 'progress', fraction: 0, stage: 'Loading the holdout' });
  const { mapping, settings, input, columns } = readRun();
  const holdout = decodeHoldout(input, mapping, columns);

  let lastPost = 0;
  const report = await buildReport({
    holdout,
    input: { fileName: input.fileName, sha256: input.sha256, bytes: input.bytes },
    mapping,
    settings,
    policy: job.policy,
    read: input.read,
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
  const { prepared, buffers } = transferable(preparePolicyData(holdout, { bands: settings.bands, orders }));
  post(
    {
      type: 'done',
      report: JSON.stringify(report),
      engineVersion: report.engineVersion,
      headline: headlineOf(report),
      verdict: report.verdict,
      prepared,
      swapMatrix: report.swapMatrix,
    },
    buffers,
  );
}

/**
 * The prepared data with every typed array on a buffer of its own (arrays that are views over the
 * database's buffers are copied; an array used twice stays one array), and those buffers, to
 * transfer instead of copying them on the main thread.
 */
function transferable(data: PreparedHoldout): { prepared: PreparedHoldout; buffers: ArrayBuffer[] } {
  const seen = new Map<ArrayBufferView, ArrayBufferView>();
  const own = <T extends Uint8Array | Uint32Array | Float64Array>(array: T): T => {
    const known = seen.get(array);
    if (known) return known as T;
    const whole = array.byteOffset === 0 && array.byteLength === array.buffer.byteLength && array.buffer instanceof ArrayBuffer;
    const result = (whole && !Buffer.isBuffer(array) ? array : array.slice()) as T;
    seen.set(array, result);
    return result;
  };
  const model = (m: PreparedHoldout['champion']): PreparedHoldout['champion'] => ({
    ...m,
    raw: own(m.raw),
    safety: own(m.safety),
    order: own(m.order),
    sorted: own(m.sorted),
    badsBefore: own(m.badsBefore),
    blockEnds: own(m.blockEnds),
    band: own(m.band),
    bandEnds: own(m.bandEnds),
  });
  // The raw scores and the outcome are views over the bytes the database returned: always copy them.
  for (const array of [data.bad, data.exposure, data.champion.raw, data.challenger.raw]) {
    if (array) seen.set(array, array.slice());
  }
  const prepared: PreparedHoldout = {
    ...data,
    bad: own(data.bad),
    exposure: data.exposure ? own(data.exposure) : null,
    champion: model(data.champion),
    challenger: model(data.challenger),
  };
  const buffers = new Set<ArrayBuffer>();
  for (const array of seen.values()) buffers.add(array.buffer as ArrayBuffer);
  return { prepared, buffers: [...buffers] };
}

main().catch((error: unknown) => {
  const permanent = error instanceof StatisticError || error instanceof HoldoutInputError;
  const message = error instanceof Error ? error.message : String(error);
  post({ type: 'failed', message, permanent });
});
