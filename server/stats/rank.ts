import { availableParallelism } from 'node:os';
import { startWorker } from '../runtime';
import { adoptRowBlocks, type ScoreBlocks, scoreBlocks } from './order';

/**
 * Both models ranked: scoreBlocks (order.ts) of each model's safety scores. From a million rows,
 * with a second core and threads allowed, the challenger's sort runs on a worker thread
 * (rank-worker.ts) while this thread sorts the champion: the ranking comes before the bootstrap
 * starts, so the second core would otherwise wait. The worker gets a copy of the challenger's
 * scores and the outcomes and sends its arrays back without a copy; the blocks are the same as
 * scoreBlocks gives here, row blocks included (tests/unit/stats/row-blocks.test.ts).
 * `threads`: 0 keeps everything on this thread (as BuildReportInput.threads does for the bootstrap).
 */
export const RANK_ON_TWO_THREADS = 1_000_000;

export async function rankBoth(champion: Float64Array, challenger: Float64Array, bad: Uint8Array, threads?: number): Promise<[ScoreBlocks, ScoreBlocks]> {
  const two = (threads ?? availableParallelism()) > 1 && bad.length >= RANK_ON_TWO_THREADS;
  if (!two) return [scoreBlocks(champion, bad), scoreBlocks(challenger, bad)];
  return rankOnTwoThreads(champion, challenger, bad);
}

export async function rankOnTwoThreads(champion: Float64Array, challenger: Float64Array, bad: Uint8Array): Promise<[ScoreBlocks, ScoreBlocks]> {
  const worker = startWorker('server/stats/rank-worker');
  try {
    const answer = new Promise<{ blocks: ScoreBlocks; rowBlock: Uint32Array }>((resolve, reject) => {
      worker.once('message', resolve);
      worker.once('error', reject);
      worker.once('exit', (code) => reject(new Error(`ranking worker stopped with exit code ${code}`)));
    });
    worker.postMessage({ values: challenger, bad });
    const championBlocks = scoreBlocks(champion, bad);
    const { blocks, rowBlock } = await answer;
    return [championBlocks, adoptRowBlocks(blocks, rowBlock)];
  } finally {
    await worker.terminate();
  }
}
