import { parentPort, workerData } from 'node:worker_threads';
import { type BootstrapPlan, replicateScratch, type ReplicateOutput, runReplicates } from './bootstrap-kernel';

/**
 * Worker thread of the bootstrap (started by bootstrap.ts through workerEntry()): receives the
 * cell plan once (shared memory, no copy), then blocks of replicates { from, to }; answers each
 * with its results.
 */
const { plan, seed } = workerData as { plan: BootstrapPlan; seed: number };
const scratch = replicateScratch(plan);

parentPort!.on('message', ({ from, to }: { from: number; to: number }) => {
  const length = to - from;
  const result: ReplicateOutput = {
    aucChampion: new Float64Array(length),
    aucChallenger: new Float64Array(length),
    ksChampion: new Float64Array(length),
    ksChallenger: new Float64Array(length),
    aucMore: plan.more.map(() => new Float64Array(length)),
    ksMore: plan.more.map(() => new Float64Array(length)),
  };
  runReplicates(plan, seed, from, to, result, from, scratch);
  const buffers = [result.aucChampion, result.aucChallenger, result.ksChampion, result.ksChallenger, ...result.aucMore!, ...result.ksMore!].map(
    (array) => array.buffer as ArrayBuffer,
  );
  parentPort!.postMessage({ from, to, result }, buffers);
});
