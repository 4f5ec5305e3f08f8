import { setPriority } from 'node:os';
import type { AnalysisSettings, ColumnMapping } from '@shared/report';
import type { RunInput } from '../db/entities/analysis-run';
import { openReader } from '../db/reader-connection';
import type { PreparedHoldout } from '../stats/policy-data';

/** What the analysis and preparation workers share: reading a run, thread priority, handing data back. */

/**
 * Set to true by esbuild in the unit and API suite's build only (tests/setup/compile-once.ts,
 * scripts/server-bundle.mjs `keepThreadPriority`).
 */
declare const __SCORECOURT_KEEP_THREAD_PRIORITY__: boolean | undefined;

/**
 * Puts the calling worker thread below the thread that answers requests. On Linux the nice value
 * is per thread, and threads started from this one (the bootstrap's) inherit it, so a long
 * analysis never makes the server slow to answer even when every core is busy. Best effort
 * elsewhere.
 */
export function lowerPriority(nice = 10): void {
  // In the test suite's build the threads keep the test runner's priority: there the runner is
  // what waits for them, and beside other CPU-bound processes a thread at nice 10 gets about a
  // tenth of their share of a core (a 1-second analysis took tens of seconds beside two busy loops).
  if (typeof __SCORECOURT_KEEP_THREAD_PRIORITY__ === 'boolean' && __SCORECOURT_KEEP_THREAD_PRIORITY__) return;
  try {
    setPriority(nice);
  } catch {
    // not permitted here: the thread keeps the normal priority
  }
}

export interface StoredRun {
  mapping: ColumnMapping;
  settings: AnalysisSettings;
  input: RunInput;
  columns: Map<string, Uint8Array>;
}

/** A run and its stored columns, through a read-only connection of its own (the main thread may write meanwhile). */
export async function readRun(databaseAddress: string, runId: number, options: { ids?: boolean } = {}): Promise<StoredRun> {
  const db = await openReader(databaseAddress);
  try {
    const [run] = await db.all<{ mapping: string; settings: string; input: string }>('SELECT "mapping", "settings", "input" FROM "analysis_runs" WHERE "id" = ?', [runId]);
    if (!run) throw new Error(`analysis run ${runId} is not in the database`);
    const sql = options.ids === false ? `SELECT "name", "data" FROM "run_columns" WHERE "runId" = ? AND "name" <> 'ids'` : 'SELECT "name", "data" FROM "run_columns" WHERE "runId" = ?';
    const rows = await db.all<{ name: string; data: Buffer }>(sql, [runId]);
    return {
      mapping: JSON.parse(run.mapping) as ColumnMapping,
      settings: JSON.parse(run.settings) as AnalysisSettings,
      input: JSON.parse(run.input) as RunInput,
      columns: new Map(rows.map((row) => [row.name, row.data])),
    };
  } finally {
    await db.close();
  }
}

/**
 * The prepared data with every typed array on a buffer of its own, and those buffers, to transfer
 * to the main thread instead of copying them there. Arrays that are views over the database's
 * bytes (the scores, outcome and exposure) are copied first; an array used twice (a higher = safer
 * model's scores are also its safety scores) stays one array.
 */
export function transferable(data: PreparedHoldout): { prepared: PreparedHoldout; buffers: ArrayBuffer[] } {
  const seen = new Map<ArrayBufferView, ArrayBufferView>();
  for (const array of [data.bad, data.exposure, data.weight, data.known, data.champion.raw, data.challenger.raw]) {
    if (array) seen.set(array, array.slice());
  }
  const own = <T extends Uint8Array | Uint32Array | Float64Array>(array: T): T => {
    const known = seen.get(array);
    if (known) return known as T;
    const whole = array.byteOffset === 0 && array.byteLength === array.buffer.byteLength && array.buffer instanceof ArrayBuffer;
    const result = (whole ? array : array.slice()) as T;
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
    accountsBefore: m.accountsBefore ? own(m.accountsBefore) : null,
    knownBefore: m.knownBefore ? own(m.knownBefore) : null,
    blockEnds: own(m.blockEnds),
    band: own(m.band),
    bandEnds: own(m.bandEnds),
  });
  const prepared: PreparedHoldout = {
    ...data,
    bad: own(data.bad),
    exposure: data.exposure ? own(data.exposure) : null,
    weight: data.weight ? own(data.weight) : null,
    known: data.known ? own(data.known) : null,
    inferred: data.inferred ? { ...data.inferred, probability: own(data.inferred.probability) } : null,
    segments: data.segments.map((segment) => ({ ...segment, codes: own(segment.codes) })),
    champion: model(data.champion),
    challenger: model(data.challenger),
    ...(data.moreChallengers ? { moreChallengers: data.moreChallengers.map((extra) => ({ model: model(extra.model), inferredBadsBefore: extra.inferredBadsBefore })) } : {}),
  };
  const buffers = new Set<ArrayBuffer>();
  for (const array of seen.values()) buffers.add(array.buffer as ArrayBuffer);
  return { prepared, buffers: [...buffers] };
}
