import { join } from 'node:path';
import { inject } from 'vitest';

/**
 * The compiled file of an entry point in this run's build (tests/setup/compile-once.ts), e.g.
 * compiledEntry('server/cli/compare') → …/server/cli/compare.js: what the tests spawn instead of
 * running TypeScript through a loader.
 */
export function compiledEntry(sourcePath: string): string {
  return join(inject('compiledDir'), `${sourcePath}.js`);
}
