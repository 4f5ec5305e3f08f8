// Types of scripts/server-bundle.mjs, for the TypeScript that imports it (tests/setup/compile-once.ts).
export function workerEntries(dir: string): string[];
export function serverEntryPoints(): string[];
export function bundleServer(options: { entryPoints: string[]; outdir: string; buildDir?: string; sourcemap?: boolean; keepThreadPriority?: boolean; selfContainedThreads?: boolean }): Promise<void>;
