import type { AnalysisSettings, SwapMatrix } from '@shared/report';
import type { DataSource, EntityManager } from 'typeorm';
import type { AnalysisRun, RunInput } from '../db/entities/index';
import { decodeHoldout, decodeOrders } from '../holdouts/columns';
import type { Holdout as EngineHoldout } from '../stats/holdout';
import { preparePolicyData, type PreparedHoldout } from '../stats/policy-data';
import { swapMatrix } from '../stats/swap-matrix';

/**
 * A done run's input, prepared for swap sets on demand and swap exports: its stored columns
 * decoded (a view over the bytes SQLite returns) and `preparePolicyData` run with the stored
 * sort orders, so nothing is sorted again. Kept in memory per run, least recently used first out,
 * bounded by the total number of accounts held (about 70 bytes each); a done run never changes,
 * so an entry never goes stale. Concurrent requests for the same run share one load.
 */

export interface PreparedRun {
  runId: number;
  input: RunInput;
  settings: AnalysisSettings;
  holdout: EngineHoldout;
  data: PreparedHoldout;
  /** The swap matrix does not depend on the cut-offs: computed once. */
  matrix: SwapMatrix;
}

export interface PreparedCacheOptions {
  /** Accounts held across all entries; the newest entry is kept even when it alone is larger. */
  maxAccounts: number;
}

export class PreparedCache {
  private readonly entries = new Map<number, PreparedRun>();
  private readonly loading = new Map<number, Promise<PreparedRun>>();
  private accounts = 0;

  constructor(private readonly options: PreparedCacheOptions) {}

  async get(source: DataSource | EntityManager, run: Pick<AnalysisRun, 'id' | 'input' | 'settings' | 'mapping'>): Promise<PreparedRun> {
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
          this.add(entry);
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

  /** Runs held now, least recently used first. */
  get runIds(): number[] {
    return [...this.entries.keys()];
  }

  private add(entry: PreparedRun): void {
    this.entries.set(entry.runId, entry);
    this.accounts += entry.input.n;
    for (const [runId, old] of this.entries) {
      if (this.accounts <= this.options.maxAccounts || runId === entry.runId) break;
      this.entries.delete(runId);
      this.accounts -= old.input.n;
    }
  }
}

async function load(source: DataSource | EntityManager, run: Pick<AnalysisRun, 'id' | 'input' | 'settings' | 'mapping'>): Promise<PreparedRun> {
  const rows = (await source.query('SELECT "name", "data" FROM "run_columns" WHERE "runId" = ?', [run.id])) as { name: string; data: Buffer }[];
  const stored = new Map<string, Uint8Array>(rows.map((row) => [row.name, row.data]));
  const holdout = decodeHoldout(run.input, run.mapping, stored);
  const orders = decodeOrders(run.input.n, stored);
  const data = preparePolicyData(holdout, { bands: run.settings.bands, orders: orders ?? undefined });
  return { runId: run.id, input: run.input, settings: run.settings, holdout, data, matrix: swapMatrix(data) };
}

/** 5,000,000 accounts ≈ 350 MB: the largest holdout the design expects, or several smaller ones. */
export const defaultMaxAccounts = 5_000_000;

const caches = new WeakMap<DataSource, PreparedCache>();

/** The cache of one database's runs (one per app). */
export function preparedCacheFor(dataSource: DataSource): PreparedCache {
  let cache = caches.get(dataSource);
  if (!cache) {
    cache = new PreparedCache({ maxAccounts: defaultMaxAccounts });
    caches.set(dataSource, cache);
  }
  return cache;
}
