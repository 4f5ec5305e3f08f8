import type { DataSource } from 'typeorm';
import { withWriteLock } from '../db/transaction';
import { encodeOrder, orderColumn } from '../holdouts/columns';
import type { JobHandlers } from '../jobs/handlers';
import type { Mailer } from '../mail/mailer';
import { currentPolicy } from '../policy/service';
import { engineVersion } from '../stats/report';
import type { PreparedCache } from './prepared-cache';
import { recordFinishedRun, recordUnstoredRun } from './run-finished';
import { rawQuery } from '../db/driver';

/**
 * What the analysis queue does when a comparison's run is claimed and when it ends: the worker
 * judges the run under the adoption policy current when it starts; a finished run is stored by
 * recordFinishedRun (the run, the verdict record, the state change, the audit event and the
 * creator's e-mail, in one transaction); the e-mail goes out after the commit; the data the worker
 * prepared for swap sets goes to the app's cache (when given: a worker process has none) and its
 * sort orders to run_columns.
 */
export function analysisHandlers(deps: { dataSource: DataSource; mailer?: Mailer; publicUrl?: string; preparedCache?: PreparedCache }): JobHandlers {
  const { dataSource, mailer, publicUrl, preparedCache } = deps;
  return {
    engineVersion,
    jobInput: async (manager) => ({ policy: await currentPolicy(manager) }),
    finished: (manager, runId, outcome) =>
      recordFinishedRun(
        manager,
        runId,
        outcome.status === 'done'
          ? {
              status: 'done',
              report: outcome.message.report,
              engineVersion: outcome.message.engineVersion,
              headline: outcome.message.headline,
              verdict: outcome.message.verdict,
              choice: outcome.message.choice,
            }
          : outcome,
        { mailer, publicUrl },
      ),
    resultNotStored: (runId, cause) => recordUnstoredRun(dataSource, runId, cause, { mailer, publicUrl }),
    afterFinished: () => mailer?.kick(),
    keepPrepared: async (run, message) => {
      const { prepared } = message;
      preparedCache?.put({ runId: run.id, input: run.input, settings: run.settings, data: prepared, matrix: message.swapMatrix });
      // The sort orders, kept so that preparing swap sets after a restart skips the sort. Written
      // after the result, one model at a time with a turn for requests between (4 MB each at
      // 1,000,000 accounts); should the process stop before, the preparation sorts instead.
      for (const model of ['champion', 'challenger'] as const) {
        await new Promise<void>((resolve) => setImmediate(resolve));
        await withWriteLock(dataSource, () =>
          rawQuery(
            dataSource,
            'INSERT INTO "run_columns" ("runId", "name", "data") VALUES (?, ?, ?) ON CONFLICT ("runId", "name") DO UPDATE SET "data" = excluded."data"',
            [run.id, orderColumn(model), encodeOrder(prepared[model].order)],
          ),
        );
      }
    },
  };
}
