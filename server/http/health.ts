import { errorCodes } from '@shared/errors';
import type { DataSource } from 'typeorm';
import type { AppContext } from '../context';
import { inTransaction } from '../db/transaction';
import { noteWritable, writeHealth } from '../db/write-health';
import { defineRoute, type RouteDefinition } from './routes';
import { rawQuery } from '../db/driver';

/**
 * Liveness and whether the database takes writes. After a storage failure (disk full, I/O error:
 * db/write-health.ts) health answers 503 `{ ok: false, database: 'unwritable', error }`. Once
 * `quietMs` have passed without a failure, health tries one small write itself (at most every 2 s):
 * if it is stored, health is ok again, so it turns healthy once space is freed even when no one
 * else writes; if not, the failure is fresh again.
 */

const quietMs = 30_000;
const probeEveryMs = 2000;
const lastProbe = new WeakMap<DataSource, number>();
let probes = 0;

async function probe(dataSource: DataSource): Promise<void> {
  const at = performance.now();
  if (at - (lastProbe.get(dataSource) ?? -Infinity) < probeEveryMs) return;
  lastProbe.set(dataSource, at);
  probes += 1;
  try {
    await inTransaction(dataSource, (manager) =>
      rawQuery(manager, `INSERT INTO "app_settings" ("key", "value") VALUES ('health_probe', ?) ON CONFLICT ("key") DO UPDATE SET "value" = excluded."value"`, [String(probes)]),
    );
    noteWritable(dataSource);
  } catch {
    // still unwritable: the guard (db/connection-guard.ts) has recorded the failure again
  }
}

export function healthRoutes(ctx: Pick<AppContext, 'dataSource'>): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/health',
      access: 'public',
      summary: "Liveness → { ok: true }; 503 { ok: false, database: 'unwritable' } after a storage failure, until a test write succeeds 30 s later",
      handler: async (_req, res) => {
        const failure = writeHealth(ctx.dataSource).failure;
        if (failure && performance.now() - failure.at >= quietMs) await probe(ctx.dataSource);
        const state = writeHealth(ctx.dataSource);
        if (state.writable) return { ok: true };
        res.status(503);
        return {
          ok: false,
          database: 'unwritable',
          error: {
            code: state.failure?.kind === 'full' ? errorCodes.storageFull : errorCodes.storageUnavailable,
            message:
              state.failure?.kind === 'full'
                ? 'The database cannot take writes: the disk is full. Free space; health turns ok once a test write succeeds again.'
                : `The database cannot take writes (${state.failure?.code ?? 'storage error'}). Health turns ok once a test write succeeds again.`,
          },
        };
      },
    }),
  ];
}
