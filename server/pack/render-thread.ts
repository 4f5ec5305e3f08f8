import { startWorker } from '../runtime';
import type { PackInput } from './sections';

/** Renders the pack's PDF on a worker thread (jobs/pack-worker.ts); the request thread only waits. */
export function renderPackOffThread(input: PackInput): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const worker = startWorker('server/jobs/pack-worker', { workerData: input, resourceLimits: { maxOldGenerationSizeMb: 512 } });
    let settled = false;
    worker.once('message', (reply: { ok: true; bytes: Uint8Array } | { ok: false; message: string }) => {
      settled = true;
      if (reply.ok) resolve(Buffer.from(reply.bytes.buffer, reply.bytes.byteOffset, reply.bytes.byteLength));
      else reject(new Error(`the committee pack could not be made: ${reply.message}`));
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`the committee pack's thread ended (code ${code}) without a PDF`));
    });
  });
}
