import { inject } from 'vitest';
import { useCompiledBuild } from '@server/runtime';

// Setup file of every test file in the unit and API suite: worker threads start from this run's
// compiled build (tests/setup/compile-once.ts), not from TypeScript sources through tsx.
useCompiledBuild(inject('compiledDir'));
