// How the server's entry points are bundled with esbuild: used by `npm run build:server`
// (scripts/build-server.mjs, into dist/) and by the unit/API suite's global set-up
// (tests/setup/compile-once.ts, into a temporary folder), so tests run the workers and the CLI as
// compiled JavaScript, built once per run, instead of compiling TypeScript in every thread.
import { build } from 'esbuild';
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { buildWasm } from './build-wasm.mjs';

/** Every *.ts directly under `dir` whose name ends in -worker.ts is its own entry point. */
export function workerEntries(dir) {
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((name) => name.endsWith('-worker.ts'))
    .map((name) => join(dir, name));
}

/** The server's entry points: the server, the CLI, the benchmark and every worker thread. */
export function serverEntryPoints() {
  return ['server/index.ts', 'server/worker.ts', 'server/cli/compare.ts', 'server/cli/create-admin.ts', 'bench/index.ts', ...workerEntries('server/jobs'), ...workerEntries('server/stats')];
}

/**
 * Bundles `entryPoints` (paths from the project root) into `outdir`, keeping the folder layout
 * (server/jobs/analysis-worker.ts → <outdir>/server/jobs/analysis-worker.js). Our own code,
 * shared/ included, is bundled; packages stay external. `buildDir` (optional) is compiled in as
 * the folder where the bundles find each other's worker threads (server/runtime.ts); without it
 * they look in dist/. `keepThreadPriority` (the test suite's build only) compiles the worker
 * threads to run at the priority of the thread that starts them (jobs/worker-support.ts).
 * `selfContainedThreads` (the test suite's build only) bundles each worker thread (*-worker.ts)
 * with its packages (all but threadExternals): the suite starts hundreds of threads (a reader
 * thread for each upload, scan and validation; an analysis thread for each run), and resolving and
 * loading pg, zod and papaparse file by file cost each start about 140 ms of CPU of 420 (a bundled
 * reader thread: 280 ms; a bare worker thread: 70 ms). What a thread imports only when needed
 * (exceljs, for an .xlsx file) goes into a chunk of its own, loaded then: 140 ms of CPU to import
 * instead of 340 from node_modules.
 */
/**
 * Entry points bundled with their packages too (all but the lazily imported exceljs): the
 * compare command starts in a fresh process every time, and resolving and loading zod,
 * seedrandom and papaparse file by file cost it about a third of a second (issue 20).
 */
const selfContained = new Set(['server/cli/compare.ts']);

/**
 * What a self-contained worker thread still loads from node_modules: the native SQLite binding
 * (and pg's optional native one), and pdfkit and fontkit, which read their data files beside their
 * own code.
 */
const threadExternals = ['better-sqlite3', 'pg-native', 'pdfkit', 'fontkit'];

export async function bundleServer({ entryPoints, outdir, buildDir, sourcemap = true, keepThreadPriority = false, selfContainedThreads = false }) {
  // The bootstrap's WebAssembly kernel, loaded at run time from wasm/build/ (scripts/build-wasm.mjs).
  await buildWasm({ quiet: true });
  const common = {
    outbase: '.',
    outdir,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    sourcemap,
    logLevel: 'warning',
    define: {
      ...(buildDir ? { __SCORECOURT_BUILD_DIR__: JSON.stringify(buildDir) } : {}),
      ...(keepThreadPriority ? { __SCORECOURT_KEEP_THREAD_PRIORITY__: 'true' } : {}),
    },
    // Bundled ESM has no require(); some dependencies' CommonJS interop needs one.
    banner: { js: "import { createRequire as __scCreateRequire } from 'node:module'; const require = __scCreateRequire(import.meta.url);" },
  };
  const thread = (entry) => selfContainedThreads && entry.endsWith('-worker.ts');
  const shared = entryPoints.filter((entry) => !selfContained.has(entry) && !thread(entry));
  const alone = entryPoints.filter((entry) => selfContained.has(entry));
  const threads = entryPoints.filter(thread);
  await Promise.all([
    shared.length > 0 ? build({ ...common, entryPoints: shared, packages: 'external' }) : null,
    alone.length > 0 ? build({ ...common, entryPoints: alone, external: ['exceljs'] }) : null,
    threads.length > 0 ? build({ ...common, entryPoints: threads, external: threadExternals, splitting: true, chunkNames: 'chunks/[name]-[hash]' }) : null,
  ]);
}
