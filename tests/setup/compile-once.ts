import { mkdirSync, readdirSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import type { TestProject } from 'vitest/node';
import { bundleServer, serverEntryPoints } from '../../scripts/server-bundle.mjs';

/**
 * Global set-up of the unit and API suite: compiles the server's entry points (every worker
 * thread, the CLI, server/index.ts) and the tests' own faulty workers once per run with esbuild
 * into a temporary folder under node_modules/.cache (inside the project, so the bundles find
 * package.json, sample-data/ and node_modules as dist/ does). Tests then start worker threads and
 * spawn the CLI and the server from that build (tests/setup/compiled.ts) instead of compiling
 * TypeScript in every thread and child process; the build is removed after the run. Each worker
 * thread is bundled with its packages (scripts/server-bundle.mjs `selfContainedThreads`), so the
 * hundreds of threads the suite starts do not each resolve pg, zod and papaparse file by file. Its worker
 * threads keep the priority of the test process (jobs/worker-support.ts `lowerPriority`): the
 * suite's own threads are what it waits for, and beside other CPU-bound work a niced thread
 * starves.
 */

const root = join(import.meta.dirname, '..', '..');

/** Every *-worker.ts under `dir`, searched recursively (the tests' faulty and fixture workers). */
function testWorkers(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) return testWorkers(path);
    return entry.name.endsWith('-worker.ts') ? [relative(root, path)] : [];
  });
}

export default async function compileOnce(project: TestProject): Promise<() => void> {
  const parent = join(root, 'node_modules', '.cache', 'scorecourt-tests');
  mkdirSync(parent, { recursive: true });
  const buildDir = join(parent, `run-${process.pid}-${Date.now()}`);
  const previous = process.cwd();
  process.chdir(root);
  try {
    const entryPoints = [...serverEntryPoints().filter((entry) => !entry.startsWith('bench/')), ...testWorkers(join(root, 'tests'))];
    await bundleServer({ entryPoints, outdir: buildDir, buildDir, sourcemap: false, keepThreadPriority: true, selfContainedThreads: true });
  } finally {
    process.chdir(previous);
  }
  project.provide('compiledDir', buildDir);
  return () => rmSync(buildDir, { recursive: true, force: true });
}

declare module 'vitest' {
  export interface ProvidedContext {
    /** The folder tests/setup/compile-once.ts compiled the server's entry points into. */
    compiledDir: string;
  }
}
