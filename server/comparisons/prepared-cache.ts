import type { AnalysisSettings, SwapMatrix } from '@shared/report';
import type { DataSource, EntityManager } from 'typeorm';
import type { AnalysisRun, RunInput } from '../db/entities/index';
import { decodeIds } from '../holdouts/columns';
import type { PrepareJob, PrepareMessage } from '../jobs/prepare-worker';
import { startWorker } from '../runtime';
import type { PreparedHoldout } from '../stats/policy-data';
import { prepareStored } from './prepare-stored';
import { rawQuery } from '../db/driver';

/**
 * A done run's data prepared for swap sets on demand and swap exports (`preparePolicyData`:
 * per model the accounts riskiest first, sorted scores, cumulative bads, blocks and bands), kept
 * in memory per run, least recently used out first, bounded by the bytes held in units of 70
 * (a two-model account, about): `heldAccounts` counts what an entry's arrays really take, every
 * challenger included, so the bound holds with five challengers.
 * A done run never changes, so an entry never goes stale.
 *
 * Filled two ways, never with work on the request thread: when a run finishes, the analysis
 * worker hands over the data it prepared (transferred, not copied); after a restart or an
 * eviction, the first request has a short-lived worker (jobs/prepare-worker.ts) load the stored
 * columns and prepare them with the stored sort orders (no sort; about 0.3 s at 1,000,000
 * accounts). Concurrent requests for the same run share one load. (A database in memory, which
 * workers cannot open, is prepared on this thread.)
 * Account ids are only read for the swap export, and then kept with the entry.
 */

export interface PreparedRun {
  runId: number;
  input: RunInput;
  settings: AnalysisSettings;
  data: PreparedHoldout;
  /** The swap matrix does not depend on the cut-offs: computed once. */
  matrix: SwapMatrix;
  ids?: string[] | null;
}

type RunForCache = Pick<AnalysisRun, 'id' | 'input' | 'settings' | 'mapping'>;

/** Prepares a run that is not in the cache. */
export type PrepareRun = (source: DataSource | EntityManager, run: RunForCache) => Promise<{ data: PreparedHoldout; matrix: SwapMatrix }>;

/** The unit of the cache's bound: a two-model account is about 70 bytes (the default bound of 5,000,000 ≈ 350 MB). */
export const BYTES_PER_ACCOUNT = 70;

/** Bytes of every typed array a prepared holdout holds (an array reached twice counted once). O(arrays). */
export function preparedBytes(data: PreparedHoldout): number {
  const seen = new Set<ArrayBufferView>();
  const walk = (value: unknown): void => {
    if (value === null || typeof value !== 'object') return;
    if (ArrayBuffer.isView(value)) {
      seen.add(value);
      return;
    }
    for (const child of Array.isArray(value) ? value : Object.values(value)) walk(child);
  };
  walk(data);
  let bytes = 0;
  for (const view of seen) bytes += view.byteLength;
  return bytes;
}

/**
 * An entry's size in the unit of the bound: its bytes / 70, rounded up (whole, so sums stay
 * exact). Measured per account with points scores (8 more per model scored riskier-higher): two models 51 bytes (83 with weights, 124 with weights,
 * applicants without an outcome and an inference), each further challenger 25 (37, 53) more —
 * so a run with five challengers counts about three times its rows, and the bound holds in bytes.
 */
export function heldAccounts(entry: { data: PreparedHoldout }): number {
  return Math.ceil(preparedBytes(entry.data) / BYTES_PER_ACCOUNT);
}

export class PreparedCache {
  private readonly entries = new Map<number, PreparedRun>();
  private readonly loading = new Map<number, Promise<PreparedRun>>();
  private accounts = 0;
  /** Each entry's heldAccounts, computed once when put. */
  private readonly sizes = new Map<number, number>();

  /**
   * @param maxAccounts the bound, in units of 70 bytes held (heldAccounts) across all entries; the newest entry stays even when it alone is larger.
   * @param prepare how a run missing from the cache is prepared (default: on this thread).
   */
  constructor(
    private readonly maxAccounts: number,
    private readonly prepare: PrepareRun = prepareHere,
  ) {}

  async get(source: DataSource | EntityManager, run: RunForCache): Promise<PreparedRun> {
    const hit = this.entries.get(run.id);
    if (hit) {
      this.entries.delete(run.id);
      this.entries.set(run.id, hit);
      return hit;
    }
    let pending = this.loading.get(run.id);
    if (!pending) {
      pending = this.prepare(source, run).then(
        ({ data, matrix }) => {
          const entry: PreparedRun = { runId: run.id, input: run.input, settings: run.settings, data, matrix };
          this.loading.delete(run.id);
          this.put(entry);
          return entry;
        },
        (error: unknown) => {
          this.loading.delete(run.id);
          throw error;
        },
      );
      this.loading.set(run.id, pending);
    }
    return pending;
  }

  /** Adds data prepared elsewhere (the analysis worker's). */
  put(entry: PreparedRun): void {
    const old = this.entries.get(entry.runId);
    if (old) {
      this.entries.delete(entry.runId);
      this.accounts -= this.sizes.get(entry.runId)!;
    }
    const size = heldAccounts(entry);
    this.entries.set(entry.runId, entry);
    this.sizes.set(entry.runId, size);
    this.accounts += size;
    for (const runId of this.entries.keys()) {
      if (this.accounts <= this.maxAccounts || runId === entry.runId) break;
      this.entries.delete(runId);
      this.accounts -= this.sizes.get(runId)!;
      this.sizes.delete(runId);
    }
  }

  /** What the entries hold now, in units of 70 bytes (heldAccounts). */
  get heldAccounts(): number {
    return this.accounts;
  }

  /** Runs held now, least recently used first. */
  get runIds(): number[] {
    return [...this.entries.keys()];
  }

  /** The account ids of a cached run (read from the database once), or null when none are mapped. */
  async ids(source: DataSource | EntityManager, entry: PreparedRun): Promise<string[] | null> {
    if (entry.ids !== undefined) return entry.ids;
    if (!entry.input.hasIds) return (entry.ids = null);
    const rows = await rawQuery<{ data: Buffer }>(source, `SELECT "data" FROM "run_columns" WHERE "runId" = ? AND "name" = 'ids'`, [entry.runId]);
    if (rows.length !== 1) throw new Error(`analysis run ${entry.runId}: stored column ids is missing`);
    entry.ids = decodeIds(rows[0].data, entry.input.n);
    return entry.ids;
  }
}

/** Prepares a run on this thread (tests; a database in memory). */
export const prepareHere: PrepareRun = async (source, run) => {
  const rows = await rawQuery<{ name: string; data: Buffer }>(source, `SELECT "name", "data" FROM "run_columns" WHERE "runId" = ? AND "name" <> 'ids'`, [run.id]);
  return prepareStored(run.input, run.mapping, run.settings, new Map<string, Uint8Array>(rows.map((row) => [row.name, row.data])));
};

/** Prepares a run on a worker thread that reads the database itself (file or PostgreSQL URL). */
export function prepareOnWorker(databasePath: string): PrepareRun {
  return (_source, run) =>
    new Promise((resolve, reject) => {
      const worker = startWorker('server/jobs/prepare-worker', { workerData: { databasePath, runId: run.id } satisfies PrepareJob });
      let settled = false;
      worker.once('message', (message: PrepareMessage) => {
        settled = true;
        if ('error' in message) reject(new Error(`preparing run ${run.id} for swap sets: ${message.error}`));
        else resolve({ data: message.prepared, matrix: message.matrix });
        void worker.terminate();
      });
      worker.once('error', (error) => {
        settled = true;
        reject(error);
      });
      worker.once('exit', (code) => {
        if (!settled) reject(new Error(`preparing run ${run.id} for swap sets: the worker stopped (exit code ${code})`));
      });
    });
}

/** 5,000,000 units of 70 bytes ≈ 350 MB: the largest holdout the design expects, or several smaller ones (a 1,000,000-row run with five challengers counts about 2.2 to 4.8 million, by its weights and outcomes). */
export const defaultMaxAccounts = 5_000_000;

/**
 * A cache for the runs of one database, made where the app is wired (server/index.ts, the tests'
 * app) and owned by its context (`ctx.preparedCache`) and the queue's handlers, never a module's.
 */
export function createPreparedCache(dataSource: DataSource, maxAccounts = defaultMaxAccounts): PreparedCache {
  const options = dataSource.options as { database?: unknown; url?: unknown };
  // A worker thread opens the database itself: the SQLite file, or the PostgreSQL URL.
  const address = options.url ?? options.database;
  const reachable = typeof address === 'string' && address !== '' && address !== ':memory:';
  return new PreparedCache(maxAccounts, reachable ? prepareOnWorker(address) : prepareHere);
}
