import { parentPort, workerData } from 'node:worker_threads';
import type { WorkerMessage } from '../../../../server/jobs/messages';

/**
 * Runs the real analysis worker, but ends the thread (process.exit in a worker ends the thread
 * only) on the given attempts as soon as the engine reports progress of at least 10%: the holdout
 * is loaded and the statistics are being computed. Used by the faulty workers beside this file.
 */
export async function dieMidAnalysis(onAttempts: number[], exitCode: number): Promise<void> {
  const { attempt } = workerData as { attempt: number };
  if (onAttempts.includes(attempt)) {
    const port = parentPort!;
    const post = port.postMessage.bind(port);
    port.postMessage = ((message: WorkerMessage, transfer?: readonly ArrayBuffer[]) => {
      if (message.type === 'progress' && message.fraction >= 0.1) {
        post(message);
        process.exit(exitCode);
      }
      post(message, transfer as ArrayBuffer[]);
    }) as typeof port.postMessage;
  }
  await import('../../../../server/jobs/analysis-worker');
}
