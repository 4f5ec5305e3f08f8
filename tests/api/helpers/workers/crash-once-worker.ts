import { workerData } from 'node:worker_threads';

/** A faulty analysis worker for tests: dies on the first attempt (process.exit in a worker ends the thread), works on the next. */
if ((workerData as { attempt: number }).attempt === 1) process.exit(3);
else await import('../../../../server/jobs/analysis-worker');
