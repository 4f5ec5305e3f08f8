import { parentPort } from 'node:worker_threads';
import { rowBlocks, scoreBlocks } from './order';

/**
 * Worker thread of rank.ts: sorts one model's safety scores into its blocks (scoreBlocks) and
 * sends them back with their row blocks and the scores, every array transferred (no copy).
 */
parentPort!.on('message', ({ values, bad }: { values: Float64Array; bad: Uint8Array }) => {
  const blocks = scoreBlocks(values, bad);
  const rowBlock = rowBlocks(blocks);
  const arrays = [blocks.order, blocks.sortedBad, blocks.start, blocks.value, blocks.goods, blocks.bads, rowBlock, values];
  parentPort!.postMessage({ blocks, rowBlock, values }, [...new Set(arrays.map((array) => array.buffer as ArrayBuffer))]);
});
