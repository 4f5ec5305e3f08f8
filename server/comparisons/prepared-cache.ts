import type { AnalysisSettings, SwapMatrix } from '@shared/report';
import type { DataSource, EntityManager } from 'typeorm';
import type { AnalysisRun, RunInput } from '../db/entities/index';
import { decodeHoldout, decodeIds, decodeOrders } from '../holdouts/columns';
import { preparePolicyData, type PreparedHoldout } from '../stats/policy-data';
import { swapMatrix } from '../stats/swap-matrix';

/**
 * A done run's data prepared for swap sets on demand and swap exports (`preparePolicyData`:
 * per model the accounts riskiest first, sorted scores, cumulative bads, blocks and bands), kept
 * in memory per run, least recently used out first, bounded by the accounts held (about 70 bytes
 * each). A done run never changes, so an entry never goes stale.
 *
 * Filled two ways: when a run finishes, the analysis worker hands over the data it prepared
 * (transferred, not copied: no work on this thread); after a restart or an eviction, the first
 * request loads the stored columns and prepares them here with the stored sort orders (no sort;
 * about 0.3 s at 1,000,000 rows). Concurrent requests for the same run share one load.
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

export class PreparedCache {
  private readonly entries = new Map<number, PreparedRun>();
  private readonly loading = new Map<number, Promise<PreparedRun>>();
  private accounts = 0;

  /** @param maxAccounts accounts held across all entries; the newest entry stays even when it alone is larger. */
  constructor(private readonly maxAccounts: number) {}

  async get(source: DataSource | EntityManager, run: RunForCache): Promise<PreparedRun> {
    const hit = this.entries.get(run.id);
    if (hit) {
      this.entries.delete(run.id);
      this.entries.set(run.id, hit);
      return hit;
    }
    let pending = this.loading.get(run.id);
    if (!pending) {
      pending = load(source, run).then(
        (entry) => {
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
      this.accounts -= old.input.n;
    }
    this.entries.set(entry.runId, entry);
    this.accounts += entry.input.n;
    for (const [runId, held] of this.entries) {
      if (this.accounts <= this.maxAccounts || runId === entry.runId) break;
      this.entries.delete(runId);
      this.accounts -= held.input.n;
    }
  }

  /** Runs held now, least recently used first. */
  get runIds(): number[] {
    return [...this.entries.keys()];
  }

  /** The account ids of a cached run (read from the database once), or null when none are mapped. */
  async ids(source: DataSource | EntityManager, entry: PreparedRun): Promise<string[] | null> {
    if (entry.ids !== undefined) return entry.ids;
    if (!entry.input.hasIds) return (entry.ids = null);
    const rows = (await source.query(`SELECT "data" FROM "run_columns" WHERE "runId" = ? AND "name" = 'ids'`, [entry.runId])) as { data: Buffer }[];
    if (rows.length !== 1) throw new Error(`analysis run ${entry.runId}: stored column ids is missing`);
    entry.ids = decodeIds(rows[0].data, entry.input.n);
    return entry.ids;
  }
}

export function preparedEntry(run: RunForCache, data: PreparedHoldout): PreparedRun {
  return { runId: run.id, input: run.input, settings: run.settings, data, matrix: swapMatrix(data) };
}

async function load(source: DataSource | EntityManager, run: RunForCache): Promise<PreparedRun> {
  const rows = (await source.query(`SELECT "name", "data" FROM "run_columns" WHERE "runId" = ? AND "name" <> 'ids'`, [run.id])) as {
    name: string;
    data: Buffer;
  }[];
  const stored = new Map<string, Uint8Array>(rows.map((row) => [row.name, row.data]));
  const holdout = decodeHoldout({ ...run.input, hasIds: false }, run.mapping, stored);
  const orders = decodeOrders(run.input.n, stored);
  return preparedEntry(run, preparePolicyData(holdout, { bands: run.settings.bands, orders: orders ?? undefined }));
}

/** 5,000,000 accounts ≈ 350 MB: the largest holdout the design expects, or several smaller ones. */
export const defaultMaxAccounts = 5_000_000;

const caches = new WeakMap<DataSource, PreparedCache>();

/** The cache of one database's runs (one per app). */
export function preparedCacheFor(dataSource: DataSource): PreparedCache {
  let cache = caches.get(dataSource);
  if (!cache) {
    cache = new PreparedCache(defaultMaxAccounts);
    caches.set(dataSource, cache);
  }
  return cache;
}
