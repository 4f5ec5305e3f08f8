import { parentPort, workerData } from 'node:worker_threads';
import type { WorkerMessage } from '../../../../server/jobs/messages';

/**
 * Runs the real analysis worker, but on its first attempt goes silent once the engine reports 10%
 * progress and never ends: as a worker process that was killed looks to the queue (no result, no
 * exit). Only the job's lease can free the run.
 */
const { attempt } = workerData as { attempt: number };
if (attempt === 1) {
  const port = parentPort!;
  const post = port.postMessage.bind(port);
  let silent = false;
  port.postMessage = ((message: WorkerMessage, transfer?: readonly ArrayBuffer[]) => {
    if (silent) return;
    if (message.type === 'progress' && message.fraction >= 0.1) {
      silent = true;
      setInterval(() => undefined, 60_000);
    }
    post(message, transfer as ArrayBuffer[]);
  }) as typeof port.postMessage;
}
await import('../../../../server/jobs/analysis-worker');
