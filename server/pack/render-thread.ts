import type { Worker } from 'node:worker_threads';
import { startWorker } from '../runtime';
import type { PackInput } from './sections';

/**
 * The committee pack's PDF is laid out on worker threads (jobs/pack-worker.ts), never on the thread
 * that answers requests. The threads stay up between packs (starting one and loading its code and
 * fonts took 4–6 s on a loaded machine, longer than laying out a pack): at most `PACK_THREADS`
 * of them, each laying out one pack at a time; further packs wait their turn. A thread that dies
 * (out of memory, a crash) fails the pack it was laying out, with the reason, and the next pack
 * starts a new one. A thread idle for `IDLE_MS` ends, giving its memory back; none keeps the
 * process alive.
 */
const PACK_THREADS = 2;
const IDLE_MS = 5 * 60_000;
const MEMORY_MB = 512;

type Reply = { job: number; ok: true; bytes: Uint8Array } | { job: number; ok: false; message: string };

interface Job {
  id: number;
  input: PackInput;
  resolve: (pdf: Buffer) => void;
  reject: (error: Error) => void;
}

interface Thread {
  worker: Worker;
  job: Job | null;
  idle: NodeJS.Timeout | null;
}

const threads = new Set<Thread>();
const waiting: Job[] = [];
let nextJob = 1;

function startThread(): Thread {
  const thread: Thread = { worker: startWorker('server/jobs/pack-worker', { resourceLimits: { maxOldGenerationSizeMb: MEMORY_MB } }), job: null, idle: null };
  thread.worker.unref();
  threads.add(thread);
  thread.worker.on('message', (reply: Reply) => {
    const job = thread.job;
    if (!job || job.id !== reply.job) return;
    thread.job = null;
    if (reply.ok) job.resolve(Buffer.from(reply.bytes.buffer, reply.bytes.byteOffset, reply.bytes.byteLength));
    else job.reject(new Error(`the committee pack could not be made: ${reply.message}`));
    next(thread);
  });
  let failure: Error | null = null;
  thread.worker.on('error', (error) => {
    failure = error;
  });
  thread.worker.once('exit', (code) => {
    threads.delete(thread);
    if (thread.idle) clearTimeout(thread.idle);
    const job = thread.job;
    thread.job = null;
    job?.reject(failure ?? new Error(`the committee pack's thread ended (code ${code}) without a PDF`));
    // Packs still waiting get a new thread.
    if (waiting.length > 0) next(startThread());
  });
  return thread;
}

/** Gives `thread` the oldest waiting pack, or lets it idle. */
function next(thread: Thread): void {
  const job = waiting.shift();
  if (!job) {
    thread.idle = setTimeout(() => {
      // Out of the pool first, so no pack is given to a thread that is ending.
      threads.delete(thread);
      void thread.worker.terminate();
    }, IDLE_MS);
    thread.idle.unref();
    return;
  }
  if (thread.idle) clearTimeout(thread.idle);
  thread.idle = null;
  thread.job = job;
  thread.worker.postMessage({ job: job.id, input: job.input });
}

/** Lays out the pack's PDF on a pack thread; the calling thread only waits. */
export function renderPackOffThread(input: PackInput): Promise<Buffer> {
  return new Promise<Buffer>((resolve, reject) => {
    waiting.push({ id: nextJob++, input, resolve, reject });
    const free = [...threads].find((thread) => thread.job === null);
    if (free) next(free);
    else if (threads.size < PACK_THREADS) next(startThread());
  });
}

/** Ends the pack threads (at shutdown); packs still waiting or being laid out fail. */
export async function stopPackThreads(): Promise<void> {
  for (const job of waiting.splice(0)) job.reject(new Error('the server is stopping; the committee pack was not made'));
  const ending = [...threads];
  threads.clear();
  await Promise.all(ending.map((thread) => thread.worker.terminate()));
}

/** The pack threads up now (the tests watch them being reused, bounded and replaced). */
export function packThreads(): Worker[] {
  return [...threads].map((thread) => thread.worker);
}
