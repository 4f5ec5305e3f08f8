// Compiles the server, its worker threads, the CLI and the benchmark to dist/ with esbuild.
// Dependencies stay external (loaded from node_modules); our own code is bundled per entry point
// (scripts/server-bundle.mjs says how).
import { bundleServer, serverEntryPoints } from './server-bundle.mjs';

const entryPoints = serverEntryPoints();
await bundleServer({ entryPoints, outdir: 'dist' });
console.log(`built ${entryPoints.length} server entry points into dist/`);
