import type { ValidationReport } from '@shared/comparisons';
import type { ColumnMapping } from '@shared/report';
import type { RunInput } from '../db/entities/analysis-run';
import { openReader } from '../db/reader-connection';
import { HoldoutInputError, type HoldoutInputCode } from '../reader/errors';
import { loadHoldout, validateHoldout } from '../reader/load';
import { type HoldoutScan, scanHoldout } from '../reader/scan';
import { startWorker } from '../runtime';
import { StatisticError } from '../stats/statistic-error';
import { loadReference } from '../reader/load-reference';
import { encodeHoldout, encodeReference, type EncodedColumn } from './columns';

/**
 * The reader's work for the API — scanning an upload, applying a mapping to a stored holdout,
 * the validation report — done on a worker thread (jobs/reader-worker.ts), never on the thread
 * that answers requests: reading a 1,000,000-row file is a second or more of parsing. The worker
 * reads an upload from its temporary file and a stored holdout from the database (read-only, its
 * own connection); the mapped columns come back as transferred buffers. Data errors keep their
 * row and column (HoldoutInputError, StatisticError) across the thread boundary.
 */

export type ReaderTask =
  | { task: 'scan'; path: string; fileName: string; sheet: string | null }
  | { task: 'map'; databasePath: string; holdoutId: number; mapping: ColumnMapping; dropMissing: boolean }
  | { task: 'validate'; databasePath: string; holdoutId: number; mapping: ColumnMapping; dropMissing: boolean }
  | { task: 'reference'; databasePath: string; holdoutId: number; mapping: ColumnMapping; dropMissing: boolean };

export interface MappedHoldout {
  input: RunInput;
  columns: EncodedColumn[];
}

/** A reference sample's scores, ready to store with a run. */
export interface MappedReference {
  reference: NonNullable<RunInput['reference']>;
  columns: EncodedColumn[];
}

type TaskValue<T extends ReaderTask> = T extends { task: 'scan' }
  ? HoldoutScan
  : T extends { task: 'map' }
    ? MappedHoldout
    : T extends { task: 'reference' }
      ? MappedReference
      : ValidationReport;

export type ReaderReply =
  | { ok: true; value: unknown }
  | { ok: false; kind: 'input'; code: HoldoutInputCode; message: string; row: number | null; column: string | null }
  | { ok: false; kind: 'statistic'; code: string; message: string }
  | { ok: false; kind: 'other'; message: string };

/** A stored holdout's file, reassembled from its chunks, through a read-only connection of its own. */
export async function storedFile(databaseAddress: string, holdoutId: number): Promise<{ bytes: Buffer; fileName: string; sha256: string; sheet: string | null }> {
  const db = await openReader(databaseAddress);
  try {
    const [holdout] = await db.all<{ fileName: string; sha256: string; bytes: number; chunkCount: number; sheet: string | null }>(
      'SELECT "fileName", "sha256", "bytes", "chunkCount", "sheet" FROM "holdouts" WHERE "id" = ?',
      [holdoutId],
    );
    if (!holdout) throw new Error(`holdout ${holdoutId} is not in the database`);
    const out = Buffer.allocUnsafe(holdout.bytes);
    let offset = 0;
    for (let seq = 0; seq < holdout.chunkCount; seq++) {
      const [row] = await db.all<{ data: Buffer }>('SELECT "data" FROM "holdout_chunks" WHERE "holdoutId" = ? AND "seq" = ?', [holdoutId, seq]);
      if (!row || offset + row.data.length > out.length) throw new Error(`holdout ${holdoutId}: stored chunk ${seq} is missing or too long`);
      row.data.copy(out, offset);
      offset += row.data.length;
    }
    if (offset !== holdout.bytes) throw new Error(`holdout ${holdoutId}: stored chunks hold ${offset} bytes, the file had ${holdout.bytes}`);
    return { bytes: out, fileName: holdout.fileName, sha256: holdout.sha256, sheet: holdout.sheet };
  } finally {
    await db.close();
  }
}

async function mapStored(task: Extract<ReaderTask, { task: 'map' }>): Promise<MappedHoldout> {
  const file = await storedFile(task.databasePath, task.holdoutId);
  const loaded = await loadHoldout({ bytes: file.bytes, fileName: file.fileName, sheet: file.sheet }, task.mapping, { dropMissing: task.dropMissing });
  if (loaded.input.sha256 !== file.sha256) throw new Error(`holdout ${task.holdoutId}: the stored bytes no longer match the upload's SHA-256`);
  const { read, holdout } = loaded;
  const input: RunInput = {
    fileName: loaded.input.fileName,
    ...(loaded.input.sheet === undefined ? {} : { sheet: loaded.input.sheet }),
    sha256: loaded.input.sha256,
    bytes: loaded.input.bytes,
    n: holdout.n,
    read: {
      rowsRead: read.rowsRead,
      rowsUsed: read.rowsUsed,
      rowsDroppedMissingScore: read.rowsDroppedMissingScore,
      missingByColumn: read.missingByColumn,
      badValue: read.badValue,
      goodValue: read.goodValue,
      goods: read.goods,
      bads: read.bads,
      delimiter: read.delimiter,
    },
    hasIds: holdout.ids !== null,
    hasExposure: holdout.exposure !== null,
    segments: holdout.segments.map((segment) => ({ column: segment.column, levels: segment.levels })),
  };
  const levels = (column: { column: string; levels: string[] } | null) => (column === null ? null : { column: column.column, levels: column.levels });
  if (holdout.grades) input.grades = { champion: levels(holdout.grades.champion), challenger: levels(holdout.grades.challenger) };
  if (holdout.period) input.period = levels(holdout.period);
  return { input, columns: encodeHoldout(holdout) };
}

async function referenceStored(task: Extract<ReaderTask, { task: 'reference' }>): Promise<MappedReference> {
  const file = await storedFile(task.databasePath, task.holdoutId);
  const loaded = await loadReference({ bytes: file.bytes, fileName: file.fileName, sheet: file.sheet }, task.mapping, { dropMissing: task.dropMissing });
  return {
    reference: { holdoutId: task.holdoutId, fileName: loaded.fileName, sha256: loaded.sha256, rows: loaded.champion.length },
    columns: encodeReference(loaded),
  };
}

/** Does the task on this thread (what the worker runs). */
export async function performReaderTask(task: ReaderTask): Promise<unknown> {
  if (task.task === 'scan') return scanHoldout({ path: task.path, fileName: task.fileName, sheet: task.sheet });
  if (task.task === 'map') return mapStored(task);
  if (task.task === 'reference') return referenceStored(task);
  const file = await storedFile(task.databasePath, task.holdoutId);
  const result = await validateHoldout({ bytes: file.bytes, fileName: file.fileName, sheet: file.sheet }, task.mapping, { dropMissing: task.dropMissing, maxErrors: 50 });
  return { ok: result.ok, errors: result.errors, summary: result.summary } satisfies ValidationReport;
}

/** The task's outcome as a message (errors with their row and column). */
export function replyOf(error: unknown): ReaderReply {
  if (error instanceof HoldoutInputError) return { ok: false, kind: 'input', code: error.code, message: error.message, row: error.row, column: error.column };
  if (error instanceof StatisticError) return { ok: false, kind: 'statistic', code: error.code, message: error.message };
  return { ok: false, kind: 'other', message: error instanceof Error ? error.message : String(error) };
}

/**
 * Buffers a reply can transfer: the mapped columns' own buffers, whole or nearly (the reader hands
 * over a column as a view of its first rows when at most a quarter of it is unused: that end was
 * never written, and moves for nothing, where a copy would write all of it).
 */
export function transferList(task: ReaderTask, value: unknown): ArrayBuffer[] {
  if (task.task !== 'map' && task.task !== 'reference') return [];
  const buffers = new Set<ArrayBuffer>();
  for (const { data } of (value as MappedHoldout | MappedReference).columns) {
    const own = data.byteOffset === 0 && data.byteLength >= data.buffer.byteLength - (data.buffer.byteLength >> 2);
    if (own && data.buffer instanceof ArrayBuffer && data.byteLength > 4096) buffers.add(data.buffer);
  }
  return [...buffers];
}

/** Runs the task on a worker thread; rejects with the reader's own error types. */
export function runReaderTask<T extends ReaderTask>(task: T): Promise<TaskValue<T>> {
  return new Promise((resolve, reject) => {
    const worker = startWorker('server/jobs/reader-worker', { workerData: task });
    let settled = false;
    worker.once('message', (reply: ReaderReply) => {
      settled = true;
      void worker.terminate();
      if (reply.ok) {
        const value = reply.value as TaskValue<T>;
        if (task.task === 'map' || task.task === 'reference') {
          // Structured clone turns Buffers into Uint8Arrays: views again, no copy.
          for (const column of (value as MappedHoldout | MappedReference).columns) column.data = Buffer.from(column.data.buffer, column.data.byteOffset, column.data.byteLength);
        }
        resolve(value);
      } else if (reply.kind === 'input') reject(new HoldoutInputError(reply.code, reply.message, reply.row, reply.column));
      else if (reply.kind === 'statistic') reject(new StatisticError(reply.message, reply.code));
      else reject(new Error(reply.message));
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`the reader worker stopped without an answer (exit code ${code})`));
    });
  });
}
