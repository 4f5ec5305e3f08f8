// How the server's entry points are bundled with esbuild: used by `npm run build:server`
// (scripts/build-server.mjs, into dist/) and by the unit/API suite's global set-up
// (tests/setup/compile-once.ts, into a temporary folder), so tests run the workers and the CLI as
// compiled JavaScript, built once per run, instead of compiling TypeScript in every thread.
import { build } from 'esbuild';
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';

/** Every *.ts directly under `dir` whose name ends in -worker.ts is its own entry point. */
export function workerEntries(dir) {
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((name) => name.endsWith('-worker.ts'))
    .map((name) => join(dir, name));
}

/** The server's entry points: the server, the CLI, the benchmark and every worker thread. */
export function serverEntryPoints() {
  return ['server/index.ts', 'server/cli/compare.ts', 'server/cli/create-admin.ts', 'bench/index.ts', ...workerEntries('server/jobs'), ...workerEntries('server/stats')];
}

/**
 * Bundles `entryPoints` (paths from the project root) into `outdir`, keeping the folder layout
 * (server/jobs/analysis-worker.ts → <outdir>/server/jobs/analysis-worker.js). Our own code,
 * shared/ included, is bundled; packages stay external. `buildDir` (optional) is compiled in as
 * the folder where the bundles find each other's worker threads (server/runtime.ts); without it
 * they look in dist/.
 */
export async function bundleServer({ entryPoints, outdir, buildDir, sourcemap = true }) {
  await build({
    entryPoints,
    outbase: '.',
    outdir,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap,
    logLevel: 'warning',
    define: buildDir ? { __SCORECOURT_BUILD_DIR__: JSON.stringify(buildDir) } : {},
    // Bundled ESM has no require(); some dependencies' CommonJS interop needs one.
    banner: { js: "import { createRequire as __scCreateRequire } from 'node:module'; const require = __scCreateRequire(import.meta.url);" },
  });
}
