import { parentPort, workerData } from 'node:worker_threads';
import { performReaderTask, type ReaderReply, type ReaderTask, replyOf, transferList } from '../holdouts/reading';
import { lowerPriority } from './worker-support';

/**
 * The reader on its own thread (started by holdouts/reading.ts): one task — scan an upload, apply a
 * mapping to a stored holdout, or validate one — then one reply, and the thread ends.
 */
const task = workerData as ReaderTask;
lowerPriority(5);
performReaderTask(task).then(
  (value) => parentPort!.postMessage({ ok: true, value } satisfies ReaderReply, transferList(task, value)),
  (error: unknown) => parentPort!.postMessage(replyOf(error)),
);
