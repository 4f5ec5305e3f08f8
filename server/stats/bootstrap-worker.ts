import { parentPort, workerData } from 'node:worker_threads';
import type { BootstrapPlan, ReplicateOutput } from './bootstrap-kernel';
import { type CompiledLanes, rangeScratch, runReplicateRange } from './bootstrap-lanes';

/**
 * Worker thread of the bootstrap (started by bootstrap.ts through workerEntry()): receives the
 * cell plan once (shared memory, no copy) and the compiled WebAssembly kernel (or null; see
 * bootstrap-lanes.ts), then blocks of replicates { from, to }; answers each with its results.
 */
const { plan, seed, lanes } = workerData as { plan: BootstrapPlan; seed: number; lanes: CompiledLanes | null };
const scratch = rangeScratch(plan, lanes);

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
  runReplicateRange(plan, seed, from, to, result, from, scratch);
  const buffers = [result.aucChampion, result.aucChallenger, result.ksChampion, result.ksChallenger, ...result.aucMore!, ...result.ksMore!].map(
    (array) => array.buffer as ArrayBuffer,
  );
  parentPort!.postMessage({ from, to, result }, buffers);
});
