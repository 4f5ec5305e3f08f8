import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * Where the code runs from: compiled JavaScript in dist/ (npm start, the CLI, the benchmark) or
 * TypeScript sources under tsx or Vitest (npm run dev, npm test). Worker threads need to know,
 * because a worker is started from a file path, not from an import.
 */
const here = fileURLToPath(import.meta.url);
export const compiled = here.endsWith('.js');

function findRoot(start: string): string {
  let dir = dirname(start);
  while (!existsSync(join(dir, 'package.json'))) {
    const parent = dirname(dir);
    if (parent === dir) throw new Error(`no package.json above ${start}`);
    dir = parent;
  }
  return dir;
}

/** The project folder (the one holding package.json). */
export const projectRoot = findRoot(here);

/**
 * The file and Node flags to start a worker thread with.
 * @param sourcePath the worker's source path from the project root without extension, e.g.
 *   `server/jobs/analysis-worker`; scripts/build-server.mjs compiles every `*-worker.ts` in
 *   server/jobs and server/stats to the same path under dist/.
 */
export function workerEntry(sourcePath: string): { file: string; execArgv: string[] } {
  if (compiled) return { file: join(projectRoot, 'dist', `${sourcePath}.js`), execArgv: [] };
  return { file: join(projectRoot, `${sourcePath}.ts`), execArgv: ['--import', 'tsx'] };
}

/**
 * Starts a worker thread on `sourcePath` (as for workerEntry): the compiled file, or from the
 * sources the TypeScript file through tsx's loader. Node 20 does not apply `--import tsx` from a
 * worker's execArgv ("Unknown file extension .ts"), so from sources the worker is a two-line
 * script that registers tsx and then imports the file.
 */
export function startWorker(sourcePath: string, options: WorkerOptions = {}): Worker {
  const { file, execArgv } = workerEntry(sourcePath);
  if (compiled) return new Worker(file, { ...options, execArgv: [...execArgv, ...(options.execArgv ?? [])] });
  const target = JSON.stringify(pathToFileURL(file).href);
  const code = `import('tsx/esm/api').then(({ register }) => { register(); return import(${target}); });`;
  return new Worker(code, { ...options, eval: true });
}
