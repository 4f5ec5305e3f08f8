// Compiles the server, its worker threads, the CLI and the benchmark to dist/ with esbuild.
// Dependencies stay external (loaded from node_modules); our own code is bundled per entry point.
import { build } from 'esbuild';
import { readdirSync, existsSync } from 'node:fs';
import { join } from 'node:path';

/** Every *.ts directly under these folders whose name ends in -worker.ts is its own entry point. */
function workerEntries(dir) {
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((name) => name.endsWith('-worker.ts'))
    .map((name) => join(dir, name));
}

const entryPoints = [
  'server/index.ts',
  'server/cli/compare.ts',
  'server/cli/create-admin.ts',
  'bench/index.ts',
  ...workerEntries('server/jobs'),
  ...workerEntries('server/stats'),
];

await build({
  entryPoints,
  outbase: '.',
  outdir: 'dist',
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  sourcemap: true,
  logLevel: 'warning',
  // Bundled ESM has no require(); some dependencies' CommonJS interop needs one.
  banner: { js: "import { createRequire as __scCreateRequire } from 'node:module'; const require = __scCreateRequire(import.meta.url);" },
});
console.log(`built ${entryPoints.length} server entry points into dist/`);
