import { availableParallelism } from 'node:os';
import { startWorker } from '../runtime';
import { adoptRowBlocks, type ScoreBlocks, scoreBlocks, sortsInOnePass } from './order';

/**
 * Both models ranked: scoreBlocks (order.ts) of each model's safety scores. From a million rows,
 * with a second core and threads allowed, a challenger whose sort takes more than one counting
 * pass (continuous scores, PDs with six decimals; not points) is sorted on a worker thread
 * (rank-worker.ts) while this thread sorts the champion: the ranking comes before the bootstrap
 * starts, so the second core would otherwise wait. The worker gets the outcomes (a copy) and the
 * challenger's scores (lent: their buffer goes there and comes back, when `lend` says they are
 * this analysis's own array, e.g. from safety(); else a copy) and sends its arrays back without a
 * copy. The blocks are the same as scoreBlocks gives here, row blocks included
 * (tests/unit/stats/row-blocks.test.ts). `threads`: 0 keeps everything on this thread (as
 * BuildReportInput.threads does for the bootstrap).
 *
 * Returns both blocks and the challenger's scores: `challenger` itself, or the same values on the
 * buffer that came back when it was lent (`challenger` is then detached and must not be read).
 */
export const RANK_ON_TWO_THREADS = 1_000_000;

export interface Ranked {
  champion: ScoreBlocks;
  challenger: ScoreBlocks;
  challengerValues: Float64Array;
}

export async function rankBoth(champion: Float64Array, challenger: Float64Array, bad: Uint8Array, options: { threads?: number; lend?: boolean } = {}): Promise<Ranked> {
  const two = (options.threads ?? availableParallelism()) > 1 && bad.length >= RANK_ON_TWO_THREADS && !sortsInOnePass(challenger);
  if (!two) return { champion: scoreBlocks(champion, bad), challenger: scoreBlocks(challenger, bad), challengerValues: challenger };
  return rankOnTwoThreads(champion, challenger, bad, options.lend ?? false);
}

export async function rankOnTwoThreads(champion: Float64Array, challenger: Float64Array, bad: Uint8Array, lend: boolean): Promise<Ranked> {
  const worker = startWorker('server/stats/rank-worker');
  try {
    const answer = new Promise<{ blocks: ScoreBlocks; rowBlock: Uint32Array; values: Float64Array }>((resolve, reject) => {
      worker.once('message', resolve);
      worker.once('error', reject);
      worker.once('exit', (code) => reject(new Error(`ranking worker stopped with exit code ${code}`)));
    });
    const whole = challenger.byteOffset === 0 && challenger.byteLength === challenger.buffer.byteLength && challenger.buffer instanceof ArrayBuffer;
    worker.postMessage({ values: challenger, bad }, lend && whole ? [challenger.buffer as ArrayBuffer] : []);
    const championBlocks = scoreBlocks(champion, bad);
    const { blocks, rowBlock, values } = await answer;
    return { champion: championBlocks, challenger: adoptRowBlocks(blocks, rowBlock), challengerValues: lend && whole ? values : challenger };
  } finally {
    await worker.terminate();
  }
}
