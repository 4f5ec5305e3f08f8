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

/** Set by esbuild (scripts/server-bundle.mjs) in a build made outside dist/, e.g. the tests' build. */
declare const __SCORECOURT_BUILD_DIR__: string | undefined;

/**
 * The folder of compiled worker threads: dist/ when running compiled code, the folder a build
 * outside dist/ was made for (the unit and API suite's, tests/setup/compile-once.ts), or null to
 * start workers from their TypeScript sources (npm run dev).
 */
let buildDir: string | null =
  typeof __SCORECOURT_BUILD_DIR__ === 'string' ? __SCORECOURT_BUILD_DIR__ : compiled ? join(projectRoot, 'dist') : null;

/**
 * Starts worker threads from the compiled files in `dir` (laid out as dist/ is) even when this
 * code runs from sources: the unit and API suite compiles the workers once per run instead of
 * compiling TypeScript in every thread (tests/setup/use-compiled-workers.ts).
 */
export function useCompiledBuild(dir: string): void {
  buildDir = dir;
}

/**
 * The file and Node flags to start a worker thread with.
 * @param sourcePath the worker's source path from the project root without extension, e.g.
 *   `server/jobs/analysis-worker`; scripts/build-server.mjs compiles every `*-worker.ts` in
 *   server/jobs and server/stats to the same path under dist/.
 */
export function workerEntry(sourcePath: string): { file: string; execArgv: string[] } {
  if (buildDir !== null) return { file: join(buildDir, `${sourcePath}.js`), execArgv: [] };
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
  if (buildDir !== null) return new Worker(file, { ...options, execArgv: [...execArgv, ...(options.execArgv ?? [])] });
  const target = JSON.stringify(pathToFileURL(file).href);
  const code = `import('tsx/esm/api').then(({ register }) => { register(); return import(${target}); });`;
  return new Worker(code, { ...options, eval: true });
}
