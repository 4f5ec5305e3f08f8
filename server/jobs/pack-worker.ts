import { parentPort } from 'node:worker_threads';
import { renderPackPdf } from '../pack/pdf';
import type { PackInput } from '../pack/sections';
import { lowerPriority } from './worker-support';

/**
 * The committee pack's PDF on its own thread (kept by pack/render-thread.ts): it stays up and lays
 * out one pack per message, so the fonts and the compiled code are loaded once, not per pack; the
 * thread that answers requests only waits. Each reply names the job it answers.
 */
lowerPriority(5);
parentPort!.on('message', ({ job, input }: { job: number; input: PackInput }) => {
  renderPackPdf(input).then(
    (pdf) => {
      const bytes = new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength).slice();
      parentPort!.postMessage({ job, ok: true, bytes }, [bytes.buffer]);
    },
    (error: unknown) => parentPort!.postMessage({ job, ok: false, message: error instanceof Error ? (error.stack ?? error.message) : String(error) }),
  );
});
