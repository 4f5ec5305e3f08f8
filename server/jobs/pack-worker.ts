import { parentPort, workerData } from 'node:worker_threads';
import { renderPackPdf } from '../pack/pdf';
import type { PackInput } from '../pack/sections';
import { lowerPriority } from './worker-support';

/**
 * The committee pack's PDF on its own thread (started by pack/render-thread.ts): one input, one
 * PDF, then the thread ends, so laying out a long pack never holds up the requests.
 */
lowerPriority(5);
renderPackPdf(workerData as PackInput).then(
  (pdf) => {
    const bytes = new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength).slice();
    parentPort!.postMessage({ ok: true, bytes }, [bytes.buffer]);
  },
  (error: unknown) => parentPort!.postMessage({ ok: false, message: error instanceof Error ? (error.stack ?? error.message) : String(error) }),
);
