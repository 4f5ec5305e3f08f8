import { Foundation1764614400000 } from './1764614400000-foundation';

/** Every migration in order, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const migrations = [Foundation1764614400000];
