// Types of scripts/large-pages.mjs, for the TypeScript that imports it (bench/index.ts).
export function largePageEnv(env?: NodeJS.ProcessEnv): NodeJS.ProcessEnv;
export function relaunchWithLargePages(): Promise<boolean>;
